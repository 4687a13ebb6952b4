/**
 * The stored truth about flags beyond their raising and closing: the append-only lifecycle
 * (flag_events), the unit's settings versions (unit_policy_versions) and what the last
 * evaluation found for the views to read (infant_clocks). syncFlags writes them; every view reads
 * them and none evaluates the rules again.
 */
import type Database from 'better-sqlite3';
import { randomUUID } from 'node:crypto';
import { and, asc, desc, eq, gt, isNotNull, lte, sql } from 'drizzle-orm';
import { flagEvents, infantClocks, readings, unitPolicyVersions } from '../../db/schema';
import { drizzleOf, type Db } from '../../db/client';
import { resolvePolicy, type InfantEvaluation, type PolicyVersion, type Severity, type UnitPolicy } from '../../shared/thermal';

/** The Drizzle handle on a connection (db/client.ts: one per connection, shared with the rest of the server). */
export function dbOf(sqlite: Database.Database): Db {
  return drizzleOf(sqlite);
}

export type FlagEventKind = (typeof flagEvents.$inferInsert)['event'];

export interface FlagEventInput {
  flagId: string;
  infantId: string;
  unitId: string;
  event: FlagEventKind;
  at: Date;
  readingId?: string | null;
  severity?: Severity | null;
  policyVersionId?: string | null;
  detail?: unknown;
  actorId?: string | null;
  now: Date;
}

export function appendFlagEvent(db: Db, e: FlagEventInput): string {
  const id = randomUUID();
  db.insert(flagEvents)
    .values({
      id,
      flagId: e.flagId,
      infantId: e.infantId,
      unitId: e.unitId,
      event: e.event,
      at: e.at,
      readingId: e.readingId ?? null,
      severity: e.severity ?? null,
      policyVersionId: e.policyVersionId ?? null,
      detail: JSON.stringify(e.detail ?? {}),
      actorId: e.actorId ?? null,
      createdAt: e.now,
    })
    .run();
  return id;
}

// sql fragment: rowid (the order rows were stored in) breaks ties of created_at; the schema has no column for it.
const versionOrder = sql`${unitPolicyVersions}.rowid`;

export interface StoredPolicyVersion extends PolicyVersion {
  readonly id: string;
}

/** The unit's settings versions, oldest first. */
export function loadPolicyVersions(db: Db, unitId: string): StoredPolicyVersion[] {
  return (
    db
      .select({ id: unitPolicyVersions.id, effectiveFrom: unitPolicyVersions.effectiveFrom, settings: unitPolicyVersions.settings })
      .from(unitPolicyVersions)
      .where(eq(unitPolicyVersions.unitId, unitId))
      // Versions made at the same instant keep the order they were made in (the last one wins).
      .orderBy(asc(unitPolicyVersions.effectiveFrom), asc(unitPolicyVersions.createdAt), asc(versionOrder))
      .all()
      .map((v) => ({ id: v.id, effectiveFrom: v.effectiveFrom, policy: JSON.parse(v.settings) as Partial<UnitPolicy> }))
  );
}

/** The version in force at `ms`: the latest effective at or before it; null before the first. */
export function versionAt<V extends { effectiveFrom: Date }>(versions: readonly V[], ms: number): V | null {
  let found: V | null = null;
  for (const v of versions) {
    if (v.effectiveFrom.getTime() <= ms) found = v;
    else break;
  }
  return found;
}

/**
 * Record a change of a unit's settings as a new version in force from `effectiveFrom`. The first
 * change also records the settings in force until then (from the beginning: a chart may hold
 * readings from before the unit's row was made, as an import does), so every earlier judgement
 * keeps the settings it was made under.
 */
export function recordPolicyVersion(db: Db, unitId: string, before: UnitPolicy, after: UnitPolicy, actorId: string | null, effectiveFrom: Date): string {
  const existing = db.select({ id: unitPolicyVersions.id }).from(unitPolicyVersions).where(eq(unitPolicyVersions.unitId, unitId)).limit(1).get();
  if (!existing) {
    db.insert(unitPolicyVersions)
      .values({ id: randomUUID(), unitId, effectiveFrom: new Date(0), settings: JSON.stringify(before), createdBy: null, createdAt: effectiveFrom })
      .run();
  }
  const id = randomUUID();
  db.insert(unitPolicyVersions)
    .values({ id, unitId, effectiveFrom, settings: JSON.stringify(resolvePolicy(after)), createdBy: actorId, createdAt: effectiveFrom })
    .run();
  return id;
}

