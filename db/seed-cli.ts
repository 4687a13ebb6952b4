/** `npm run db:seed`: empty the database and lay the demo down again. */
import { checkpointSettings, retireCheckpoints, writeCheckpoint } from '../server/checkpoints';
import { loadConfig } from '../server/config';
import { openDatabase } from './client';
import { resetDatabase, DEMO_ACCOUNTS, DEMO_PASSWORD } from './seed';
import { seedDemo } from '../server/demo-seed';

async function main() {
  const config = loadConfig();
  // Emptying a real unit's chart to lay the demo down is never what a production operator meant.
  if (config.mode === 'production') throw new Error('npm run db:seed empties the database and lays down the demo: it does not run in production mode (WARMFOLD_MODE / NODE_ENV).');
  const database = openDatabase(config.databasePath);
  resetDatabase(database);
  await seedDemo(database, { now: new Date(), bcryptCost: config.bcryptCost });
  process.stdout.write(`Demo data laid down in ${config.databasePath}.\n`);
  // The reset started a new audit chain: the old chain's signed checkpoints are kept, set aside.
  const retired = retireCheckpoints(checkpointSettings(config.dataDir));
  if (retired) process.stdout.write(`The old chain's audit checkpoints were set aside in ${retired}.\n`);
  // …and the new chain gets its first signed checkpoint (with the demo's generated key, if none is set).
  writeCheckpoint(database.sqlite, checkpointSettings(config.dataDir, process.env, true), 'seeded');
  database.close();
  for (const a of DEMO_ACCOUNTS) process.stdout.write(`  ${a.role.padEnd(9)} ${a.email}\n`);
  process.stdout.write(`Password for all: ${DEMO_PASSWORD}\n`);
}

main().catch((err: unknown) => {
  process.stderr.write(`${err instanceof Error ? err.message : String(err)}\n`);
  process.exit(1);
});
