import type Database from 'better-sqlite3';
import { createHash } from 'node:crypto';
import type { Request } from 'express';
import {
  checkPlausibility,
  isThermalInputError,
  toCentiCelsius,
  type PlausibilityField,
  type TempUnit,
} from '../../shared/thermal';
import { FUTURE_TIME_MESSAGE, isFutureTime, isLateEntry, LATE_ENTRY_MINUTES } from '../../shared/chart-time';
import { unusualReason } from '../../shared/plausibility';
import type { ControlMode, InfantPosition, ProbeSite } from '../../shared/vocabulary';
import type { Flowsheet, FlowsheetFlag, FlowsheetReading, ReadingVersion, SessionRecord } from '../../shared/types/bedside';
import { drizzleOf, prepared, writeTx } from '../../db/client';
import { eq } from 'drizzle-orm';
import { infants, readings } from '../../db/schema';
import { ApiError, badRequest, notFound } from '../errors';
import { assertUnit } from '../middleware/access';
import { CompressedJson } from '../compressed-body';
import { chartDataVersion } from './board-cache';
import { loadUnitRow, policyForUnit, primeRuleReadings, syncFlags } from './flags';
import { storedFlowsheetFlags, summarizeInfants } from './summaries';

export interface InfantRow {
  id: string;
  unit_id: string;
  status: 'admitted' | 'discharged';
  admitted_at: number;
  birth_at: number;
  birth_weight_grams: number;
}

/** The infant, or 404; then 403 unless the signed-in user belongs to its unit. */
export function loadInfantFor(sqlite: Database.Database, req: Request, infantId: string): InfantRow {
  const row = prepared(sqlite, 'SELECT id, unit_id, status, admitted_at, birth_at, birth_weight_grams FROM infants WHERE id = ?').get(infantId) as InfantRow | undefined;
  if (!row) throw notFound('That infant');
  assertUnit(req, row.unit_id);
  return row;
}

export function requireAdmitted(infant: InfantRow): void {
  if (infant.status !== 'admitted') throw new ApiError(409, 'conflict', 'This infant has been discharged; the chart is closed.');
}

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
  return createHash('sha256').update(JSON.stringify(canonical(value))).digest('hex');
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
export function checkTakenAt(takenAt: Date, now: Date, admittedAt: number, lateReason: string | null | undefined, field = 'takenAt'): { late: boolean } {
  // The same rule as the bedside form's (shared/chart-time.ts).
  if (isFutureTime(takenAt.getTime(), now.getTime())) {
    throw badRequest('The time is in the future.', { [field]: FUTURE_TIME_MESSAGE });
  }
  if (takenAt.getTime() < admittedAt - 60 * 60_000) {
    throw badRequest('The time is before the infant was admitted.', { [field]: 'The time is before admission.' });
  }
  const late = isLateEntry(takenAt.getTime(), now.getTime());
  if (late && !lateReason) {
    throw badRequest('A late entry needs a reason.', { lateReason: `This time is more than ${LATE_ENTRY_MINUTES} minutes ago: say why it is charted late.` });
  }
  return { late };
}

export interface StoredReading {
  id: string;
  infant_id: string;
  unit_id: string;
  taken_at: number;
  recorded_at: number;
  recorded_by: string;
  recorded_by_name: string;
  probe_centi: number | null;
  remote_centi: number | null;
  remote_site: ReadingVersion['remoteSite'];
  air_centi: number | null;
  set_centi: number | null;
  control_mode: ReadingVersion['controlMode'];
  heater_output_pct: number | null;
  heart_rate: number | null;
  heat_signs: string;
  note: string | null;
  entered_unit: 'C' | 'F';
  late_reason: string | null;
  session_id: string | null;
  replaces_id: string | null;
  correction_reason: ReadingVersion['correctionReason'];
  correction_note: string | null;
  entered_in_error: number;
  request_hash: string | null;
  probe_site: ProbeSite | null;
  probe_covered: number | null;
  infant_position: InfantPosition | null;
  weight_grams: number | null;
  humidity_pct: number | null;
}

