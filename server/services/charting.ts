/**
 * Charting at the bedside: a reading, its correction, and the start and end of a skin-to-skin
 * session. Each takes typed input (already validated with the shared schemas) and the actor, runs
 * the checks, writes in one transaction with its audit event and the flag sync, and answers with
 * what the route sends back.
 */
import { and, eq, isNull } from 'drizzle-orm';
import { writeTx } from '../../db/client';
import { readings, skinToSkinSessions } from '../../db/schema';
import type { CorrectReading, CreateReading, EndSession, StartSession } from '../../shared/schemas/bedside';
import type { PlacementChange } from '../../shared/schemas/placement';
import { checkPlausibility, toCentiCelsius } from '../../shared/thermal';
import { remoteSiteConflict } from '../../shared/thermal/placement';
import type { CreateReadingResult, CurrentPlacement, SessionRecord } from '../../shared/types/bedside';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { ApiError, badRequest, conflict, notFound } from '../errors';
import {
  checkTakenAt,
  convertAndCheck,
  insertReading,
  loadReading,
  loadSession,
  readingJson,
  refreshWeight,
  requestHash,
  sessionAt,
  sessionJson,
  type NewReading,
} from './bedside';
import { escalateAfterWrite } from './escalations';
import { currentFlagIds, syncFlags } from './flags';
import { assertActorUnit, loadInfant, loadInfantFor, requireAdmitted, type Actor } from './infants';
import { recordPlacementChange, refreshPlacement, storedPlacement } from './placement';
import { nextCheckJson, openFlagJson } from './summaries';

type Sync = ReturnType<typeof syncFlags>;

/** What a chart write answers with besides its record: the infant's open flags and next check after it. */
export function evaluationBody(ctx: AppContext, infantId: string, sync: Sync): Omit<CreateReadingResult, 'reading' | 'created'> {
  const ids = currentFlagIds(ctx.database.sqlite, infantId);
  return {
    openFlags: sync.evaluation.openFlags.map((f) => openFlagJson(f, ids.get(f.key) ?? null, false)),
    nextCheck: nextCheckJson(sync.evaluation.nextCheck),
    raisedFlagIds: sync.raised,
    closedFlagIds: sync.closed,
  };
}

/**
 * Record a reading. Idempotent by the client's id: a retry returns the stored reading. The checks
 * run per request; the insert, its audit event and the flag sync run in one write transaction,
 * durable before the answer goes out.
 */
