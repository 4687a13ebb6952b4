/**
 * `npm run audit:verify [file] [--checkpoints file] [--key-file file]`: check the audit chain, every
 * chained row against its event, and the chain against the signed checkpoints. Exits 0 when the
 * record is intact, 2 when something was changed, deleted or added outside the app.
 *
 * Without options it checks the configured database with the configured checkpoint file and key
 * (DATA_DIR, DATABASE_PATH, AUDIT_CHECKPOINT_FILE, AUDIT_KEY or AUDIT_KEY_FILE).
 */
import Database from 'better-sqlite3';
import { checkpointSettings } from '../server/checkpoints';
import { loadConfig } from '../server/config';
import { describeRecordReport, verifyRecord } from '../server/record-verify';

function option(name: string): string | undefined {
  const i = process.argv.indexOf(name);
  return i >= 0 ? process.argv[i + 1] : undefined;
}

const positional = process.argv.slice(2).filter((a, i, all) => !a.startsWith('--') && !(i > 0 && all[i - 1]!.startsWith('--')));
const config = loadConfig();
const file = positional[0] ?? config.databasePath;
const env = { ...process.env };
if (option('--checkpoints')) env.AUDIT_CHECKPOINT_FILE = option('--checkpoints');
if (option('--key-file')) env.AUDIT_KEY_FILE = option('--key-file');
const settings = checkpointSettings(config.dataDir, env);
const sqlite = new Database(file, { readonly: true, fileMustExist: true });
const report = verifyRecord(sqlite, { checkpoints: settings });
sqlite.close();
process.stdout.write(`${describeRecordReport(report, file).join('\n')}\n`);
if (!report.ok) process.exit(2);