export const READING_SELECT = 'SELECT r.*, u.name AS recorded_by_name FROM readings r JOIN users u ON u.id = r.recorded_by';

export function loadReading(sqlite: Database.Database, id: string): StoredReading | undefined {
  return prepared(sqlite, `${READING_SELECT} WHERE r.id = ?`).get(id) as StoredReading | undefined;
}

export function readingJson(r: StoredReading): ReadingVersion {
  return {
    id: r.id,
    infantId: r.infant_id,
    takenAt: new Date(r.taken_at).toISOString(),
    recordedAt: new Date(r.recorded_at).toISOString(),
    recordedBy: { id: r.recorded_by, name: r.recorded_by_name },
    probeCenti: r.probe_centi,
    remoteCenti: r.remote_centi,
    remoteSite: r.remote_site,
    airCenti: r.air_centi,
    setCenti: r.set_centi,
    controlMode: r.control_mode,
    heaterOutputPct: r.heater_output_pct,
    heartRate: r.heart_rate,
    heatSigns: JSON.parse(r.heat_signs) as string[],
    note: r.note,
    enteredUnit: r.entered_unit,
    lateReason: r.late_reason,
    sessionId: r.session_id,
    replacesId: r.replaces_id,
    correctionReason: r.correction_reason,
    correctionNote: r.correction_note,
    enteredInError: r.entered_in_error === 1,
    probeSite: r.probe_site,
    probeCovered: r.probe_covered === null ? null : r.probe_covered === 1,
    position: r.infant_position,
    weightGrams: r.weight_grams,
    humidityPct: r.humidity_pct,
  };
}

export interface NewReadingRow {
  id: string;
  infantId: string;
  unitId: string;
  takenAt: number;
  recordedAt: number;
  recordedBy: string;
  probeCenti: number | null;
  remoteCenti: number | null;
  remoteSite: string | null;
  airCenti: number | null;
  setCenti: number | null;
  controlMode: string | null;
  heaterOutputPct: number | null;
  heartRate: number | null;
  heatSigns: string[];
  note: string | null;
  enteredUnit: 'C' | 'F';
  lateReason: string | null;
  sessionId: string | null;
  replacesId: string | null;
  correctionReason: string | null;
  correctionNote: string | null;
  enteredInError: boolean;
  requestHash: string;
  /** Settings and measures charted with the reading; absent means not charted. */
  probeSite?: ProbeSite | null;
  probeCovered?: boolean | null;
  infantPosition?: InfantPosition | null;
  weightGrams?: number | null;
  humidityPct?: number | null;
}

export function insertReading(sqlite: Database.Database, r: NewReadingRow): void {
  drizzleOf(sqlite)
    .insert(readings)
    .values({
      ...r,
      takenAt: new Date(r.takenAt),
      recordedAt: new Date(r.recordedAt),
      remoteSite: r.remoteSite as StoredReading['remote_site'],
      controlMode: r.controlMode as StoredReading['control_mode'],
      heatSigns: JSON.stringify(r.heatSigns),
      correctionReason: r.correctionReason as StoredReading['correction_reason'],
      probeSite: r.probeSite ?? null,
      probeCovered: r.probeCovered ?? null,
      infantPosition: r.infantPosition ?? null,
      weightGrams: r.weightGrams ?? null,
      humidityPct: r.humidityPct ?? null,
    })
    .run();
}

/** The skin-to-skin session running at `at`, if any. */
export function sessionAt(sqlite: Database.Database, infantId: string, at: number): string | null {
  const row = prepared(sqlite, 'SELECT id FROM skin_to_skin_sessions WHERE infant_id = ? AND started_at <= ? AND (ended_at IS NULL OR ended_at >= ?) ORDER BY started_at DESC LIMIT 1')
    .get(infantId, at, at) as { id: string } | undefined;
  return row?.id ?? null;
}

