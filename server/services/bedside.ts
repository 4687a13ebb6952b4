import type Database from 'better-sqlite3';
import { createHash } from 'node:crypto';
import { and, asc, desc, eq, exists, getTableColumns, gte, isNotNull, isNull, lte, ne, notExists, or, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/sqlite-core';
import { checkPlausibility, isThermalInputError, toCentiCelsius, type PlausibilityField, type TempUnit } from '../../shared/thermal';
import { FUTURE_TIME_MESSAGE, isFutureTime, isLateEntry, LATE_ENTRY_MINUTES } from '../../shared/chart-time';
import { unusualReason } from '../../shared/plausibility';
import type { ControlMode } from '../../shared/vocabulary';
import type { Flowsheet, FlowsheetReading, ReadingVersion, SessionRecord } from '../../shared/types/bedside';
import { drizzleOf, writeTx } from '../../db/client';
import { infants, readings, skinToSkinSessions, users } from '../../db/schema';
import { ApiError, badRequest } from '../errors';
import { CompressedJson } from '../compressed-body';
import { chartDataVersion } from './board-cache';
import { loadUnitRow, policyForUnit, syncFlags } from './flags';
import { dischargeOf } from './infants';
import { perConnection } from './prepared-queries';
import { storedFlowsheetFlags, summarizeInfants } from './summaries';

/** Canonical JSON (sorted keys), hashed: a retried request with the same content matches. */
export function requestHash(value: unknown): string {
  const canonical = (v: unknown): unknown => {
    if (Array.isArray(v)) return v.map(canonical);
    if (v && typeof v === 'object') {
      return Object.fromEntries(
        Object.keys(v as Record<string, unknown>)
          .sort()
          .filter((k) => (v as Record<string, unknown>)[k] !== undefined)
          .map((k) => [k, canonical((v as Record<string, unknown>)[k])]),
      );
    }
    return v;
  };
  return createHash('sha256')
    .update(JSON.stringify(canonical(value)))
    .digest('hex');
}

export interface TypedTemperatures {
  unit: TempUnit;
  probe?: number | null;
  remote?: number | null;
  air?: number | null;
  set?: number | null;
  heartRate?: number | null;
  /** Chooses the set point's usual range (skin or air). */
  controlMode?: ControlMode | null;
}

export interface Converted {
  probeCenti: number | null;
  remoteCenti: number | null;
  airCenti: number | null;
  setCenti: number | null;
}

const TEMPERATURE_FIELDS = ['probe', 'remote', 'air', 'set'] as const;
const FIELD_LABELS: Record<(typeof TEMPERATURE_FIELDS)[number], string> = {
  probe: 'Probe temperature',
  remote: 'Remote-site temperature',
  air: 'Air temperature',
  set: 'Set temperature',
};

/**
 * Convert typed temperatures to hundredths of °C and check them: outside the hard limits is
 * refused (400 naming the field); outside the plausible range needs `confirmed` (else 422,
 * with `confirmedImplausible: 'confirm'` among the fields so the form can ask).
 */
export function convertAndCheck(input: TypedTemperatures, confirmed: boolean, prefix = ''): Converted {
  const out: Converted = { probeCenti: null, remoteCenti: null, airCenti: null, setCenti: null };
  const needConfirm: Record<string, string> = {};
  for (const field of TEMPERATURE_FIELDS) {
    const value = input[field];
    if (value === null || value === undefined) continue;
    let centi: number;
    try {
      centi = toCentiCelsius(value, input.unit, `${prefix}${field}`);
    } catch (err) {
      if (!isThermalInputError(err)) throw err;
      const reason = `${FIELD_LABELS[field]} ${err.message.replace(/^\S+ /, '')}: check the entry and the unit.`;
      throw badRequest(reason, { [`${prefix}${field}`]: reason });
    }
    const check = checkPlausibility(field as PlausibilityField, centi, input.unit);
    if (check.result === 'refuse') throw badRequest(check.reason, { [`${prefix}${field}`]: check.reason });
    const unusual = unusualReason(field, centi, { unit: input.unit, controlMode: input.controlMode });
    if (unusual) needConfirm[`${prefix}${field}`] = unusual;
    out[`${field}Centi`] = centi;
  }
  if (input.heartRate !== null && input.heartRate !== undefined) {
    const check = checkPlausibility('heartRate', input.heartRate, input.unit);
    if (check.result === 'refuse') throw badRequest(check.reason, { [`${prefix}heartRate`]: check.reason });
    const unusual = unusualReason('heartRate', input.heartRate, { unit: input.unit });
    if (unusual) needConfirm[`${prefix}heartRate`] = unusual;
  }
  if (!confirmed && Object.keys(needConfirm).length > 0) {
    throw new ApiError(422, 'invalid', 'Some values are outside the usual range. Check them, then confirm to save.', {
      ...needConfirm,
      [`${prefix}confirmedImplausible`]: 'confirm',
    });
  }
  return out;
}

/** A chart time: not in the future; more than 10 minutes back needs a late-entry reason. */
export function checkTakenAt(takenAt: Date, now: Date, admittedAt: Date, lateReason: string | null | undefined, field = 'takenAt'): { late: boolean } {
  // The same rule as the bedside form's (shared/chart-time.ts).
  if (isFutureTime(takenAt.getTime(), now.getTime())) {
    throw badRequest('The time is in the future.', { [field]: FUTURE_TIME_MESSAGE });
  }
  if (takenAt.getTime() < admittedAt.getTime() - 60 * 60_000) {
    throw badRequest('The time is before the infant was admitted.', { [field]: 'The time is before admission.' });
  }
  const late = isLateEntry(takenAt.getTime(), now.getTime());
  if (late && !lateReason) {
    throw badRequest('A late entry needs a reason.', { lateReason: `This time is more than ${LATE_ENTRY_MINUTES} minutes ago: say why it is charted late.` });
  }
  return { late };
}

/** A stored reading with the name of whoever recorded it. */
export type StoredReading = typeof readings.$inferSelect & { recordedByName: string };

/** A stored skin-to-skin session with the name of whoever started it. */
export type StoredSession = typeof skinToSkinSessions.$inferSelect & { startedByName: string };

/**
 * The bedside's reads, prepared once per connection: a reading posted loads the infant's session
 * and the stored reading (bench budget: durable writes >= 200 commits/s), and a flowsheet build
 * reads the window's readings and sessions (bench budget: 72-h flowsheet >= 50 % of the baseline).
 */
const bedsideQueries = perConnection((db) => {
  const readingWithName = { ...getTableColumns(readings), recordedByName: users.name };
  const sessionWithName = { ...getTableColumns(skinToSkinSessions), startedByName: users.name };
  const newer = alias(readings, 'newer');
  return {
    reading: db
      .select(readingWithName)
      .from(readings)
      .innerJoin(users, eq(users.id, readings.recordedBy))
      .where(eq(readings.id, sql.placeholder('id')))
      .prepare(),
    sessionAt: db
      .select({ id: skinToSkinSessions.id })
      .from(skinToSkinSessions)
      .where(
        and(
          eq(skinToSkinSessions.infantId, sql.placeholder('infantId')),
          lte(skinToSkinSessions.startedAt, sql.placeholder('at')),
          or(isNull(skinToSkinSessions.endedAt), gte(skinToSkinSessions.endedAt, sql.placeholder('at'))),
        ),
      )
      .orderBy(desc(skinToSkinSessions.startedAt))
      .limit(1)
      .prepare(),
    session: db
      .select(sessionWithName)
      .from(skinToSkinSessions)
      .innerJoin(users, eq(users.id, skinToSkinSessions.startedBy))
      .where(eq(skinToSkinSessions.id, sql.placeholder('id')))
      .prepare(),
    /**
     * The readings taken in the window, plus every version of every corrected reading (few): a
     * correction (it replaces one) or a reading a correction replaced.
     */
    flowsheetReadings: db
      .select(readingWithName)
      .from(readings)
      .innerJoin(users, eq(users.id, readings.recordedBy))
      .where(
        and(
          eq(readings.infantId, sql.placeholder('infantId')),
          or(
            gte(readings.takenAt, sql.placeholder('fromMs')),
            isNotNull(readings.replacesId),
            exists(db.select({ id: newer.id }).from(newer).where(eq(newer.replacesId, readings.id))),
          ),
        ),
      )
      .orderBy(asc(readings.takenAt), asc(readings.recordedAt))
      .prepare(),
    flowsheetSessions: db
      .select(sessionWithName)
      .from(skinToSkinSessions)
      .innerJoin(users, eq(users.id, skinToSkinSessions.startedBy))
      .where(and(eq(skinToSkinSessions.infantId, sql.placeholder('infantId')), or(isNull(skinToSkinSessions.endedAt), gte(skinToSkinSessions.endedAt, sql.placeholder('fromMs')))))
      .orderBy(desc(skinToSkinSessions.startedAt))
      .prepare(),
  };
});

export function loadReading(sqlite: Database.Database, id: string): StoredReading | undefined {
  return bedsideQueries(sqlite).reading.get({ id });
}

export function readingJson(r: StoredReading): ReadingVersion {
  return {
    id: r.id,
    infantId: r.infantId,
    takenAt: r.takenAt.toISOString(),
    recordedAt: r.recordedAt.toISOString(),
    recordedBy: { id: r.recordedBy, name: r.recordedByName },
    probeCenti: r.probeCenti,
    remoteCenti: r.remoteCenti,
    remoteSite: r.remoteSite,
    airCenti: r.airCenti,
    setCenti: r.setCenti,
    controlMode: r.controlMode,
    heaterOutputPct: r.heaterOutputPct,
    heartRate: r.heartRate,
    heatSigns: JSON.parse(r.heatSigns) as string[],
    note: r.note,
    enteredUnit: r.enteredUnit,
    lateReason: r.lateReason,
    sessionId: r.sessionId,
    replacesId: r.replacesId,
    correctionReason: r.correctionReason,
    correctionNote: r.correctionNote,
    enteredInError: r.enteredInError,
    probeSite: r.probeSite,
    probeCovered: r.probeCovered,
    position: r.infantPosition,
    weightGrams: r.weightGrams,
    humidityPct: r.humidityPct,
  };
}

/**
 * A reading to store: the table's insert shape, with its instants in milliseconds and the heat
 * signs as a list (the reading's audit event records it so).
 */
export type NewReading = Omit<typeof readings.$inferInsert, 'takenAt' | 'recordedAt' | 'heatSigns'> & {
  takenAt: number;
  recordedAt: number;
  heatSigns: string[];
};

export function insertReading(sqlite: Database.Database, r: NewReading): void {
  drizzleOf(sqlite)
    .insert(readings)
    .values({ ...r, takenAt: new Date(r.takenAt), recordedAt: new Date(r.recordedAt), heatSigns: JSON.stringify(r.heatSigns) })
    .run();
}

/**
 * The infant's current weight follows the latest weight charted on a current reading (not
 * replaced, not entered in error), by clinical time, as the current placement does. Called inside
 * the write's transaction after a reading that charted a weight, or a correction of one. When no
 * charted weight is left, the weight stays as it was (set on admission or changed by hand).
 */
export function refreshWeight(sqlite: Database.Database, infantId: string): void {
  const db = drizzleOf(sqlite);
  const newer = alias(readings, 'newer');
  const latest = db
    .select({ weightGrams: readings.weightGrams })
    .from(readings)
    .where(
      and(
        eq(readings.infantId, infantId),
        isNotNull(readings.weightGrams),
        eq(readings.enteredInError, false),
        notExists(db.select({ id: newer.id }).from(newer).where(eq(newer.replacesId, readings.id))),
      ),
    )
    .orderBy(desc(readings.takenAt), desc(readings.recordedAt))
    .limit(1)
    .get();
  if (latest?.weightGrams == null) return;
  // Written only when it changed: an unchanged row costs no ledger event and bumps no cache.
  db.update(infants)
    .set({ weightGrams: latest.weightGrams })
    .where(and(eq(infants.id, infantId), ne(infants.weightGrams, latest.weightGrams)))
    .run();
}

/** The skin-to-skin session running at `at`, if any. */
export function sessionAt(sqlite: Database.Database, infantId: string, at: number): string | null {
  return bedsideQueries(sqlite).sessionAt.get({ infantId, at })?.id ?? null;
}

export function loadSession(sqlite: Database.Database, id: string): StoredSession | undefined {
  return bedsideQueries(sqlite).session.get({ id });
}

export function sessionJson(s: StoredSession): SessionRecord {
  return {
    id: s.id,
    startedAt: s.startedAt.toISOString(),
    endedAt: s.endedAt === null ? null : s.endedAt.toISOString(),
    referenceCenti: s.referenceCenti,
    limitCenti: s.limitCenti,
    carer: s.carer,
    startedBy: { id: s.startedBy, name: s.startedByName },
  };
}

/** Every version of the infant's readings grouped into chains: the current version with its history. */
export function readingChains(rows: StoredReading[]): FlowsheetReading[] {
  const byId = new Map(rows.map((r) => [r.id, r]));
  const replacedBy = new Map<string, StoredReading>();
  for (const r of rows) if (r.replacesId && byId.has(r.replacesId)) replacedBy.set(r.replacesId, r);
  const chains: FlowsheetReading[] = [];
  for (const root of rows) {
    if (root.replacesId && byId.has(root.replacesId)) continue;
    const versions: StoredReading[] = [root];
    let cursor = replacedBy.get(root.id);
    while (cursor && versions.length < 1000) {
      versions.push(cursor);
      cursor = replacedBy.get(cursor.id);
    }
    const tip = versions[versions.length - 1]!;
    chains.push({
      ...readingJson(tip),
      rootId: root.id,
      history: versions.slice(0, -1).map(readingJson),
      corrected: versions.length > 1,
    });
  }
  return chains.sort((a, b) => b.takenAt.localeCompare(a.takenAt) || b.recordedAt.localeCompare(a.recordedAt));
}

/**
 * The flowsheet as built before caching: store what the rules say (syncFlags, from the window
 * on), then the readings, flags and sessions of the window.
 */
export function buildFlowsheet(sqlite: Database.Database, infantId: string, unitId: string, hours: number, now: Date, onSynced?: () => void): Flowsheet {
  const fromMs = now.getTime() - hours * 3_600_000;
  const policy = policyForUnit(loadUnitRow(sqlite, unitId)!);
  // The window starts just before the flowsheet's: every flag shown (open, or raised or closed
  // in the window) is then evaluated exactly as over the whole stay.
  writeTx(sqlite, () => syncFlags(sqlite, infantId, now, null, { from: fromMs - 1 }));
  onSynced?.();
  const q = bedsideQueries(sqlite);
  // Whole chains, so a chain moved into or out of the window by a correction is kept exactly as
  // when all the infant's readings were read.
  const chains = readingChains(q.flowsheetReadings.all({ infantId, fromMs })).filter(
    (c) => Date.parse(c.takenAt) >= fromMs || c.history.some((h) => Date.parse(h.takenAt) >= fromMs),
  );
  const sessions = q.flowsheetSessions.all({ infantId, fromMs });
  const [summary] = summarizeInfants(sqlite, [infantId], now);
  return {
    infant: summary!,
    hours,
    from: new Date(fromMs).toISOString(),
    to: now.toISOString(),
    readings: chains.filter((c) => !c.enteredInError),
    removed: chains.filter((c) => c.enteredInError),
    flags: storedFlowsheetFlags(sqlite, infantId, fromMs, now),
    sessions: sessions.map(sessionJson),
    discharge: dischargeOf(sqlite, infantId),
    nextCheck: summary!.nextCheck,
    checks: summary!.checks,
    policy: {
      checkIntervalMinutes: policy.checkIntervalMinutes,
      dueSoonMinutes: policy.dueSoonMinutes,
      gapLimitCenti: policy.gapLimitCenti,
      recheckMinutes: policy.recheckMinutes,
      escalationDelayMinutes: policy.escalationDelayMinutes,
      timeZone: policy.timeZone,
    },
  };
}

/**
 * How long a flowsheet may be served again when nothing was written, as for the board
 * (BOARD_MAX_AGE_MS): the rules move with the clock alone, so an unchanged chart is rebuilt at
 * least this often; a write anywhere in the chart's tables rebuilds it on the next request.
 *
 * Kept for the bench budget "72-h flowsheet req/s vs baseline >= 50 %": a build per request
 * measured 7.0 % of the baseline, the cached flowsheet 45 % in the same conditions (2 shared
 * cores, load around 13). A nurse's screen polls every 30 s; the bench's 50 connections are the
 * ward's screens and tabs at once.
 */
export const FLOWSHEET_MAX_AGE_MS = 1000;

interface CachedFlowsheet {
  version: string;
  builtAt: number;
  body: CompressedJson;
}

const flowsheetCaches = new WeakMap<Database.Database, Map<string, CachedFlowsheet>>();

/**
 * The flowsheet as JSON bytes, rebuilt only when the chart's data changed (chartDataVersion) or the
 * last build is older than FLOWSHEET_MAX_AGE_MS. Its `to` and `from` are those of the build, so
 * a cached answer is one consistent picture of the chart at most a second old. Nothing in it
 * depends on who asks (the unit check comes first), so one entry serves every nurse.
 */
export function flowsheetBody(sqlite: Database.Database, infantId: string, unitId: string, hours: number, now: Date): CompressedJson {
  let cache = flowsheetCaches.get(sqlite);
  if (!cache) {
    cache = new Map();
    flowsheetCaches.set(sqlite, cache);
  }
  const key = `${infantId}:${hours}`;
  const hit = cache.get(key);
  const age = hit ? now.getTime() - hit.builtAt : -1;
  if (hit && age >= 0 && age < FLOWSHEET_MAX_AGE_MS && hit.version === chartDataVersion(sqlite)) return hit.body;
  // The version is taken after the build's own sync (which may store flags and so move it) and
  // before its reads: a write landing during the reads makes the entry stale, never wrong.
  let version = '';
  const body = buildFlowsheet(sqlite, infantId, unitId, hours, now, () => (version = chartDataVersion(sqlite)));
  const answer = new CompressedJson(JSON.stringify(body));
  // Entries no one asked for in a minute go (discharged infants, closed tabs), so the cache
  // holds only the charts being watched.
  for (const [k, v] of cache) if (now.getTime() - v.builtAt > 60_000 || v.builtAt > now.getTime()) cache.delete(k);
  cache.set(key, { version, builtAt: now.getTime(), body: answer });
  return answer;
}
