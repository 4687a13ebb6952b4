/** `npm run backup`: an online copy of the database under DATA_DIR/backups, keeping BACKUP_KEEP copies (default 14). */
import Database from 'better-sqlite3';
import path from 'node:path';
import { backupDatabase } from '../server/backup';
import { loadConfig } from '../server/config';

async function main() {
  const config = loadConfig();
  const keep = Number(process.env.BACKUP_KEEP ?? 14);
  const sqlite = new Database(config.databasePath, { fileMustExist: true });
  const result = await backupDatabase(sqlite, path.join(config.dataDir, 'backups'), keep);
  sqlite.close();
  process.stdout.write(`Backup written: ${result.file} (${result.pages} pages). Removed ${result.removed.length} older copies.\n`);
}

main().catch((err: unknown) => {
  process.stderr.write(`Backup failed: ${err instanceof Error ? err.message : String(err)}\n`);
  process.exit(1);
});