interface SessionRow {
  id: string;
  started_at: number;
  ended_at: number | null;
  reference_centi: number;
  limit_centi: number;
  carer: string | null;
  started_by: string;
  started_by_name: string;
}

export function loadSession(sqlite: Database.Database, id: string): (SessionRow & { infant_id: string; unit_id: string }) | undefined {
  return prepared(sqlite, 'SELECT s.*, u.name AS started_by_name FROM skin_to_skin_sessions s JOIN users u ON u.id = s.started_by WHERE s.id = ?')
    .get(id) as (SessionRow & { infant_id: string; unit_id: string }) | undefined;
}

export function sessionJson(s: SessionRow): SessionRecord {
  return {
    id: s.id,
    startedAt: new Date(s.started_at).toISOString(),
    endedAt: s.ended_at === null ? null : new Date(s.ended_at).toISOString(),
    referenceCenti: s.reference_centi,
    limitCenti: s.limit_centi,
    carer: s.carer,
    startedBy: { id: s.started_by, name: s.started_by_name },
  };
}

/** Every version of the infant's readings grouped into chains: the current version with its history. */
export function readingChains(rows: StoredReading[]): FlowsheetReading[] {
  const byId = new Map(rows.map((r) => [r.id, r]));
  const replacedBy = new Map<string, StoredReading>();
  for (const r of rows) if (r.replaces_id && byId.has(r.replaces_id)) replacedBy.set(r.replaces_id, r);
  const chains: FlowsheetReading[] = [];
  for (const root of rows) {
    if (root.replaces_id && byId.has(root.replaces_id)) continue;
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
 * The flowsheet's readings: those taken in the window, plus every version of every corrected
 * reading (few), so that readingChains sees whole chains and a chain moved into or out of the
 * window by a correction is kept exactly as when all the infant's readings were read.
 */
function flowsheetRows(sqlite: Database.Database, infantId: string, fromMs: number): StoredReading[] {
  return prepared(
    sqlite,
      `${READING_SELECT} WHERE r.infant_id = @infantId AND (
         r.taken_at >= @fromMs
         OR r.id IN (SELECT c.id FROM readings c WHERE c.infant_id = @infantId AND c.replaces_id IS NOT NULL
                     UNION SELECT c.replaces_id FROM readings c WHERE c.infant_id = @infantId AND c.replaces_id IS NOT NULL))
       ORDER BY r.taken_at, r.recorded_at`,
    )
    .all({ infantId, fromMs }) as StoredReading[];
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
  primeRuleReadings(sqlite, infantId);
  writeTx(sqlite, () => syncFlags(sqlite, infantId, now, null, { from: fromMs - 1 }));
  onSynced?.();
  const chains = readingChains(flowsheetRows(sqlite, infantId, fromMs)).filter(
    (c) => Date.parse(c.takenAt) >= fromMs || c.history.some((h) => Date.parse(h.takenAt) >= fromMs),
  );
  const sessions = prepared(
    sqlite,
      `SELECT s.*, u.name AS started_by_name FROM skin_to_skin_sessions s JOIN users u ON u.id = s.started_by
        WHERE s.infant_id = ? AND (s.ended_at IS NULL OR s.ended_at >= ?) ORDER BY s.started_at DESC`,
    )
    .all(infantId, fromMs) as Parameters<typeof sessionJson>[0][];
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

/** When, why and where to the infant left; null while admitted. */
export function dischargeOf(sqlite: Database.Database, infantId: string): Flowsheet['discharge'] {
  const row = drizzleOf(sqlite)
    .select({ at: infants.dischargedAt, reason: infants.dischargeReason, destination: infants.dischargeDestination })
    .from(infants)
    .where(eq(infants.id, infantId))
    .get();
  return row?.at ? { at: row.at.toISOString(), reason: row.reason, destination: row.destination } : null;
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
