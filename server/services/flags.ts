import { prepared } from '../../db/client';
import type Database from 'better-sqlite3';
import { randomUUID } from 'node:crypto';
import { evaluateInfant, resolvePolicy, severityOf, SEVERITY_RANK, type EvaluatedFlag, type HeatStressSign, type Severity, type UnitPolicy } from '../../shared/thermal';
import { appendAudit } from '../audit';
import {
  appendFlagEvent,
  dbOf,
  loadPolicyVersions,
  onTimeCheckFor,
  readClocks,
  versionAt,
  writeClocks,
  type StoredOpenFlag,
  type StoredPolicyVersion,
} from './flag-lifecycle';

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

/**
 * The unit's policy in force at `ms`: the settings version in force then, else the unit's row.
 * Settings a unit row has no column for (per-kind escalation delays, settle time) live only in
 * versions.
 */
export function policyAt(unit: UnitRow, versions: readonly StoredPolicyVersion[], ms: number): { policy: UnitPolicy; versionId: string | null } {
  const v = versionAt(versions, ms);
  return v ? { policy: resolvePolicy(v.policy), versionId: v.id } : { policy: policyForUnit(unit), versionId: null };
}

export function loadUnitRow(sqlite: Database.Database, unitId: string): UnitRow | undefined {
  return prepared(sqlite, 'SELECT * FROM units WHERE id = ?').get(unitId) as UnitRow | undefined;
}

/**
 * A flag the rules see again after it was withdrawn or closed (a correction, an entry in error)
 * is stored as a new row continuing it: the rules' key with `#<n>` on the end (keys are unique
 * per infant and resolutions are append-only, one per row). This gives the rules' key back.
 */
export function ruleKeyOf(storedKey: string): string {
  const at = storedKey.lastIndexOf('#');
  return at > 0 && /^\d+$/.test(storedKey.slice(at + 1)) ? storedKey.slice(0, at) : storedKey;
}

function reopeningOf(storedKey: string): number {
  const at = storedKey.lastIndexOf('#');
  return at > 0 && /^\d+$/.test(storedKey.slice(at + 1)) ? Number(storedKey.slice(at + 1)) : 0;
}

/** Each rule key's current stored row id (the latest reopening): for answers naming flag ids. */
export function currentFlagIds(sqlite: Database.Database, infantId: string): Map<string, string> {
  const rows = prepared(sqlite, 'SELECT id, key FROM flags WHERE infant_id = ?').all(infantId) as Array<{ id: string; key: string }>;
  const best = new Map<string, { id: string; n: number }>();
  for (const r of rows) {
    const k = ruleKeyOf(r.key);
    const n = reopeningOf(r.key);
    const was = best.get(k);
    if (!was || n > was.n) best.set(k, { id: r.id, n });
  }
  return new Map([...best].map(([k, v]) => [k, v.id]));
}

/** Shared and frozen: the rules only read a reading's signs. */
const NO_SIGNS: HeatStressSign[] = Object.freeze([]) as unknown as HeatStressSign[];

/** Turn stored rows into the rules' input. Every version is passed; the rules pick the current ones. */
export function toRuleReading(r: ReadingRow & { rowid_?: number }) {
  return {
    id: r.id,
    // Readings with equal taken and recorded times keep the order they were stored in.
    seq: r.rowid_,
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
    // Almost every row has no heat signs; parsing '[]' thousands of times per board build shows in a profile.
    heatSigns: r.heat_signs === '[]' ? NO_SIGNS : (JSON.parse(r.heat_signs) as HeatStressSign[]),
    replacesId: r.replaces_id,
    enteredInError: r.entered_in_error === 1,
  };
}

/**
 * toRuleReading for a row read with `.raw()`: `values[at...]` are the RULE_COLUMNS in their order.
 * Building the object here is cheaper than better-sqlite3 building a keyed row for each of
 * thousands of readings (most of a board build was that).
 */
