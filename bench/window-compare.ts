/**
 * The restart-point equivalence check of the windowed flag sync, shared by the jest test
 * (tests/server/board-restart-point.test.ts) and the bench's timing run: on a seeded unit it
 * replays time passing and a stream of random readings (late entries, gaps, cold, heat signs,
 * manual mode at high output), and after each step compares syncFlags with a window against the
 * whole-stay evaluation of the same chart: the open flags, the next check, the flags a 72-h
 * flowsheet shows, the flags each sync raised and closed, and the stored check clocks must be
 * identical. Throws on the first difference.
 */
import { randomUUID } from 'node:crypto';
import type Database from 'better-sqlite3';
import { insertReading, type NewReading } from '../server/services/bedside';
import { loadInfantState, loadUnitRow, policyForUnit, syncFlags, type SyncResult, type SyncWindow } from '../server/services/flags';
import { evaluateInfant } from '../shared/thermal';

export const HOUR = 3_600_000;

function prng(seed: number) {
  let s = seed >>> 0;
  return () => {
    s = (s * 1664525 + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

/** Replay `steps` random steps on the seeded unit from `t0`; returns how many syncs were compared and windowed, and the last instant. */
export function checkRestartPoints(
  sqlite: Database.Database,
  seed: { unitId: string; infantIds: string[] },
  t0: Date,
  options: { steps: number; seed?: number } = { steps: 400 },
): { compared: number; windowed: number; now: Date } {
  const rand = prng(options.seed ?? 7);

  const storedFlags = (infantId: string) =>
    sqlite
      .prepare('SELECT f.key, f.raised_at, r.closed_at, r.closed_by_reading_id FROM flags f LEFT JOIN flag_resolutions r ON r.flag_id = f.id WHERE f.infant_id = ? ORDER BY f.key')
      .all(infantId);
  // The views read these: the next-due instants and the open flags' current state.
  const storedClocks = (infantId: string) => sqlite.prepare('SELECT remote_due_at, manual_since, manual_due_at, open_flags FROM infant_clocks WHERE infant_id = ?').get(infantId);
  const policy = policyForUnit(loadUnitRow(sqlite, seed.unitId)!);
  const view = (r: Pick<SyncResult, 'evaluation' | 'raised' | 'closed'>, fromMs: number) => ({
    open: JSON.stringify(r.evaluation.openFlags),
    next: JSON.stringify(r.evaluation.nextCheck),
    shown: JSON.stringify(r.evaluation.flags.filter((f) => f.status === 'open' || f.raisedAt.getTime() >= fromMs || (f.closedAt !== null && f.closedAt.getTime() >= fromMs))),
    raised: r.raised.length,
    closed: r.closed.length,
  });
  let windowed = 0;
  let compared = 0;
  /** Run `change` then a windowed sync, undo both, run them again with a whole-stay sync; compare. */
  const compare = (label: string, infantId: string, now: Date, window: SyncWindow, change: () => void) => {
    // The flags the caller shows: a flowsheet asks from its window's start, a write from its reading's time.
    const fromMs = window.from;
    sqlite.exec('BEGIN IMMEDIATE');
    change();
    const a = syncFlags(sqlite, infantId, now, null, window);
    const aStored = JSON.stringify(storedFlags(infantId));
    const aClocks = JSON.stringify(storedClocks(infantId));
    sqlite.exec('ROLLBACK');
    sqlite.exec('BEGIN IMMEDIATE');
    change();
    // The ground truth: the whole stay, read straight from the table, evaluated before syncing.
    const truth = evaluateInfant(loadInfantState(sqlite, infantId), now, policy);
    const b = syncFlags(sqlite, infantId, now, null);
    const t = view({ evaluation: truth, raised: b.raised, closed: b.closed }, fromMs);
    const vbb = view(b, fromMs);
    for (const k of ['open', 'next', 'shown'] as const) {
      if (t[k] !== vbb[k]) throw new Error(`${label} ${infantId}: the whole-stay sync differs from the uncached evaluation in ${k}`);
    }
    const bStored = JSON.stringify(storedFlags(infantId));
    const bClocks = JSON.stringify(storedClocks(infantId));
    sqlite.exec('COMMIT');
    compared += 1;
    if (a.windowFrom !== null) windowed += 1;
    const va = view(a, fromMs);
    const vb = view(b, fromMs);
    for (const k of Object.keys(va) as (keyof typeof va)[]) {
      if (va[k] !== vb[k])
        throw new Error(
          `${label} ${infantId} at ${now.toISOString()}: ${k} differs (window from ${a.windowFrom === null ? 'admission' : new Date(a.windowFrom).toISOString()})\n windowed: ${String(va[k])}\n whole:    ${String(vb[k])}`,
        );
    }
    if (aStored.replace(/"closed_by_reading_id":null/g, '') !== bStored.replace(/"closed_by_reading_id":null/g, '') && aStored !== bStored) {
      throw new Error(`${label} ${infantId}: stored flags differ\n windowed: ${aStored}\n whole:    ${bStored}`);
    }
    // Flag ids are new random ids in each replay; everything else must match.
    const noIds = (x: string) => x.replace(/\\"flagId\\":\\"[^\\]*\\",/g, '');
    if (noIds(aClocks) !== noIds(bClocks)) throw new Error(`${label} ${infantId}: stored check clocks differ\n windowed: ${aClocks}\n whole:    ${bClocks}`);
  };

  let now = new Date(t0.getTime());
  const infants = seed.infantIds;
  for (let step = 0; step < options.steps; step++) {
    now = new Date(now.getTime() + Math.floor(rand() * 50) * 60_000);
    const infantId = infants[Math.floor(rand() * infants.length)]!;
    const roll = rand();
    if (roll < 0.25) {
      // Time passing: a flowsheet read.
      compare('read', infantId, now, { from: now.getTime() - 72 * HOUR - 1 }, () => {});
      continue;
    }
    const late = rand() < 0.3;
    const takenAt = now.getTime() - (late ? Math.floor(rand() * 10 * HOUR) : 0);
    const kind = rand();
    const remote = 3700 + Math.round((rand() - 0.5) * 60);
    const manual = kind > 0.9;
    const row: NewReading = {
      id: randomUUID(),
      infantId,
      unitId: seed.unitId,
      takenAt,
      recordedAt: now.getTime(),
      recordedBy: 'u-nurse',
      probeCenti: kind < 0.2 ? remote + 80 : remote - 15,
      remoteCenti: rand() < 0.6 ? (kind > 0.2 && kind < 0.3 ? 3580 : kind > 0.3 && kind < 0.35 ? 3780 : remote) : null,
      remoteSite: 'axilla',
      airCenti: null,
      setCenti: 3650,
      controlMode: manual ? 'manual' : rand() < 0.5 ? 'skin-servo' : null,
      heaterOutputPct: manual ? 90 : 40,
      heartRate: rand() < 0.5 ? 140 + Math.round(rand() * 50) : null,
      heatSigns: kind > 0.85 && kind < 0.9 ? ['sweating'] : [],
      note: null,
      enteredUnit: 'C' as const,
      lateReason: late ? 'late' : null,
      sessionId: null,
      replacesId: null,
      correctionReason: null,
      correctionNote: null,
      enteredInError: false,
      requestHash: 'x',
    };
    compare(late ? 'late write' : 'write', infantId, now, { from: takenAt, excludeReadingId: row.id }, () => insertReading(sqlite, row));
  }
  return { compared, windowed, now };
}