export async function createReading(ctx: AppContext, infantId: string, input: CreateReading, actor: Actor): Promise<CreateReadingResult> {
  const { sqlite } = ctx.database;
  const infant = loadInfantFor(sqlite, actor, infantId);
  const now = ctx.clock.now();
  const hash = requestHash({ ...input, infantId });

  const replay = () => {
    const existing = loadReading(sqlite, input.id);
    if (!existing) return null;
    if (existing.requestHash !== hash || existing.infantId !== infantId) {
      throw conflict('A different reading was already saved with this id.', { id: 'This id belongs to another reading.' });
    }
    return existing;
  };
  const already = replay();
  if (!already) {
    requireAdmitted(infant);
    // The probe on the axilla (charted now, or carried from before) leaves the axilla taken.
    const probeSite = input.probeSite !== undefined ? input.probeSite : (storedPlacement(sqlite, infantId)?.probeSite ?? null);
    const taken = remoteSiteConflict(probeSite, input.remoteSite, input.remote != null);
    if (taken) throw badRequest(taken, { remoteSite: taken });
  }
  const converted = already ? null : convertAndCheck(input, input.confirmedImplausible);
  const takenAt = input.takenAt ? new Date(input.takenAt) : now;
  if (!already) checkTakenAt(takenAt, now, infant.admittedAt, input.lateReason);

  const result = writeTx(sqlite, () => {
    const again = replay();
    // Nothing changed: the rules need only run from now (syncFlags widens this as needed).
    if (again) return { created: false, sync: syncFlags(sqlite, infantId, now, actor.userId, { from: now.getTime() }) };
    // Other requests may have run since the check above (a discharge among them).
    requireAdmitted(loadInfant(sqlite, infantId));
    const row: NewReading = {
      id: input.id,
      infantId,
      unitId: infant.unitId,
      takenAt: takenAt.getTime(),
      recordedAt: now.getTime(),
      recordedBy: actor.userId,
      ...converted!,
      remoteSite: input.remote == null ? null : (input.remoteSite ?? null),
      controlMode: input.controlMode ?? null,
      heaterOutputPct: input.heaterOutputPct ?? null,
      heartRate: input.heartRate ?? null,
      heatSigns: input.heatSigns,
      note: input.note || null,
      enteredUnit: input.unit,
      lateReason: input.lateReason || null,
      sessionId: sessionAt(sqlite, infantId, takenAt.getTime()),
      replacesId: null,
      correctionReason: null,
      correctionNote: null,
      enteredInError: false,
      requestHash: hash,
      probeSite: input.probeSite ?? null,
      probeCovered: input.probeCovered ?? null,
      infantPosition: input.position ?? null,
      weightGrams: input.weightGrams ?? null,
      humidityPct: input.humidityPct ?? null,
    };
    insertReading(sqlite, row);
    refreshPlacement(sqlite, infantId, infant.unitId, now);
    if (row.weightGrams != null) refreshWeight(sqlite, infantId);
    appendAudit(sqlite, {
      at: now,
      actorId: actor.userId,
      action: 'reading-create',
      entityType: 'reading',
      entityId: row.id,
      unitId: infant.unitId,
      after: { ...row, requestHash: undefined },
    });
    // The chart changed from the reading's time on: the rules start at or before it.
    return { created: true, sync: syncFlags(sqlite, infantId, now, actor.userId, { from: row.takenAt, excludeReadingId: row.id }) };
  });
  escalateAfterWrite(ctx, now, result.sync);
  return { reading: readingJson(loadReading(sqlite, input.id)!), created: result.created, ...evaluationBody(ctx, infantId, result.sync) };
}

/** The new version a correction stores: the original's values, or the corrected ones checked as a new reading's. */
function correctedVersion(original: NonNullable<ReturnType<typeof loadReading>>, input: CorrectReading, admittedAt: Date, now: Date, actorId: string, hash: string): NewReading {
  if (input.reason === 'corrected-value' && !input.values) {
    throw badRequest('Enter the corrected values.', { values: 'Enter the corrected values.' });
  }
  const base: NewReading = {
    id: input.id,
    infantId: original.infantId,
    unitId: original.unitId,
    takenAt: original.takenAt.getTime(),
    recordedAt: now.getTime(),
    recordedBy: actorId,
    probeCenti: original.probeCenti,
    remoteCenti: original.remoteCenti,
    remoteSite: original.remoteSite,
    airCenti: original.airCenti,
    setCenti: original.setCenti,
    controlMode: original.controlMode,
    heaterOutputPct: original.heaterOutputPct,
    heartRate: original.heartRate,
    heatSigns: JSON.parse(original.heatSigns) as string[],
    note: original.note,
    enteredUnit: original.enteredUnit,
    lateReason: original.lateReason,
    sessionId: original.sessionId,
    replacesId: original.id,
    correctionReason: input.reason,
    correctionNote: input.note,
    enteredInError: input.reason === 'entered-in-error',
    requestHash: hash,
    probeSite: original.probeSite,
    probeCovered: original.probeCovered,
    infantPosition: original.infantPosition,
    weightGrams: original.weightGrams,
    humidityPct: original.humidityPct,
  };
  if (!input.values || input.reason === 'entered-in-error') return base;
  const v = input.values;
  const converted = convertAndCheck(v, v.confirmedImplausible, 'values.');
  if (v.remote != null && !v.remoteSite) throw badRequest('Choose the remote site.', { 'values.remoteSite': 'Choose where the remote-site temperature was taken.' });
  if (v.probe == null && v.remote == null && v.air == null && v.heartRate == null) {
    throw badRequest('Enter at least one temperature or the heart rate.', { 'values.probe': 'Enter at least one temperature or the heart rate.' });
  }
  // Settings and measures left out of the new version keep the original's.
  const kept = <T>(value: T | undefined, was: T) => (value === undefined ? was : value);
  const probeSite = kept(v.probeSite, base.probeSite ?? null);
  const taken = remoteSiteConflict(probeSite, v.remoteSite, v.remote != null);
  if (taken) throw badRequest(taken, { 'values.remoteSite': taken });
  const takenAt = v.takenAt ? Date.parse(v.takenAt) : base.takenAt;
  if (v.takenAt) checkTakenAt(new Date(takenAt), now, admittedAt, input.reason === 'late-entry' ? input.note : (original.lateReason ?? input.note), 'values.takenAt');
  return {
    ...base,
    ...converted,
    takenAt,
    remoteSite: v.remote == null ? null : (v.remoteSite ?? null),
    controlMode: v.controlMode ?? null,
    heaterOutputPct: v.heaterOutputPct ?? null,
    heartRate: v.heartRate ?? null,
    heatSigns: v.heatSigns,
    note: v.note || null,
    enteredUnit: v.unit,
    lateReason: input.reason === 'late-entry' ? input.note : original.lateReason,
    probeSite,
    probeCovered: kept(v.probeCovered, base.probeCovered ?? null),
    infantPosition: kept(v.position, base.infantPosition ?? null),
    weightGrams: kept(v.weightGrams, base.weightGrams ?? null),
    humidityPct: kept(v.humidityPct, base.humidityPct ?? null),
  };
}