export function ruleReadingFromValues(values: unknown[], at = 0) {
  const v = (column: (typeof RULE_COLUMN_LIST)[number]) => values[at + AT[column]] as never;
  return toRuleReading({
    id: v('id'),
    taken_at: v('taken_at'),
    recorded_at: v('recorded_at'),
    probe_centi: v('probe_centi'),
    remote_centi: v('remote_centi'),
    remote_site: v('remote_site'),
    air_centi: v('air_centi'),
    set_centi: v('set_centi'),
    control_mode: v('control_mode'),
    heater_output_pct: v('heater_output_pct'),
    heart_rate: v('heart_rate'),
    heat_signs: v('heat_signs'),
    replaces_id: v('replaces_id'),
    entered_in_error: v('entered_in_error'),
  });
}

export interface InfantState {
  readings: ReturnType<typeof toRuleReading>[];
  actions: Array<{ id: string; flagKey: string; kind: string; at: Date }>;
  sessions: Array<{ id: string; startedAt: Date; endedAt: Date | null; referenceCenti: number; limitCenti: number }>;
  admittedAt?: Date;
}

/** The columns the rules read: never `SELECT *` (notes and reasons are dead weight here). */
const RULE_COLUMN_LIST = [
  'id',
  'taken_at',
  'recorded_at',
  'probe_centi',
  'remote_centi',
  'remote_site',
  'air_centi',
  'set_centi',
  'control_mode',
  'heater_output_pct',
  'heart_rate',
  'heat_signs',
  'replaces_id',
  'entered_in_error',
] as const satisfies ReadonlyArray<keyof ReadingRow>;
export const RULE_COLUMNS = RULE_COLUMN_LIST.join(', ');
/** Each rule column's place in RULE_COLUMNS, for rows read with `.raw()`. */
const AT = Object.fromEntries(RULE_COLUMN_LIST.map((c, i) => [c, i])) as Record<(typeof RULE_COLUMN_LIST)[number], number>;

export function loadInfantState(sqlite: Database.Database, infantId: string, since?: number): InfantState {
  const readings = (
    since === undefined
      ? prepared(sqlite, `SELECT rowid AS rowid_, ${RULE_COLUMNS} FROM readings WHERE infant_id = ? ORDER BY taken_at, recorded_at, rowid`).all(infantId)
      : prepared(sqlite, `SELECT rowid AS rowid_, ${RULE_COLUMNS} FROM readings WHERE infant_id = ? AND taken_at >= ? ORDER BY taken_at, recorded_at, rowid`).all(infantId, since)
  ) as ReadingRow[];
  return loadStateWith(sqlite, infantId, readings.map(toRuleReading));
}

type RuleReading = ReturnType<typeof toRuleReading>;

type CachedReading = RuleReading & { rowid: number; takenMs: number; recordedMs: number };

interface CachedRuleReadings {
  dataVersion: number;
  /** Every row of the infant up to this rowid is in `readings`; later rows are read fresh. */
  maxRowid: number;
  /** In the rules' order (taken, then recorded), so a window is a binary search away. */
  readings: CachedReading[];
  usedAt: number;
}

const ruleReadingCaches = new WeakMap<Database.Database, Map<string, CachedRuleReadings>>();

/**
 * Keep the infant's readings, parsed for the rules, in memory: reading and converting a long
 * stay's rows was most of a write's cost. Readings are never updated or deleted (a correction is
 * a new row), so rows once committed stay valid; this runs only outside a transaction, so only
 * committed rows are kept (never a row a rolled-back savepoint took back). A commit by another
 * connection (PRAGMA data_version) drops the entry: it could have been anything. Call it before
 * a write transaction that runs syncFlags; syncFlags reads the rows added since.
 */
export function primeRuleReadings(sqlite: Database.Database, infantId: string): void {
  if (sqlite.inTransaction) return;
  let cache = ruleReadingCaches.get(sqlite);
  if (!cache) {
    cache = new Map();
    ruleReadingCaches.set(sqlite, cache);
  }
  const dataVersion = prepared(sqlite, 'PRAGMA data_version').pluck().get() as number;
  const now = Date.now();
  let entry = cache.get(infantId);
  if (entry && entry.dataVersion !== dataVersion) entry = undefined;
  const added = newRows(sqlite, infantId, entry?.maxRowid ?? -1);
  const readings = mergeInOrder(entry?.readings ?? [], added);
  const maxRowid = added.reduce((max, r) => Math.max(max, r.rowid), entry?.maxRowid ?? -1);
  // Charts no one wrote to or read for ten minutes go (discharged infants).
  for (const [id, e] of cache) if (now - e.usedAt > 600_000) cache.delete(id);
  cache.set(infantId, { dataVersion, maxRowid, readings, usedAt: now });
}

