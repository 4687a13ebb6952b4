/**
 * `npm run backup`: an online copy of the database, with the uploaded files and the signed
 * checkpoint file, into a folder of its own under BACKUP_DIR (default DATA_DIR/backups; point it
 * at another disk), keeping BACKUP_KEEP backups (default 14).
 */
import Database from 'better-sqlite3';
import path from 'node:path';
import { backupDatabase } from '../server/backup';
import { checkpointSettings } from '../server/checkpoints';
import { loadConfig } from '../server/config';

async function main() {
  const config = loadConfig();
  const keep = Number(process.env.BACKUP_KEEP ?? 14);
  const dir = path.resolve(process.env.BACKUP_DIR ?? path.join(config.dataDir, 'backups'));
  const sqlite = new Database(config.databasePath, { fileMustExist: true });
  const result = await backupDatabase(sqlite, dir, keep, new Date(), {
    uploadsDir: path.join(config.dataDir, 'uploads'),
    checkpointFile: checkpointSettings(config.dataDir).file,
  });
  sqlite.close();
  process.stdout.write(`Backup written: ${result.dir} (${result.pages} pages, ${result.uploads} uploaded files). Removed ${result.removed.length} older backups.\n`);
}

main().catch((err: unknown) => {
  process.stderr.write(`Backup failed: ${err instanceof Error ? err.message : String(err)}\n`);
  process.exit(1);
});