/**
 * Correct a reading: a new version that replaces it (only the current version can be corrected).
 * Idempotent by the client's id.
 */
export function correctReading(ctx: AppContext, readingId: string, input: CorrectReading, actor: Actor): CreateReadingResult {
  const { sqlite, db } = ctx.database;
  const original = loadReading(sqlite, readingId);
  if (!original) throw notFound('That reading');
  assertActorUnit(actor, original.unitId);
  const now = ctx.clock.now();
  const hash = requestHash({ ...input, replacesId: readingId });

  const replay = () => {
    const existing = loadReading(sqlite, input.id);
    if (!existing) return null;
    if (existing.requestHash !== hash) throw conflict('A different record was already saved with this id.', { id: 'This id belongs to another record.' });
    return existing;
  };
  let row: NewReading | null = null;
  if (!replay()) {
    const infant = loadInfant(sqlite, original.infantId);
    if (infant.status !== 'admitted') throw conflict('This infant has been discharged; the chart is closed.');
    row = correctedVersion(original, input, infant.admittedAt, now, actor.userId, hash);
  }

  const result = writeTx(sqlite, () => {
    if (replay()) return { created: false, sync: syncFlags(sqlite, original.infantId, now, actor.userId) };
    const newer = db.select({ id: readings.id }).from(readings).where(eq(readings.replacesId, readingId)).get();
    if (newer) {
      throw new ApiError(409, 'conflict', 'This version has already been corrected. Correct the latest version instead.', { replacesId: newer.id });
    }
    insertReading(sqlite, row!);
    appendAudit(sqlite, {
      at: now,
      actorId: actor.userId,
      action: 'reading-correct',
      entityType: 'reading',
      entityId: row!.id,
      unitId: original.unitId,
      before: readingJson(original),
      after: { ...row!, requestHash: undefined },
    });
    refreshPlacement(sqlite, original.infantId, original.unitId, now);
    if (original.weightGrams != null || row!.weightGrams != null) refreshWeight(sqlite, original.infantId);
    return { created: true, sync: syncFlags(sqlite, original.infantId, now, actor.userId) };
  });
  escalateAfterWrite(ctx, now, result.sync);
  return { reading: readingJson(loadReading(sqlite, input.id)!), created: result.created, ...evaluationBody(ctx, original.infantId, result.sync) };
}