function newRows(sqlite: Database.Database, infantId: string, afterRowid: number): CachedReading[] {
  const rows = prepared(sqlite, `SELECT rowid AS rowid_, ${RULE_COLUMNS} FROM readings WHERE infant_id = ? AND rowid > ?`).all(infantId, afterRowid) as Array<
    ReadingRow & { rowid_: number }
  >;
  return rows.map((r) => ({ ...toRuleReading(r), rowid: r.rowid_, takenMs: r.taken_at, recordedMs: r.recorded_at }));
}

/** The order of the query's ORDER BY taken_at, recorded_at. */
const inRuleOrder = (a: CachedReading, b: CachedReading) => a.takenMs - b.takenMs || a.recordedMs - b.recordedMs || a.rowid - b.rowid;

/** `sorted` with `added` merged in; new readings almost always go on the end. Neither is changed. */
function mergeInOrder(sorted: CachedReading[], added: CachedReading[]): CachedReading[] {
  if (added.length === 0) return sorted;
  const fresh = added.slice().sort(inRuleOrder);
  const last = sorted[sorted.length - 1];
  if (last === undefined || inRuleOrder(last, fresh[0]!) <= 0) return sorted.concat(fresh);
  return sorted.concat(fresh).sort(inRuleOrder);
}

/** The rules' readings from `since` (all when undefined), from the primed cache when it is valid. */
function ruleReadings(sqlite: Database.Database, infantId: string, since: number | undefined): RuleReading[] | null {
  const entry = ruleReadingCaches.get(sqlite)?.get(infantId);
  if (!entry || entry.dataVersion !== (prepared(sqlite, 'PRAGMA data_version').pluck().get() as number)) return null;
  entry.usedAt = Date.now();
  const all = mergeInOrder(entry.readings, newRows(sqlite, infantId, entry.maxRowid));
  if (since === undefined) return all === entry.readings ? all.slice() : all;
  // The first reading taken at or after `since`.
  let lo = 0;
  let hi = all.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (all[mid]!.takenMs < since) lo = mid + 1;
    else hi = mid;
  }
  return all.slice(lo);
}