/** Settings changes of a unit inside [from, to): for reports to mark. */
export function policyChangesBetween(db: Db, unitId: string, from: Date, to: Date) {
  return (
    db
      .select({ id: unitPolicyVersions.id, effectiveFrom: unitPolicyVersions.effectiveFrom, settings: unitPolicyVersions.settings, createdBy: unitPolicyVersions.createdBy })
      .from(unitPolicyVersions)
      .where(and(eq(unitPolicyVersions.unitId, unitId), gt(unitPolicyVersions.effectiveFrom, from), lte(unitPolicyVersions.effectiveFrom, to)))
      .orderBy(asc(unitPolicyVersions.effectiveFrom))
      .all()
      // The first version only records the settings in force before the first change.
      .filter((v) => v.createdBy !== null)
      .map((v) => ({ id: v.id, effectiveFrom: v.effectiveFrom.toISOString(), settings: JSON.parse(v.settings) as UnitPolicy }))
  );
}

/** An open flag as the last evaluation saw it (infant_clocks.open_flags). */
export interface StoredOpenFlag {
  flagId: string;
  key: string;
  severity: Severity;
  /** When it reached that severity (ISO): its raising or the reading that made it worse. */
  severitySince?: string;
  detail: unknown;
  recheckDueAt: string | null;
  recheckCountsFrom: string | null;
}

export interface StoredLatest {
  probeCenti: number | null;
  probeTakenAt: string | null;
  remoteCenti: number | null;
  remoteSite: 'axilla' | 'rectal' | 'other' | null;
  remoteTakenAt: string | null;
  controlMode: 'skin-servo' | 'air-servo' | 'manual' | null;
  setCenti: number | null;
  heaterOutputPct: number | null;
}

export type ClockRow = typeof infantClocks.$inferSelect;

export function readClocks(db: Db, infantId: string): ClockRow | undefined {
  return db.select().from(infantClocks).where(eq(infantClocks.infantId, infantId)).get();
}

function latestJson(evaluation: InfantEvaluation, previous: StoredLatest | null, windowed: boolean): StoredLatest {
  const l = evaluation.latest;
  const iso = (d: Date | null) => (d ? d.toISOString() : null);
  const now: StoredLatest = {
    probeCenti: l.probeCenti,
    probeTakenAt: iso(l.probeTakenAt),
    remoteCenti: l.remoteCenti,
    remoteSite: l.remoteSite,
    remoteTakenAt: iso(l.remoteTakenAt),
    controlMode: l.controlMode,
    setCenti: l.setCenti,
    heaterOutputPct: l.heaterOutputPct,
  };
  if (!windowed || previous === null) return now;
  // A windowed evaluation starts at a restart point and may not see a value charted before it.
  const keep = <K extends keyof StoredLatest>(k: K) => (now[k] === null ? previous[k] : now[k]);
  return {
    probeCenti: now.probeCenti ?? previous.probeCenti,
    probeTakenAt: now.probeCenti === null ? previous.probeTakenAt : now.probeTakenAt,
    remoteCenti: now.remoteCenti ?? previous.remoteCenti,
    remoteSite: now.remoteCenti === null ? previous.remoteSite : now.remoteSite,
    remoteTakenAt: now.remoteCenti === null ? previous.remoteTakenAt : now.remoteTakenAt,
    controlMode: keep('controlMode'),
    setCenti: keep('setCenti'),
    heaterOutputPct: keep('heaterOutputPct'),
  };
}

