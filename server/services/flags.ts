import type Database from 'better-sqlite3';
import { randomUUID } from 'node:crypto';
import { and, asc, desc, eq, gt, gte, inArray, isNotNull, isNull, lt, lte, min, ne, or, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/sqlite-core';
import { actions, actionUndos, flagEvents, flagResolutions, flags, infants, readings, skinToSkinSessions, units } from '../../db/schema';
import { evaluateInfant, resolvePolicy, severityOf, SEVERITY_RANK, type EvaluatedFlag, type HeatStressSign, type Severity, type UnitPolicy } from '../../shared/thermal';
import { appendAudit } from '../audit';
import { appendFlagEvent, dbOf, loadPolicyVersions, onTimeCheckFor, readClocks, versionAt, writeClocks, type StoredOpenFlag, type StoredPolicyVersion } from './flag-lifecycle';
import { perConnection } from './prepared-queries';

/** A unit's row, as the schema types it. */
export type UnitRow = typeof units.$inferSelect;

/** The unit row's clinical settings (the rest of the policy lives only in settings versions). */
export type UnitSettingsRow = Pick<
  UnitRow,
  'timeZone' | 'checkIntervalMinutes' | 'dueSoonMinutes' | 'gapLimitCenti' | 'escalationDelayMinutes' | 'highOutputPct' | 'dayShiftStart' | 'nightShiftStart'
>;

export function policyForUnit(unit: UnitSettingsRow): UnitPolicy {
  return resolvePolicy({
    checkIntervalMinutes: unit.checkIntervalMinutes,
    dueSoonMinutes: unit.dueSoonMinutes,
    gapLimitCenti: unit.gapLimitCenti,
    escalationDelayMinutes: unit.escalationDelayMinutes,
    highOutputPct: unit.highOutputPct,
    dayShiftStart: unit.dayShiftStart,
    nightShiftStart: unit.nightShiftStart,
    timeZone: unit.timeZone,
  });
}

/**
 * The unit's policy in force at `ms`: the settings version in force then, else the unit's row.
 * Settings a unit row has no column for (per-kind escalation delays, settle time) live only in
 * versions.
 */
export function policyAt(unit: UnitSettingsRow, versions: readonly StoredPolicyVersion[], ms: number): { policy: UnitPolicy; versionId: string | null } {
  const v = versionAt(versions, ms);
  return v ? { policy: resolvePolicy(v.policy), versionId: v.id } : { policy: policyForUnit(unit), versionId: null };
}

// sql fragment: rowid (the order rows were stored in) breaks ties of taken and recorded times; the schema has no column for it.
const readingOrder = sql<number>`${readings}.rowid`;

/** The columns the rules read: never every column (notes and reasons are dead weight here). */
const ruleColumns = {
  rowid: readingOrder,
  id: readings.id,
  takenAt: readings.takenAt,
  recordedAt: readings.recordedAt,
  probeCenti: readings.probeCenti,
  remoteCenti: readings.remoteCenti,
  remoteSite: readings.remoteSite,
  airCenti: readings.airCenti,
  setCenti: readings.setCenti,
  controlMode: readings.controlMode,
  heaterOutputPct: readings.heaterOutputPct,
  heartRate: readings.heartRate,
  heatSigns: readings.heatSigns,
  replacesId: readings.replacesId,
  enteredInError: readings.enteredInError,
};

type ReadingRow = Pick<
  typeof readings.$inferSelect,
  | 'id'
  | 'takenAt'
  | 'recordedAt'
  | 'probeCenti'
  | 'remoteCenti'
  | 'remoteSite'
  | 'airCenti'
  | 'setCenti'
  | 'controlMode'
  | 'heaterOutputPct'
  | 'heartRate'
  | 'heatSigns'
  | 'replacesId'
  | 'enteredInError'
> & { rowid: number };

const y = alias(readings, 'y');
const x = alias(readings, 'x');

/**
 * The reads of every write's sync (syncFlags and its restart point), prepared once per
 * connection: a reading POST runs each of them. Instants bound to placeholders are passed as
 * milliseconds (a placeholder skips the column's Date mapping).
 */
const flagQueries = perConnection((db) => ({
  unit: db
    .select()
    .from(units)
    .where(eq(units.id, sql.placeholder('id')))
    .prepare(),
  infant: db
    .select({ unitId: infants.unitId, status: infants.status, admittedAt: infants.admittedAt })
    .from(infants)
    .where(eq(infants.id, sql.placeholder('id')))
    .prepare(),
  flagKeys: db
    .select({ id: flags.id, key: flags.key })
    .from(flags)
    .where(eq(flags.infantId, sql.placeholder('infantId')))
    .prepare(),
  readings: db
    .select(ruleColumns)
    .from(readings)
    .where(eq(readings.infantId, sql.placeholder('infantId')))
    .orderBy(asc(readings.takenAt), asc(readings.recordedAt), asc(readingOrder))
    .prepare(),
  readingsSince: db
    .select(ruleColumns)
    .from(readings)
    .where(and(eq(readings.infantId, sql.placeholder('infantId')), gte(readings.takenAt, sql.placeholder('since'))))
    .orderBy(asc(readings.takenAt), asc(readings.recordedAt), asc(readingOrder))
    .prepare(),
  actions: db
    .select({ id: actions.id, flagKey: flags.key, kind: actions.kind, at: actions.at })
    .from(actions)
    .innerJoin(flags, eq(flags.id, actions.flagId))
    // An undone action (entered in error) does not count for the rules.
    .leftJoin(actionUndos, eq(actionUndos.actionId, actions.id))
    .where(and(eq(actions.infantId, sql.placeholder('infantId')), isNull(actionUndos.id)))
    .orderBy(asc(actions.at))
    .prepare(),
  sessions: db
    .select({
      id: skinToSkinSessions.id,
      startedAt: skinToSkinSessions.startedAt,
      endedAt: skinToSkinSessions.endedAt,
      referenceCenti: skinToSkinSessions.referenceCenti,
      limitCenti: skinToSkinSessions.limitCenti,
    })
    .from(skinToSkinSessions)
    .where(eq(skinToSkinSessions.infantId, sql.placeholder('infantId')))
    .orderBy(asc(skinToSkinSessions.startedAt))
    .prepare(),
  /** The earliest taken time of any version in a correction chain (the corrected and the correcting row). */
  firstCorrection: db
    .select({ corrected: min(x.takenAt), correcting: min(y.takenAt) })
    .from(y)
    .innerJoin(x, eq(x.id, y.replacesId))
    .where(and(eq(y.infantId, sql.placeholder('infantId')), isNotNull(y.replacesId)))
    .prepare(),
  /** The latest current, servo-mode remote-site check at or before `before`: a restart point candidate. */
  restartCandidate: db
    .select({ id: readings.id, takenAt: readings.takenAt })
    .from(readings)
    // A row that a later version replaced is not current.
    .leftJoin(y, eq(y.replacesId, readings.id))
    .where(
      and(
        eq(readings.infantId, sql.placeholder('infantId')),
        lte(readings.takenAt, sql.placeholder('before')),
        gte(readings.takenAt, sql.placeholder('admittedAt')),
        lte(readings.takenAt, readings.recordedAt),
        isNotNull(readings.remoteCenti),
        inArray(readings.controlMode, ['skin-servo', 'air-servo']),
        eq(readings.enteredInError, false),
        // '' when nothing is excluded: no reading has an empty id.
        ne(readings.id, sql.placeholder('exclude')),
        isNull(readings.replacesId),
        isNull(y.id),
      ),
    )
    .orderBy(desc(readings.takenAt))
    .limit(1)
    .prepare(),
  /** The earliest raising of a flag raised before `at` and still open at it (closed by `id` excepted). */
  openBlocker: db
    .select({ at: min(flags.raisedAt) })
    .from(flags)
    .leftJoin(flagResolutions, eq(flagResolutions.flagId, flags.id))
    .where(
      and(
        eq(flags.infantId, sql.placeholder('infantId')),
        lt(flags.raisedAt, sql.placeholder('at')),
        or(
          isNull(flagResolutions.flagId),
          gt(flagResolutions.closedAt, sql.placeholder('at')),
          and(eq(flagResolutions.closedAt, sql.placeholder('at')), or(isNull(flagResolutions.closedByReadingId), ne(flagResolutions.closedByReadingId, sql.placeholder('id')))),
        ),
      ),
    )
    .prepare(),
  sameTime: db
    .select({ id: readings.id })
    .from(readings)
    .where(and(eq(readings.infantId, sql.placeholder('infantId')), eq(readings.takenAt, sql.placeholder('at')), ne(readings.id, sql.placeholder('id'))))
    .limit(1)
    .prepare(),
  storedFlags: db
    .select({
      id: flags.id,
      key: flags.key,
      kind: flags.kind,
      raisedAt: flags.raisedAt,
      raisedByReadingId: flags.raisedByReadingId,
      detail: flags.detail,
      severity: flags.severity,
      resolved: flagResolutions.flagId,
      how: flagResolutions.how,
    })
    .from(flags)
    .leftJoin(flagResolutions, eq(flagResolutions.flagId, flags.id))
    .where(eq(flags.infantId, sql.placeholder('infantId')))
    .prepare(),
  withdrawnFlags: db
    .selectDistinct({ flagId: flagEvents.flagId })
    .from(flagEvents)
    .where(and(eq(flagEvents.infantId, sql.placeholder('infantId')), eq(flagEvents.event, 'withdrawn')))
    .prepare(),
}));

export function loadUnitRow(sqlite: Database.Database, unitId: string): UnitRow | undefined {
  return flagQueries(sqlite).unit.get({ id: unitId });
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
  const rows = flagQueries(sqlite).flagKeys.all({ infantId });
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
export function toRuleReading(r: Omit<ReadingRow, 'rowid'> & { rowid?: number }) {
  return {
    id: r.id,
    // Readings with equal taken and recorded times keep the order they were stored in.
    seq: r.rowid,
    takenAt: r.takenAt,
    recordedAt: r.recordedAt,
    probeCenti: r.probeCenti,
    remoteCenti: r.remoteCenti,
    remoteSite: r.remoteSite,
    airCenti: r.airCenti,
    setCenti: r.setCenti,
    controlMode: r.controlMode,
    heaterOutputPct: r.heaterOutputPct,
    heartRate: r.heartRate,
    // Almost every row has no heat signs; parsing '[]' thousands of times per board build shows in a profile.
    heatSigns: r.heatSigns === '[]' ? NO_SIGNS : (JSON.parse(r.heatSigns) as HeatStressSign[]),
    replacesId: r.replacesId,
    enteredInError: r.enteredInError,
  };
}

export interface InfantState {
  readings: ReturnType<typeof toRuleReading>[];
  actions: { id: string; flagKey: string; kind: string; at: Date }[];
  sessions: { id: string; startedAt: Date; endedAt: Date | null; referenceCenti: number; limitCenti: number }[];
  admittedAt?: Date;
}

export function loadInfantState(sqlite: Database.Database, infantId: string, since?: number): InfantState {
  const q = flagQueries(sqlite);
  const rows: ReadingRow[] = since === undefined ? q.readings.all({ infantId }) : q.readingsSince.all({ infantId, since });
  return loadStateWith(sqlite, infantId, rows.map(toRuleReading));
}

type RuleReading = ReturnType<typeof toRuleReading>;

function loadStateWith(sqlite: Database.Database, infantId: string, readings: RuleReading[]): InfantState {
  const q = flagQueries(sqlite);
  const infant = q.infant.get({ id: infantId });
  return {
    readings,
    actions: q.actions.all({ infantId }).map((a) => ({ id: a.id, flagKey: ruleKeyOf(a.flagKey), kind: a.kind, at: a.at })),
    sessions: q.sessions.all({ infantId }),
    admittedAt: infant?.admittedAt,
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
  const q = flagQueries(sqlite);
  const corrections = q.firstCorrection.get({ infantId });
  const firstCorrection = Math.min(corrections?.corrected?.getTime() ?? Infinity, corrections?.correcting?.getTime() ?? Infinity);
  let before = Math.min(window.from, firstCorrection - 1);
  // A few steps back past flags that were still open; a chart with flags open for most of the
  // stay is rare and is simply evaluated whole.
  for (let step = 0; step < 4; step++) {
    const r = q.restartCandidate.get({ infantId, before, admittedAt, exclude: window.excludeReadingId ?? '' });
    if (!r) return null;
    const at = r.takenAt.getTime();
    const open = q.openBlocker.get({ infantId, at, id: r.id })?.at ?? null;
    if (open === null) {
      if (!q.sameTime.get({ infantId, at, id: r.id })) return at;
      // Another reading shares R's time (two saves in the same millisecond): try the one before.
      before = at - 1;
      continue;
    }
    // The reading that raised the oldest such flag may itself be the restart point.
    before = open.getTime();
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
  const q = flagQueries(sqlite);
  const infant = q.infant.get({ id: infantId });
  if (!infant) throw new Error(`No infant ${infantId}`);
  const unit = q.unit.get({ id: infant.unitId });
  if (!unit) throw new Error(`No unit ${infant.unitId}`);
  const windowFrom = window ? restartPoint(sqlite, infantId, infant.admittedAt.getTime(), { ...window, from: Math.min(window.from, now.getTime()) }) : null;
  let state: InfantState;
  const since = windowFrom ?? undefined;
  const loaded = loadInfantState(sqlite, infantId, since);
  if (windowFrom === null) state = loaded;
  else {
    const full = loaded;
    // The schedule runs from the restart point (the first reading), not from admission: the
    // checks before it are history the stored flags already hold.
    state = { ...full, admittedAt: undefined };
  }
  const db = dbOf(sqlite);
  const versions = loadPolicyVersions(db, infant.unitId);
  const { policy, versionId } = policyAt(unit, versions, now.getTime());
  const evaluation = evaluateInfant(state, now, policy, versions);
  const withdrawnIds = new Set(q.withdrawnFlags.all({ infantId }).map((w) => w.flagId));
  // Each stored flag with its resolution, and whether a withdrawn event followed its closing.
  const stored = q.storedFlags.all({ infantId }).map((f) => ({ ...f, withdrawn: withdrawnIds.has(f.id) }));
  const previous = readClocks(db, infantId);
  const lastSeverity = new Map((previous ? (JSON.parse(previous.openFlags) as StoredOpenFlag[]) : []).map((f) => [f.flagId, f.severity]));
  const openNow: StoredOpenFlag[] = [];
  const event = (flagId: string, e: Omit<Parameters<typeof appendFlagEvent>[1], 'flagId' | 'infantId' | 'unitId' | 'now'>) =>
    appendFlagEvent(db, { flagId, infantId, unitId: infant.unitId, now, actorId, ...e });
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

  const close = (flagId: string, at: Date, readingId: string | null, how: string, key: string, reason?: string) => {
    db.insert(flagResolutions).values({ flagId, closedAt: at, closedByReadingId: readingId, how, createdAt: now }).run();
    appendAudit(sqlite, {
      at: now,
      actorId,
      action: 'flag-closed',
      entityType: 'flag',
      entityId: flagId,
      unitId: infant.unitId,
      after: { key, closedAt: at.toISOString(), closedByReadingId: readingId, how, reason },
    });
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
    if (row?.resolved && infant.status !== 'discharged' && row.how !== 'discharged' && (row.how === 'withdrawn' || row.withdrawn || flag.status === 'open')) {
      reopenedFrom = { id: row.id, key: row.key, how: row.withdrawn ? 'withdrawn' : row.how };
      row = undefined;
    }
    if (!row) {
      // A flag that opened and closed entirely in the past (a late entry) is still recorded.
      const id = randomUUID();
      const raisedUnder = policyAt(unit, versions, flag.raisedAt.getTime()).versionId;
      const severity = flag.severity;
      const detail = JSON.stringify(flag.detail ?? {});
      const storedKey = reopenedFrom ? `${flag.key}#${reopeningOf(reopenedFrom.key) + 1}` : flag.key;
      db.insert(flags)
        .values({
          id,
          infantId,
          unitId: infant.unitId,
          key: storedKey,
          kind: flag.kind,
          raisedAt: flag.raisedAt,
          raisedByReadingId: flag.raisedByReadingId,
          detail,
          severity,
          policyVersionId: raisedUnder,
          createdAt: now,
        })
        .run();
      appendAudit(sqlite, { at: now, actorId, action: 'flag-raised', entityType: 'flag', entityId: id, unitId: infant.unitId, after: serializeFlag(flag) });
      if (reopenedFrom) {
        event(id, {
          event: 'reopened',
          at: now,
          readingId: flag.raisedByReadingId,
          severity,
          policyVersionId: raisedUnder,
          detail: { previousFlagId: reopenedFrom.id, was: reopenedFrom.how },
        });
        appendAudit(sqlite, {
          at: now,
          actorId,
          action: 'flag-reopened',
          entityType: 'flag',
          entityId: id,
          unitId: infant.unitId,
          after: { key: storedKey, previousFlagId: reopenedFrom.id, was: reopenedFrom.how },
        });
      } else {
        event(id, { event: 'raised', at: flag.raisedAt, readingId: flag.raisedByReadingId, severity, policyVersionId: raisedUnder, detail: flag.detail });
      }
      raised.push(id);
      row = {
        id,
        key: storedKey,
        kind: flag.kind,
        raisedAt: flag.raisedAt,
        raisedByReadingId: flag.raisedByReadingId,
        detail,
        severity,
        resolved: null,
        how: null,
        withdrawn: false,
      };
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
      if (row.how !== 'withdrawn' && row.how !== 'discharged' && !row.withdrawn && (windowFrom === null || row.raisedAt.getTime() >= windowFrom)) {
        const shownBy = row.raisedByReadingId ? latestVersionOf(sqlite, row.raisedByReadingId) : null;
        event(row.id, { event: 'withdrawn', at: now, readingId: shownBy, detail: { reason: 'reading-corrected', readingId: shownBy } });
        appendAudit(sqlite, {
          at: now,
          actorId,
          action: 'flag-withdrawn',
          entityType: 'flag',
          entityId: row.id,
          unitId: infant.unitId,
          after: { key: row.key, reason: 'reading-corrected', readingId: shownBy },
        });
      }
      continue;
    }
    if (windowFrom !== null && row.raisedAt.getTime() < windowFrom) {
      // Raised before the window: still open as far as the rules can tell; keep showing it.
      const kept = previous ? (JSON.parse(previous.openFlags) as StoredOpenFlag[]).find((f) => f.flagId === row.id) : undefined;
      if (kept) openNow.push(kept);
      continue;
    }
    if (infant.status === 'discharged') close(row.id, now, null, 'discharged', row.key);
    else if (row.kind === 'overdue-check') {
      // A check charted late whose taken time was on time: the flag should never have been raised.
      const due = row.raisedAt.getTime();
      const ranFrom = row.raisedByReadingId ? db.select({ takenAt: readings.takenAt }).from(readings).where(eq(readings.id, row.raisedByReadingId)).get()?.takenAt : undefined;
      const shownBy = onTimeCheckFor(db, infantId, (ranFrom ?? infant.admittedAt).getTime(), due);
      close(row.id, now, shownBy, 'withdrawn', row.key, shownBy ? 'late-entry-on-time' : 'reading-corrected');
    } else close(row.id, now, null, 'withdrawn', row.key, 'reading-corrected');
  }
  writeClocks(db, { infantId, unitId: infant.unitId, now, policy, policyVersionId: versionId, evaluation, openFlags: openNow, previous, windowed: windowFrom !== null });
  return { raised, closed, worsened, evaluation, windowFrom };
}

/** The latest version of a reading's correction chain (itself when never corrected). */
function latestVersionOf(sqlite: Database.Database, readingId: string): string {
  const db = dbOf(sqlite);
  let id = readingId;
  for (let i = 0; i < 100; i++) {
    const row = db.select({ id: readings.id }).from(readings).where(eq(readings.replacesId, id)).get();
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