function loadStateWith(sqlite: Database.Database, infantId: string, readings: RuleReading[]): InfantState {
  const infant = prepared(sqlite, 'SELECT admitted_at FROM infants WHERE id = ?').get(infantId) as { admitted_at: number } | undefined;
  const actions = prepared(sqlite, 'SELECT a.id, f.key AS flag_key, a.kind, a.at FROM actions a JOIN flags f ON f.id = a.flag_id WHERE a.infant_id = ? AND NOT EXISTS (SELECT 1 FROM action_undos u WHERE u.action_id = a.id) ORDER BY a.at')
    .all(infantId) as Array<{ id: string; flag_key: string; kind: string; at: number }>;
  const sessions = prepared(sqlite, 'SELECT id, started_at, ended_at, reference_centi, limit_centi FROM skin_to_skin_sessions WHERE infant_id = ? ORDER BY started_at')
    .all(infantId) as Array<{ id: string; started_at: number; ended_at: number | null; reference_centi: number; limit_centi: number }>;
  return {
    readings,
    actions: actions.map((a) => ({ id: a.id, flagKey: ruleKeyOf(a.flag_key), kind: a.kind, at: new Date(a.at) })),
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
  /** Open flags this sync found more severe than before (a severity-changed event): they may escalate again. */
  worsened: string[];
  evaluation: ReturnType<typeof evaluateInfant>;
  /**
   * Where the evaluation started: null when it covered the whole stay. A windowed evaluation's
   * flags are exactly the whole stay's from this instant on; every flag raised earlier is stored
   * and closed before it (see restartPoint), so callers showing flags from a later time lose
   * nothing. Its `latest` values may miss a control mode or set temperature charted earlier.
   */
  windowFrom: number | null;
}

export interface SyncWindow {
  /**
   * The earliest chart time the caller needs evaluated exactly: the taken time of a reading just
   * recorded, or the start of the window a flowsheet shows. The evaluation starts at or before it.
   */
  from: number;
  /** A reading inserted in this transaction: never a restart point (its own sync is this one). */
  excludeReadingId?: string;
}

/**
 * Where the rules can start instead of admission, giving the same flags from there on as the
 * whole stay: a remote-site check R such that
 * - R is a current version, not entered in error, charted in a servo mode (so the manual-mode
 *   rule holds no state from before R) and taken after admission, and not later than it was
 *   recorded (so its own sync, which ran when it was recorded, saw every flag raised before it);
 * - every stored flag raised before R closed before R, or was closed by R itself: then no rule
 *   (gap, heat, cold, manual mode, skin-to-skin) carries an open flag into R, and after R the
 *   check schedule runs from R in both evaluations;
 * - no correction chain of the infant has a version before R (a correction can change history
 *   in ways the stored flags never show, since they are not rewritten; such infants keep the
 *   whole-stay evaluation back to their first correction);
 * - no other reading shares R's time (R must be the first reading the window's rules see); when
 *   one does, the search goes on from the reading before.
 * Null when there is none: evaluate the whole stay, as before.
 */
function restartPoint(sqlite: Database.Database, infantId: string, admittedAt: number, window: SyncWindow): number | null {
  const firstCorrection = prepared(
    sqlite,
    `SELECT MIN(MIN(y.taken_at, x.taken_at)) AS at FROM readings y JOIN readings x ON x.id = y.replaces_id
      WHERE y.infant_id = ? AND y.replaces_id IS NOT NULL`,
  ).get(infantId) as { at: number | null };
  let before = Math.min(window.from, firstCorrection.at === null ? Number.POSITIVE_INFINITY : firstCorrection.at - 1);
  const candidate = prepared(
    sqlite,
    `SELECT r.id, r.taken_at FROM readings r
      WHERE r.infant_id = @infantId AND r.taken_at <= @before AND r.taken_at >= @admittedAt AND r.taken_at <= r.recorded_at
        AND r.remote_centi IS NOT NULL AND r.control_mode IN ('skin-servo', 'air-servo') AND r.entered_in_error = 0
        AND r.id IS NOT @exclude AND r.replaces_id IS NULL
        AND NOT EXISTS (SELECT 1 FROM readings y WHERE y.replaces_id = r.id)
      ORDER BY r.taken_at DESC LIMIT 1`,
  );
  const blocker = prepared(
    sqlite,
    `SELECT MIN(f.raised_at) AS at FROM flags f LEFT JOIN flag_resolutions x ON x.flag_id = f.id
      WHERE f.infant_id = @infantId AND f.raised_at < @at
        AND (x.flag_id IS NULL OR x.closed_at > @at OR (x.closed_at = @at AND x.closed_by_reading_id IS NOT @id))`,
  );
  const sameTime = prepared(sqlite, 'SELECT 1 FROM readings WHERE infant_id = ? AND taken_at = ? AND id <> ? LIMIT 1');
  // A few steps back past flags that were still open; a chart with flags open for most of the
  // stay is rare and is simply evaluated whole.
  for (let step = 0; step < 4; step++) {
    const r = candidate.get({ infantId, before, admittedAt, exclude: window.excludeReadingId ?? null }) as { id: string; taken_at: number } | undefined;
    if (!r) return null;
    const open = blocker.get({ infantId, at: r.taken_at, id: r.id }) as { at: number | null };
    if (open.at === null) {
      if (!sameTime.get(infantId, r.taken_at, r.id)) return r.taken_at;
      // Another reading shares R's time (two saves in the same millisecond): try the one before.
      before = r.taken_at - 1;
      continue;
    }
    // The reading that raised the oldest such flag may itself be the restart point.
    before = open.at;
  }
  return null;
}

/**
 * Store what the rules say about one infant: a flag row when a flag is first raised, a
 * resolution row when it closes. Stored flags are never rewritten, so a later change of
 * policy does not rewrite history. Call inside a write transaction.
 *
 * Without `window` the whole stay is evaluated. With it, the rules start at a restart point at
 * or before `window.from` when one exists (restartPoint): a write or a flowsheet then costs a
 * few readings' work instead of the whole stay's, with the same flags from the window on.
 */
export function syncFlags(sqlite: Database.Database, infantId: string, now: Date, actorId: string | null, window?: SyncWindow): SyncResult {
  const infant = prepared(sqlite, 'SELECT unit_id, status, admitted_at FROM infants WHERE id = ?').get(infantId) as
    | { unit_id: string; status: string; admitted_at: number }
    | undefined;
  if (!infant) throw new Error(`No infant ${infantId}`);
  const unit = prepared(sqlite, 'SELECT * FROM units WHERE id = ?').get(infant.unit_id) as UnitRow;
  const windowFrom = window ? restartPoint(sqlite, infantId, infant.admitted_at, { ...window, from: Math.min(window.from, now.getTime()) }) : null;
  let state: InfantState;
  const since = windowFrom ?? undefined;
  const cached = ruleReadings(sqlite, infantId, since);
  const loaded = cached ? loadStateWith(sqlite, infantId, cached) : loadInfantState(sqlite, infantId, since);
  if (windowFrom === null) state = loaded;
  else {
    const full = loaded;
    // The schedule runs from the restart point (the first reading), not from admission: the
    // checks before it are history the stored flags already hold.
    state = { ...full, admittedAt: undefined };
  }
  const db = dbOf(sqlite);
  const versions = loadPolicyVersions(db, infant.unit_id);
  const { policy, versionId } = policyAt(unit, versions, now.getTime());
  const evaluation = evaluateInfant(state, now, policy, versions);
  const stored = prepared(
    sqlite,
    `SELECT f.id, f.key, f.kind, f.raised_at, f.raised_by_reading_id, f.detail, f.severity, r.flag_id AS resolved, r.how,
            EXISTS (SELECT 1 FROM flag_events e WHERE e.flag_id = f.id AND e.event = 'withdrawn') AS withdrawn_event
       FROM flags f LEFT JOIN flag_resolutions r ON r.flag_id = f.id WHERE f.infant_id = ?`,
  ).all(infantId) as Array<{
    id: string;
    key: string;
    kind: string;
    raised_at: number;
    raised_by_reading_id: string | null;
    detail: string;
    severity: Severity | null;
    resolved: string | null;
    how: string | null;
    withdrawn_event: number;
  }>;
  const previous = readClocks(db, infantId);
  const lastSeverity = new Map((previous ? (JSON.parse(previous.openFlags) as StoredOpenFlag[]) : []).map((f) => [f.flagId, f.severity]));
  const openNow: StoredOpenFlag[] = [];
  const event = (flagId: string, e: Omit<Parameters<typeof appendFlagEvent>[1], 'flagId' | 'infantId' | 'unitId' | 'now'>) =>
    appendFlagEvent(db, { flagId, infantId, unitId: infant.unit_id, now, actorId, ...e });
  // Each rule key's current row: the latest reopening of it.
  const byKey = new Map<string, (typeof stored)[number]>();
  for (const row of stored) {
    const k = ruleKeyOf(row.key);
    const was = byKey.get(k);
    if (!was || reopeningOf(row.key) > reopeningOf(was.key)) byKey.set(k, row);
  }
  const current = new Set([...byKey.values()].map((r) => r.id));
  const seen = new Set<string>();
  const raised: string[] = [];
  const closed: string[] = [];
  const worsened: string[] = [];
  const insertFlag = prepared(
    sqlite,
    'INSERT INTO flags (id, infant_id, unit_id, key, kind, raised_at, raised_by_reading_id, detail, severity, policy_version_id, created_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)',
  );
  const insertResolution = prepared(sqlite, 'INSERT INTO flag_resolutions (flag_id, closed_at, closed_by_reading_id, how, created_at) VALUES (?, ?, ?, ?, ?)');

  const close = (flagId: string, at: Date, readingId: string | null, how: string, key: string, reason?: string) => {
    insertResolution.run(flagId, at.getTime(), readingId, how, now.getTime());
    appendAudit(sqlite, { at: now, actorId, action: 'flag-closed', entityType: 'flag', entityId: flagId, unitId: infant.unit_id, after: { key, closedAt: at.toISOString(), closedByReadingId: readingId, how, reason } });
    if (how === 'withdrawn') event(flagId, { event: 'withdrawn', at, readingId, detail: { reason, readingId } });
    else event(flagId, { event: 'closed', at, readingId, detail: { how } });
    closed.push(flagId);
  };

  for (const flag of evaluation.flags) {
    seen.add(flag.key);
    let row = byKey.get(flag.key);
    // The rules see again a flag that was withdrawn, or see open one that was closed (the reading
    // that closed it was corrected or entered in error): it is reopened as a new row continuing
    // the old one, with a `reopened` event naming it. A discharge is never undone here.
    let reopenedFrom: { id: string; key: string; how: string | null } | null = null;
    if (
      row?.resolved &&
      infant.status !== 'discharged' &&
      row.how !== 'discharged' &&
      (row.how === 'withdrawn' || row.withdrawn_event === 1 || flag.status === 'open')
    ) {
      reopenedFrom = { id: row.id, key: row.key, how: row.withdrawn_event === 1 ? 'withdrawn' : row.how };
      row = undefined;
    }
    if (!row) {
      // A flag that opened and closed entirely in the past (a late entry) is still recorded.
      const id = randomUUID();
      const raisedUnder = policyAt(unit, versions, flag.raisedAt.getTime()).versionId;
      const severity = flag.severity;
      const detail = JSON.stringify(flag.detail ?? {});
      const storedKey = reopenedFrom ? `${flag.key}#${reopeningOf(reopenedFrom.key) + 1}` : flag.key;
      insertFlag.run(id, infantId, infant.unit_id, storedKey, flag.kind, flag.raisedAt.getTime(), flag.raisedByReadingId, detail, severity, raisedUnder, now.getTime());
      appendAudit(sqlite, { at: now, actorId, action: 'flag-raised', entityType: 'flag', entityId: id, unitId: infant.unit_id, after: serializeFlag(flag) });
      if (reopenedFrom) {
        event(id, { event: 'reopened', at: now, readingId: flag.raisedByReadingId, severity, policyVersionId: raisedUnder, detail: { previousFlagId: reopenedFrom.id, was: reopenedFrom.how } });
        appendAudit(sqlite, { at: now, actorId, action: 'flag-reopened', entityType: 'flag', entityId: id, unitId: infant.unit_id, after: { key: storedKey, previousFlagId: reopenedFrom.id, was: reopenedFrom.how } });
      } else {
        event(id, { event: 'raised', at: flag.raisedAt, readingId: flag.raisedByReadingId, severity, policyVersionId: raisedUnder, detail: flag.detail });
      }
      raised.push(id);
      row = { id, key: storedKey, kind: flag.kind, raised_at: flag.raisedAt.getTime(), raised_by_reading_id: flag.raisedByReadingId, detail, severity, resolved: null, how: null, withdrawn_event: 0 };
      lastSeverity.set(id, severity);
    }
    if (flag.status === 'closed' && !row.resolved) {
      if (flag.severity !== (lastSeverity.get(row.id) ?? flag.severity)) {
        event(row.id, { event: 'severity-changed', at: flag.severitySince, severity: flag.severity, detail: flag.detail });
      }
      close(row.id, flag.closedAt ?? now, flag.closedByReadingId, closingHow(flag), flag.key);
    } else if (flag.status === 'open' && !row.resolved) {
      const before = lastSeverity.get(row.id) ?? row.severity ?? severityOfRow(row);
      if (before !== flag.severity) {
        // At the reading that made it worse (a late entry may have been taken a while ago).
        event(row.id, { event: 'severity-changed', at: flag.severitySince, severity: flag.severity, detail: flag.detail });
        if (SEVERITY_RANK[flag.severity] > SEVERITY_RANK[before]) worsened.push(row.id);
      }
      openNow.push({
        flagId: row.id,
        key: flag.key,
        severity: flag.severity,
        severitySince: flag.severitySince.toISOString(),
        detail: flag.detail,
        recheckDueAt: flag.recheckDueAt?.toISOString() ?? null,
        recheckCountsFrom: flag.recheckCountsFrom?.toISOString() ?? null,
      });
    }
  }
  // A stored open flag the rules no longer see (its reading was entered in error, or the infant
  // left). A windowed evaluation only speaks for flags raised inside its window; restartPoint
  // guarantees every open stored flag is, so this is a guard, not a behaviour.
  for (const row of stored) {
    if (!current.has(row.id) || seen.has(ruleKeyOf(row.key))) continue;
    if (row.resolved) {
      // Closed, but the rules no longer see it at all: the reading that raised it was corrected
      // away, so it should never have been raised. The closing stays; the flag is withdrawn.
      if (row.how !== 'withdrawn' && row.how !== 'discharged' && row.withdrawn_event === 0 && (windowFrom === null || row.raised_at >= windowFrom)) {
        const shownBy = row.raised_by_reading_id ? latestVersionOf(sqlite, row.raised_by_reading_id) : null;
        event(row.id, { event: 'withdrawn', at: now, readingId: shownBy, detail: { reason: 'reading-corrected', readingId: shownBy } });
        appendAudit(sqlite, { at: now, actorId, action: 'flag-withdrawn', entityType: 'flag', entityId: row.id, unitId: infant.unit_id, after: { key: row.key, reason: 'reading-corrected', readingId: shownBy } });
      }
      continue;
    }
    if (windowFrom !== null && row.raised_at < windowFrom) {
      // Raised before the window: still open as far as the rules can tell; keep showing it.
      const kept = previous ? (JSON.parse(previous.openFlags) as StoredOpenFlag[]).find((f) => f.flagId === row.id) : undefined;
      if (kept) openNow.push(kept);
      continue;
    }
    if (infant.status === 'discharged') close(row.id, now, null, 'discharged', row.key);
    else if (row.kind === 'overdue-check') {
      // A check charted late whose taken time was on time: the flag should never have been raised.
      const due = row.raised_at;
      const from = row.raised_by_reading_id
        ? (prepared(sqlite, 'SELECT taken_at FROM readings WHERE id = ?').get(row.raised_by_reading_id) as { taken_at: number } | undefined)?.taken_at ?? infant.admitted_at
        : infant.admitted_at;
      const shownBy = onTimeCheckFor(db, infantId, from, due);
      close(row.id, now, shownBy, 'withdrawn', row.key, shownBy ? 'late-entry-on-time' : 'reading-corrected');
    } else close(row.id, now, null, 'withdrawn', row.key, 'reading-corrected');
  }
  writeClocks(db, { infantId, unitId: infant.unit_id, now, policy, policyVersionId: versionId, evaluation, openFlags: openNow, previous, windowed: windowFrom !== null });
  return { raised, closed, worsened, evaluation, windowFrom };
}

/** The latest version of a reading's correction chain (itself when never corrected). */
function latestVersionOf(sqlite: Database.Database, readingId: string): string {
  const next = prepared(sqlite, 'SELECT id FROM readings WHERE replaces_id = ?');
  let id = readingId;
  for (let i = 0; i < 100; i++) {
    const row = next.get(id) as { id: string } | undefined;
    if (!row) break;
    id = row.id;
  }
  return id;
}

function severityOfRow(row: { kind: string; detail: string }): Severity {
  return severityOf(row.kind, JSON.parse(row.detail));
}

function closingHow(flag: EvaluatedFlag): string {
  if (flag.kind === 'overdue-check') return 'check-recorded';
  if (flag.kind === 'skin-to-skin-deviation' && !flag.closedByReadingId) return 'session-ended';
  return 'recheck';
}

function serializeFlag(flag: EvaluatedFlag) {
  return { key: flag.key, kind: flag.kind, raisedAt: flag.raisedAt.toISOString(), raisedByReadingId: flag.raisedByReadingId, detail: flag.detail };
}
