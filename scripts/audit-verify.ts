/** `npm run audit:verify [file]`: walk the audit hash chain and report the first broken link. */
import Database from 'better-sqlite3';
import { verifyAuditChain } from '../server/audit';
import { loadConfig } from '../server/config';

const file = process.argv[2] ?? loadConfig().databasePath;
const sqlite = new Database(file, { readonly: true, fileMustExist: true });
const report = verifyAuditChain(sqlite);
sqlite.close();
if (report.ok) {
  process.stdout.write(`Audit chain intact: ${report.checked} events checked in ${file}.\n`);
} else {
  process.stdout.write(`Audit chain BROKEN at event ${report.firstBrokenId}: ${report.reason} (${report.checked} events read).\n`);
  process.exit(2);
}
