import type Database from 'better-sqlite3';
import { randomUUID } from 'node:crypto';
import { evaluateInfant, resolvePolicy, type EvaluatedFlag, type HeatStressSign, type UnitPolicy } from '../../shared/thermal';
import { appendAudit } from '../audit';

interface ReadingRow {
  id: string;
  taken_at: number;
  recorded_at: number;
  probe_centi: number | null;
  remote_centi: number | null;
  remote_site: 'axilla' | 'rectal' | 'other' | null;
  air_centi: number | null;
  set_centi: number | null;
  control_mode: 'skin-servo' | 'air-servo' | 'manual' | null;
  heater_output_pct: number | null;
  heart_rate: number | null;
  heat_signs: string;
  replaces_id: string | null;
  entered_in_error: number;
}

export interface UnitRow {
  id: string;
  time_zone: string;
  check_interval_minutes: number;
  due_soon_minutes: number;
  gap_limit_centi: number;
  escalation_delay_minutes: number;
  high_output_pct: number;
  day_shift_start: string;
  night_shift_start: string;
}

export function policyForUnit(unit: UnitRow): UnitPolicy {
  return resolvePolicy({
    checkIntervalMinutes: unit.check_interval_minutes,
    dueSoonMinutes: unit.due_soon_minutes,
    gapLimitCenti: unit.gap_limit_centi,
    escalationDelayMinutes: unit.escalation_delay_minutes,
    highOutputPct: unit.high_output_pct,
    dayShiftStart: unit.day_shift_start,
    nightShiftStart: unit.night_shift_start,
    timeZone: unit.time_zone,
  });
}

export function loadUnitRow(sqlite: Database.Database, unitId: string): UnitRow | undefined {
  return sqlite.prepare('SELECT * FROM units WHERE id = ?').get(unitId) as UnitRow | undefined;
}

/** Turn stored rows into the rules' input. Every version is passed; the rules pick the current ones. */
export function toRuleReading(r: ReadingRow) {
  return {
    id: r.id,
    takenAt: new Date(r.taken_at),
    recordedAt: new Date(r.recorded_at),
    probeCenti: r.probe_centi,
    remoteCenti: r.remote_centi,
    remoteSite: r.remote_site,
    airCenti: r.air_centi,
    setCenti: r.set_centi,
    controlMode: r.control_mode,
    heaterOutputPct: r.heater_output_pct,
    heartRate: r.heart_rate,
    heatSigns: JSON.parse(r.heat_signs) as HeatStressSign[],
    replacesId: r.replaces_id,
    enteredInError: r.entered_in_error === 1,
  };
}

export interface InfantState {
  readings: ReturnType<typeof toRuleReading>[];
  actions: Array<{ id: string; flagKey: string; kind: string; at: Date }>;
  sessions: Array<{ id: string; startedAt: Date; endedAt: Date | null; referenceCenti: number; limitCenti: number }>;
  admittedAt?: Date;
}

export function loadInfantState(sqlite: Database.Database, infantId: string, since?: number): InfantState {
  const infant = sqlite.prepare('SELECT admitted_at FROM infants WHERE id = ?').get(infantId) as { admitted_at: number } | undefined;
  const readings = (
    since === undefined
      ? sqlite.prepare('SELECT * FROM readings WHERE infant_id = ? ORDER BY taken_at, recorded_at').all(infantId)
      : sqlite.prepare('SELECT * FROM readings WHERE infant_id = ? AND taken_at >= ? ORDER BY taken_at, recorded_at').all(infantId, since)
  ) as ReadingRow[];
  const actions = sqlite
    .prepare('SELECT a.id, f.key AS flag_key, a.kind, a.at FROM actions a JOIN flags f ON f.id = a.flag_id WHERE a.infant_id = ? ORDER BY a.at')
    .all(infantId) as Array<{ id: string; flag_key: string; kind: string; at: number }>;
  const sessions = sqlite
    .prepare('SELECT id, started_at, ended_at, reference_centi, limit_centi FROM skin_to_skin_sessions WHERE infant_id = ? ORDER BY started_at')
    .all(infantId) as Array<{ id: string; started_at: number; ended_at: number | null; reference_centi: number; limit_centi: number }>;
  return {
    readings: readings.map(toRuleReading),
    actions: actions.map((a) => ({ id: a.id, flagKey: a.flag_key, kind: a.kind, at: new Date(a.at) })),
    sessions: sessions.map((s) => ({
      id: s.id,
      startedAt: new Date(s.started_at),
      endedAt: s.ended_at === null ? null : new Date(s.ended_at),
      referenceCenti: s.reference_centi,
      limitCenti: s.limit_centi,
    })),
    admittedAt: infant ? new Date(infant.admitted_at) : undefined,
  };
}

