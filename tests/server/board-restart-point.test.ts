/**
 * The windowed flag sync (from a restart point) gives the same flags, the same next check and the
 * same stored check clocks as evaluating the whole stay, step after step of random charting: no
 * rule carries an open flag past a restart point. The replay lives in bench/window-compare.ts so
 * that the bench's large-unit run checks the same thing.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { openDatabase } from '../../db/client';
import { seedLargeUnit } from '../../bench/seed-large';
import { checkRestartPoints } from '../../bench/window-compare';

it('a windowed sync equals the whole-stay sync after every random step (late entries, gaps, cold, heat signs, manual mode)', async () => {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'warmfold-restart-'));
  try {
    const file = path.join(dir, 'w.db');
    const t0 = new Date('2026-11-16T10:00:00Z');
    const seed = await seedLargeUnit(file, { infants: 6, days: 4, nurseInfants: 2 }, t0);
    const database = openDatabase(file);
    try {
      const result = checkRestartPoints(database.sqlite, seed, t0, { steps: 150, seed: 11 });
      expect(result.compared).toBe(150);
      // The check means something only if many syncs really started from a restart point.
      expect(result.windowed).toBeGreaterThan(50);
    } finally {
      database.close();
    }
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
});
