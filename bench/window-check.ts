/**
 * `npx tsx bench/window-check.ts`: the restart-point equivalence check (bench/window-compare.ts,
 * also run by jest in tests/server/board-restart-point.test.ts) on the bench's large unit, then
 * the windowed and whole-stay syncs timed in process. Exits non-zero on the first difference.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { openDatabase } from '../db/client';
import { syncFlags, type SyncWindow } from '../server/services/flags';
import { seedLargeUnit } from './seed-large';
import { checkRestartPoints, HOUR } from './window-compare';

async function main(): Promise<void> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'warmfold-window-'));
  const file = path.join(dir, 'w.db');
  const t0 = new Date();
  const seed = await seedLargeUnit(file, { infants: 20, days: 14, nurseInfants: 2 }, t0);
  const { sqlite } = openDatabase(file);
  const { compared, windowed, now } = checkRestartPoints(sqlite, seed, t0, { steps: 400 });
  process.stdout.write(`${compared} syncs compared, ${windowed} of them windowed: identical.\n`);

  // In-process timing: the flowsheet's sync for the nurse's first infant, windowed and whole.
  const id = seed.nurseInfantIds[0]!;
  const time = (window?: SyncWindow) => {
    const runs: number[] = [];
    for (let i = 0; i < 200; i++) {
      const t = performance.now();
      sqlite.exec('BEGIN');
      syncFlags(sqlite, id, now, null, window);
      sqlite.exec('ROLLBACK');
      runs.push(performance.now() - t);
    }
    runs.sort((a, b) => a - b);
    return `median ${runs[100]!.toFixed(3)} ms, p90 ${runs[180]!.toFixed(3)} ms`;
  };
  process.stdout.write(`syncFlags whole stay: ${time()}\n`);
  process.stdout.write(`syncFlags 72-h window: ${time({ from: now.getTime() - 72 * HOUR - 1 })}\n`);
  process.stdout.write(`syncFlags write window: ${time({ from: now.getTime() })}\n`);
  sqlite.close();
  fs.rmSync(dir, { recursive: true, force: true });
}

main().catch((err: unknown) => {
  process.stderr.write(`${err instanceof Error ? err.message : String(err)}\n`);
  process.exit(1);
});