export interface SyncResult {
  raised: string[];
  closed: string[];
  evaluation: ReturnType<typeof evaluateInfant>;
}

/**
 * Store what the rules say about one infant: a flag row when a flag is first raised, a
 * resolution row when it closes. Stored flags are never rewritten, so a later change of
 * policy does not rewrite history. Call inside a write transaction.
 */
export function syncFlags(sqlite: Database.Database, infantId: string, now: Date, actorId: string | null): SyncResult {
  const infant = sqlite.prepare('SELECT unit_id, status FROM infants WHERE id = ?').get(infantId) as { unit_id: string; status: string } | undefined;
  if (!infant) throw new Error(`No infant ${infantId}`);
  const unit = loadUnitRow(sqlite, infant.unit_id)!;
  const evaluation = evaluateInfant(loadInfantState(sqlite, infantId), now, policyForUnit(unit));
  const stored = sqlite
    .prepare('SELECT f.id, f.key, r.flag_id AS resolved FROM flags f LEFT JOIN flag_resolutions r ON r.flag_id = f.id WHERE f.infant_id = ?')
    .all(infantId) as Array<{ id: string; key: string; resolved: string | null }>;
  const byKey = new Map(stored.map((s) => [s.key, s]));
  const seen = new Set<string>();
  const raised: string[] = [];
  const closed: string[] = [];
  const insertFlag = sqlite.prepare(
    'INSERT INTO flags (id, infant_id, unit_id, key, kind, raised_at, raised_by_reading_id, detail, created_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)',
  );
  const insertResolution = sqlite.prepare('INSERT INTO flag_resolutions (flag_id, closed_at, closed_by_reading_id, how, created_at) VALUES (?, ?, ?, ?, ?)');

  const close = (flagId: string, at: Date, readingId: string | null, how: string, key: string) => {
    insertResolution.run(flagId, at.getTime(), readingId, how, now.getTime());
    appendAudit(sqlite, { at: now, actorId, action: 'flag-closed', entityType: 'flag', entityId: flagId, unitId: infant.unit_id, after: { key, closedAt: at.toISOString(), closedByReadingId: readingId, how } });
    closed.push(flagId);
  };

  for (const flag of evaluation.flags) {
    seen.add(flag.key);
    let row = byKey.get(flag.key);
    if (!row) {
      // A flag that opened and closed entirely in the past (a late entry) is still recorded.
      const id = randomUUID();
      insertFlag.run(id, infantId, infant.unit_id, flag.key, flag.kind, flag.raisedAt.getTime(), flag.raisedByReadingId, JSON.stringify(flag.detail ?? {}), now.getTime());
      appendAudit(sqlite, { at: now, actorId, action: 'flag-raised', entityType: 'flag', entityId: id, unitId: infant.unit_id, after: serializeFlag(flag) });
      raised.push(id);
      row = { id, key: flag.key, resolved: null };
    }
    if (flag.status === 'closed' && !row.resolved) close(row.id, flag.closedAt ?? now, flag.closedByReadingId, closingHow(flag), flag.key);
  }
  // A stored open flag the rules no longer see (its reading was entered in error, or the infant left).
  for (const row of stored) {
    if (!seen.has(row.key) && !row.resolved) close(row.id, now, null, infant.status === 'discharged' ? 'discharged' : 'reading-corrected', row.key);
  }
  return { raised, closed, evaluation };
}

function closingHow(flag: EvaluatedFlag): string {
  if (flag.kind === 'overdue-check') return 'check-recorded';
  if (flag.kind === 'skin-to-skin-deviation' && !flag.closedByReadingId) return 'session-ended';
  return 'recheck';
}

function serializeFlag(flag: EvaluatedFlag) {
  return { key: flag.key, kind: flag.kind, raisedAt: flag.raisedAt.toISOString(), raisedByReadingId: flag.raisedByReadingId, detail: flag.detail };
}