/** Start a skin-to-skin session; one at a time per infant. Idempotent by the client's id. */
export function startSession(ctx: AppContext, infantId: string, input: StartSession, actor: Actor): { session: SessionRecord; created: boolean } {
  const { sqlite, db } = ctx.database;
  const infant = loadInfantFor(sqlite, actor, infantId);
  const now = ctx.clock.now();
  const existing = loadSession(sqlite, input.id);
  if (existing) {
    if (existing.infantId !== infantId) throw conflict('This id belongs to another session.', { id: 'Already used.' });
    return { session: sessionJson(existing), created: false };
  }
  requireAdmitted(infant);
  const referenceCenti = toCentiCelsius(input.reference, input.unit, 'reference');
  const check = checkPlausibility('remote', referenceCenti, input.unit);
  if (check.result === 'refuse') throw badRequest(check.reason, { reference: check.reason });
  const startedAt = input.startedAt ? new Date(input.startedAt) : now;
  if (startedAt.getTime() > now.getTime() + 2 * 60_000) throw badRequest('The start time is in the future.', { startedAt: 'The time cannot be in the future.' });
  if (now.getTime() - startedAt.getTime() > 12 * 3_600_000) throw badRequest('The start time is too far back.', { startedAt: 'Start a session within the last 12 hours.' });
  writeTx(sqlite, () => {
    const running = db
      .select({ id: skinToSkinSessions.id })
      .from(skinToSkinSessions)
      .where(and(eq(skinToSkinSessions.infantId, infantId), isNull(skinToSkinSessions.endedAt)))
      .get();
    if (running) throw new ApiError(409, 'conflict', 'A skin-to-skin session is already running. End it before starting another.', { id: running.id });
    db.insert(skinToSkinSessions)
      .values({ id: input.id, infantId, unitId: infant.unitId, startedAt, startedBy: actor.userId, referenceCenti, limitCenti: input.limitCenti, carer: input.carer || null })
      .run();
    appendAudit(sqlite, {
      at: now,
      actorId: actor.userId,
      action: 'skin-to-skin-start',
      entityType: 'skin-to-skin-session',
      entityId: input.id,
      unitId: infant.unitId,
      after: { infantId, startedAt: startedAt.toISOString(), referenceCenti, limitCenti: input.limitCenti, carer: input.carer ?? null },
    });
    syncFlags(sqlite, infantId, now, actor.userId);
  });
  return { session: sessionJson(loadSession(sqlite, input.id)!), created: true };
}

/** End a skin-to-skin session. Ending an ended session answers with it, unchanged. */
export function endSession(ctx: AppContext, sessionId: string, input: EndSession, actor: Actor): { session: SessionRecord; created: boolean } {
  const { sqlite, db } = ctx.database;
  const session = loadSession(sqlite, sessionId);
  if (!session) throw notFound('That skin-to-skin session');
  assertActorUnit(actor, session.unitId);
  const now = ctx.clock.now();
  if (session.endedAt !== null) return { session: sessionJson(session), created: false };
  const endedAt = input.endedAt ? new Date(input.endedAt) : now;
  if (endedAt.getTime() > now.getTime() + 2 * 60_000) throw badRequest('The end time is in the future.', { endedAt: 'The time cannot be in the future.' });
  if (endedAt.getTime() < session.startedAt.getTime()) throw badRequest('The end time is before the start.', { endedAt: 'The end is before the start.' });
  writeTx(sqlite, () => {
    const changed = db
      .update(skinToSkinSessions)
      .set({ endedAt, endedBy: actor.userId })
      .where(and(eq(skinToSkinSessions.id, sessionId), isNull(skinToSkinSessions.endedAt)))
      .run();
    if (changed.changes === 0) return;
    appendAudit(sqlite, {
      at: now,
      actorId: actor.userId,
      action: 'skin-to-skin-end',
      entityType: 'skin-to-skin-session',
      entityId: sessionId,
      unitId: session.unitId,
      before: { endedAt: null },
      after: { endedAt: endedAt.toISOString() },
    });
    syncFlags(sqlite, session.infantId, now, actor.userId);
  });
  return { session: sessionJson(loadSession(sqlite, sessionId)!), created: true };
}

/**
 * Chart a change of the probe's placement on its own; a retry answers with the stored change, a
 * new one needs the infant still admitted. Answers with the current placement after it.
 */
export function chartPlacementChange(ctx: AppContext, infantId: string, input: PlacementChange, actor: Actor): { created: boolean; placement: CurrentPlacement | null } {
  const { sqlite } = ctx.database;
  const infant = loadInfantFor(sqlite, actor, infantId);
  const now = ctx.clock.now();
  const result = writeTx(sqlite, () => recordPlacementChange(sqlite, infant, input, actor.userId, now, () => requireAdmitted(loadInfant(sqlite, infantId))));
  return { created: result.created, placement: storedPlacement(sqlite, infantId) };
}