/** Store what the evaluation found: the check clocks and the open flags' current state. */
export function writeClocks(
  db: Db,
  args: {
    infantId: string;
    unitId: string;
    now: Date;
    policy: UnitPolicy;
    policyVersionId: string | null;
    evaluation: InfantEvaluation;
    openFlags: StoredOpenFlag[];
    previous: ClockRow | undefined;
    windowed: boolean;
  },
): void {
  const { evaluation: ev } = args;
  const previousLatest = args.previous ? (JSON.parse(args.previous.latest) as StoredLatest) : null;
  const values = {
    unitId: args.unitId,
    computedAt: args.now,
    policyVersionId: args.policyVersionId,
    dueSoonMinutes: args.policy.dueSoonMinutes,
    remoteDueAt: ev.nextCheck.dueAt,
    lastRemoteAt: ev.lastRemoteCheckAt ?? (args.windowed && args.previous ? args.previous.lastRemoteAt : null),
    manualSince: ev.manualCheck?.since ?? null,
    manualDueAt: ev.manualCheck?.dueAt ?? null,
    manualOutputPct: ev.manualCheck?.outputPct ?? null,
    manualLimitMinutes: ev.manualCheck?.limitMinutes ?? null,
    openFlags: JSON.stringify(args.openFlags),
    latest: JSON.stringify(latestJson(ev, previousLatest && 'controlMode' in previousLatest ? previousLatest : null, args.windowed)),
  };
  const prev = args.previous;
  if (prev) {
    // Only a change is written: a write bumps the board's and flowsheet's caches.
    const { computedAt: _c, infantId: _i, ...old } = prev;
    const { computedAt: _n, ...fresh } = values;
    const same = (Object.keys(fresh) as (keyof typeof fresh)[]).every((k) => {
      const x = fresh[k];
      const y = old[k];
      return x instanceof Date || y instanceof Date ? (x as Date | null)?.getTime() === (y as Date | null)?.getTime() : x === y;
    });
    if (same) return;
  }
  db.insert(infantClocks)
    .values({ infantId: args.infantId, ...values })
    .onConflictDoUpdate({ target: infantClocks.infantId, set: values })
    .run();
}

/**
 * The reading that shows an overdue check should not have been raised: the latest-recorded
 * remote-site check taken after the check the interval ran from and no later than the due time.
 */
export function onTimeCheckFor(db: Db, infantId: string, afterMs: number, dueMs: number): string | null {
  const row = db
    .select({ id: readings.id })
    .from(readings)
    .where(
      and(
        eq(readings.infantId, infantId),
        isNotNull(readings.remoteCenti),
        eq(readings.enteredInError, false),
        gt(readings.takenAt, new Date(afterMs)),
        lte(readings.takenAt, new Date(dueMs)),
      ),
    )
    .orderBy(desc(readings.recordedAt))
    .limit(1)
    .get();
  return row?.id ?? null;
}

/** The settings a version carries beyond the unit row's columns, kept from one version to the next. */
const VERSION_ONLY_KEYS = ['recheckSettleMinutes', 'escalationDelays', 'recheckMinutes', 'manualCheckMinutes', 'highOutputMinutes'] as const;

/**
 * After a change to a unit's row (inside the same transaction): record the settings now in force
 * as a new version effective `now`, the first time together with the settings in force before.
 * A change that leaves every clinical setting as it was (a new name) records nothing.
 */
export function recordUnitSettingsChange(
  sqlite: Database.Database,
  unitId: string,
  before: UnitPolicy,
  after: UnitPolicy,
  actorId: string | null,
  now: Date,
  changes: Partial<Pick<UnitPolicy, 'escalationDelays' | 'recheckSettleMinutes'>> = {},
): string | null {
  const db = dbOf(sqlite);
  const versions = loadPolicyVersions(db, unitId);
  const last = versions.length ? resolvePolicy(versions[versions.length - 1]!.policy) : null;
  const carried = Object.fromEntries(VERSION_ONLY_KEYS.map((k) => [k, last ? last[k] : before[k]])) as Partial<UnitPolicy>;
  const was = last ?? before;
  const own: Partial<UnitPolicy> = {
    ...(changes.recheckSettleMinutes !== undefined ? { recheckSettleMinutes: changes.recheckSettleMinutes } : {}),
    ...(changes.escalationDelays ? { escalationDelays: { ...(carried.escalationDelays ?? {}), ...changes.escalationDelays } } : {}),
  };
  const next = resolvePolicy({ ...after, ...carried, ...own });
  if (JSON.stringify(resolvePolicy(was)) === JSON.stringify(next)) return null;
  return recordPolicyVersion(db, unitId, resolvePolicy({ ...before, ...carried }), next, actorId, now);
}
