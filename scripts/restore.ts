/**
 * `npm run restore -- <backup folder>`: with Warmfold stopped, put a backup made by `npm run backup`
 * back in place. The current database, uploads and checkpoint file are moved aside, not deleted.
 * Then run `npm run audit:verify` and start Warmfold again (SECURITY.md, "Backups and restore").
 */
import path from 'node:path';
import { restoreBackup } from '../server/backup';
import { checkpointSettings } from '../server/checkpoints';
import { loadConfig } from '../server/config';

const from = process.argv[2];
if (!from) {
  process.stderr.write('Usage: npm run restore -- <backup folder>\n');
  process.exit(64);
}
try {
  const config = loadConfig();
  const result = restoreBackup(path.resolve(from), {
    databasePath: config.databasePath,
    uploadsDir: path.join(config.dataDir, 'uploads'),
    checkpointFile: checkpointSettings(config.dataDir).file,
  });
  process.stdout.write(
    `Restored ${path.resolve(from)} into ${config.dataDir}. The files it replaced are in ${result.setAside}.\nNext: npm run audit:verify, then start Warmfold.\n`,
  );
} catch (err) {
  process.stderr.write(`Restore failed: ${err instanceof Error ? err.message : String(err)}\n`);
  process.exit(1);
}
