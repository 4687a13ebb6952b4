import { prepared, writeTx } from '../../db/client';
import { and, desc, eq, gte, isNull } from 'drizzle-orm';
import { actions, actionUndos } from '../../db/schema';
import { correctReadingSchema, createActionSchema, endSessionSchema, undoActionSchema, type CorrectReading, type CreateAction, type EndSession, type UndoActionInput } from '../../shared/schemas/bedside';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { ApiError, badRequest, conflict, notFound } from '../errors';
import { allow, assertUnit, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import {
  checkTakenAt,
  convertAndCheck,
  insertReading,
  loadReading,
  loadSession,
  readingJson,
  requestHash,
  sessionJson,
  type NewReadingRow,
} from '../services/bedside';
import { appendFlagEvent, dbOf } from '../services/flag-lifecycle';
import { refreshPlacement } from '../services/placement';
import { remoteSiteConflict } from '../../shared/thermal/placement';
import { escalateAfterWrite } from '../services/escalations';
import { flagHistory } from '../services/flag-history';
import { auditRead } from '../read-audit';
import { currentFlagIds, primeRuleReadings, ruleKeyOf, syncFlags } from '../services/flags';
import { nextCheckJson, openFlagJson } from '../services/summaries';

type IdParams = { id: string };

/** Corrections, flag actions and the end of a skin-to-skin session: records reached by their own id. */
/** A second tap of the same action within this long stores nothing new. */
const REPEAT_TAP_MS = 60_000;

export function bedsideRouter(ctx: AppContext) {
  const router = secureRouter();
  const { sqlite } = ctx.database;

  const evaluationBody = (infantId: string, sync: ReturnType<typeof syncFlags>) => {
    const ids = currentFlagIds(sqlite, infantId);
    return {
      openFlags: sync.evaluation.openFlags.map((f) => openFlagJson(f, ids.get(f.key) ?? null, false)),
      nextCheck: nextCheckJson(sync.evaluation.nextCheck),
      raisedFlagIds: sync.raised,
      closedFlagIds: sync.closed,
    };
  };

  /** A correction is a new version of the reading; only the current version can be corrected. */
  router.post('/readings/:id/corrections', allow(ctx, 'chart:write'), validate('body', correctReadingSchema), (req, res) => {
    const { id: readingId } = req.params as IdParams;
    const input = valid<CorrectReading>(req, 'body');
    const original = loadReading(sqlite, readingId);
    if (!original) throw notFound('That reading');
    assertUnit(req, original.unit_id);
    const auth = req.auth!;
    const now = ctx.clock.now();
    const hash = requestHash({ ...input, replacesId: readingId });

    const replay = () => {
      const existing = loadReading(sqlite, input.id);
      if (!existing) return null;
      if (existing.request_hash !== hash) throw conflict('A different record was already saved with this id.', { id: 'This id belongs to another record.' });
      return existing;
    };
    const already = replay();
    let row: NewReadingRow | null = null;
    if (!already) {
      const infant = prepared(sqlite, 'SELECT status, admitted_at FROM infants WHERE id = ?').get(original.infant_id) as { status: string; admitted_at: number };
      if (infant.status !== 'admitted') throw conflict('This infant has been discharged; the chart is closed.');
      if (input.reason === 'corrected-value' && !input.values) {
        throw badRequest('Enter the corrected values.', { values: 'Enter the corrected values.' });
      }
      const base: NewReadingRow = {
        id: input.id,
        infantId: original.infant_id,
        unitId: original.unit_id,
        takenAt: original.taken_at,
        recordedAt: now.getTime(),
        recordedBy: auth.userId,
        probeCenti: original.probe_centi,
        remoteCenti: original.remote_centi,
        remoteSite: original.remote_site,
        airCenti: original.air_centi,
        setCenti: original.set_centi,
        controlMode: original.control_mode,
        heaterOutputPct: original.heater_output_pct,
        heartRate: original.heart_rate,
        heatSigns: JSON.parse(original.heat_signs) as string[],
        note: original.note,
        enteredUnit: original.entered_unit,
        lateReason: original.late_reason,
        sessionId: original.session_id,
        replacesId: original.id,
        correctionReason: input.reason,
        correctionNote: input.note,
        enteredInError: input.reason === 'entered-in-error',
        requestHash: hash,
        probeSite: original.probe_site,
        probeCovered: original.probe_covered === null ? null : original.probe_covered === 1,
        infantPosition: original.infant_position,
        weightGrams: original.weight_grams,
        humidityPct: original.humidity_pct,
      };
      if (input.values && input.reason !== 'entered-in-error') {
        const v = input.values;
        const converted = convertAndCheck(v, v.confirmedImplausible, 'values.');
        if (v.remote != null && !v.remoteSite) throw badRequest('Choose the remote site.', { 'values.remoteSite': 'Choose where the remote-site temperature was taken.' });
        if (v.probe == null && v.remote == null && v.air == null && v.heartRate == null) {
          throw badRequest('Enter at least one temperature or the heart rate.', { 'values.probe': 'Enter at least one temperature or the heart rate.' });
        }
        // Settings and measures left out of the new version keep the original's.
        const kept = <T,>(value: T | undefined, was: T) => (value === undefined ? was : value);
        const probeSite = kept(v.probeSite, base.probeSite ?? null);
        const taken = remoteSiteConflict(probeSite, v.remoteSite, v.remote != null);
        if (taken) throw badRequest(taken, { 'values.remoteSite': taken });
        const takenAt = v.takenAt ? Date.parse(v.takenAt) : original.taken_at;
        if (v.takenAt) checkTakenAt(new Date(takenAt), now, infant.admitted_at, input.reason === 'late-entry' ? input.note : original.late_reason ?? input.note, 'values.takenAt');
        row = {
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
          lateReason: input.reason === 'late-entry' ? input.note : original.late_reason,
          probeSite,
          probeCovered: kept(v.probeCovered, base.probeCovered ?? null),
          infantPosition: kept(v.position, base.infantPosition ?? null),
          weightGrams: kept(v.weightGrams, base.weightGrams ?? null),
          humidityPct: kept(v.humidityPct, base.humidityPct ?? null),
        };
      } else {
        row = base;
      }
    }

    const result = writeTx(sqlite, () => {
      if (replay()) return { created: false, sync: syncFlags(sqlite, original.infant_id, now, auth.userId) };
      const newer = prepared(sqlite, 'SELECT id FROM readings WHERE replaces_id = ?').get(readingId) as { id: string } | undefined;
      if (newer) {
        throw new ApiError(409, 'conflict', 'This version has already been corrected. Correct the latest version instead.', { replacesId: newer.id });
      }
      insertReading(sqlite, row!);
      appendAudit(sqlite, {
        at: now,
        actorId: auth.userId,
        action: 'reading-correct',
        entityType: 'reading',
        entityId: row!.id,
        unitId: original.unit_id,
        before: readingJson(original),
        after: { ...row!, requestHash: undefined },
      });
      refreshPlacement(sqlite, original.infant_id, original.unit_id, now);
      return { created: true, sync: syncFlags(sqlite, original.infant_id, now, auth.userId) };
    });
    escalateAfterWrite(ctx, now, result.sync);
    res.status(result.created ? 201 : 200).json({
      reading: readingJson(loadReading(sqlite, input.id)!),
      created: result.created,
      ...evaluationBody(original.infant_id, result.sync),
    });
  });

  /** Something done about a flag. Idempotent by the client's id. */
  router.post('/flags/:id/actions', allow(ctx, 'chart:write'), validate('body', createActionSchema), (req, res) => {
    const { id: flagId } = req.params as IdParams;
    const input = valid<CreateAction>(req, 'body');
    const flag = prepared(sqlite, 'SELECT f.id, f.infant_id, f.unit_id, f.key, f.raised_at, r.flag_id AS resolved FROM flags f LEFT JOIN flag_resolutions r ON r.flag_id = f.id WHERE f.id = ?')
      .get(flagId) as { id: string; infant_id: string; unit_id: string; key: string; raised_at: number; resolved: string | null } | undefined;
    if (!flag) throw notFound('That flag');
    assertUnit(req, flag.unit_id);
    const auth = req.auth!;
    const now = ctx.clock.now();
    const at = input.at ? new Date(input.at) : now;
    const loadActionById = (id: string) =>
      prepared(sqlite, 'SELECT a.*, u.name FROM actions a JOIN users u ON u.id = a.recorded_by WHERE a.id = ?').get(id) as
        | { id: string; flag_id: string; kind: string; note: string | null; at: number; recorded_by: string; name: string; probe_site: string | null }
        | undefined;
    const loadAction = () => loadActionById(input.id);
    const same = (a: NonNullable<ReturnType<typeof loadAction>>) => {
      if (a.flag_id !== flagId || a.kind !== input.kind || (a.note ?? null) !== (input.note || null) || (a.probe_site ?? null) !== (input.probeSite ?? null) || (input.at && a.at !== at.getTime())) {
        throw conflict('A different action was already saved with this id.', { id: 'This id belongs to another action.' });
      }
      return a;
    };
    const existing = loadAction();
    if (!existing) {
      if (flag.resolved) throw conflict('This flag has already closed.', { flag: 'Closed.' });
      if (at.getTime() > now.getTime() + 2 * 60_000) throw badRequest('The time is in the future.', { at: 'The time cannot be in the future.' });
      if (at.getTime() < flag.raised_at) throw badRequest('The time is before the flag was raised.', { at: 'The time is before the flag was raised.' });
    }
    const result = writeTx(sqlite, (): { created: boolean; sync: ReturnType<typeof syncFlags>; repeatOf?: string } => {
      const again = loadAction();
      if (again) return { created: false, sync: syncFlags(sqlite, flag.infant_id, now, auth.userId) };
      // A second tap of the same action on the same flag by the same person within a short
      // window is the same action (common practice: one thing done, charted once).
      // (A move of the probe to another site is another action.)
      const repeat = dbOf(sqlite)
        .select({ id: actions.id })
        .from(actions)
        .leftJoin(actionUndos, eq(actionUndos.actionId, actions.id))
        .where(
          and(
            eq(actions.flagId, flagId),
            eq(actions.kind, input.kind),
            eq(actions.recordedBy, auth.userId),
            gte(actions.createdAt, new Date(now.getTime() - REPEAT_TAP_MS)),
            input.probeSite ? eq(actions.probeSite, input.probeSite) : isNull(actions.probeSite),
            // "Something else" is its note: another note is another thing done.
            input.kind === 'other' ? eq(actions.note, input.note ?? '') : undefined,
            isNull(actionUndos.id),
          ),
        )
        .orderBy(desc(actions.createdAt))
        .limit(1)
        .get();
      if (repeat) return { created: false, sync: syncFlags(sqlite, flag.infant_id, now, auth.userId), repeatOf: repeat.id };
      dbOf(sqlite)
        .insert(actions)
        .values({ id: input.id, flagId, infantId: flag.infant_id, unitId: flag.unit_id, kind: input.kind, note: input.note || null, at, recordedBy: auth.userId, createdAt: now, probeSite: input.probeSite ?? null })
        .run();
      appendAudit(sqlite, {
        at: now,
        actorId: auth.userId,
        action: 'flag-action',
        entityType: 'action',
        entityId: input.id,
        unitId: flag.unit_id,
        after: { flagId, flagKey: flag.key, kind: input.kind, note: input.note ?? null, at: at.toISOString(), ...(input.probeSite ? { probeSite: input.probeSite } : {}) },
      });
      appendFlagEvent(dbOf(sqlite), {
        flagId,
        infantId: flag.infant_id,
        unitId: flag.unit_id,
        event: 'action',
        at,
        actorId: auth.userId,
        detail: { actionId: input.id, kind: input.kind, ...(input.probeSite ? { probeSite: input.probeSite } : {}) },
        now,
      });
      // Moving the probe charts its new site as the current placement.
      if (input.probeSite) refreshPlacement(sqlite, flag.infant_id, flag.unit_id, now);
      return { created: true, sync: syncFlags(sqlite, flag.infant_id, now, auth.userId) };
    });
    const a = result.repeatOf ? loadActionById(result.repeatOf)! : same(loadAction()!);
    const evaluated = result.sync.evaluation.flags.find((f) => f.key === ruleKeyOf(flag.key));
    res.status(result.created ? 201 : 200).json({
      action: { id: a.id, flagId: a.flag_id, kind: a.kind, note: a.note, at: new Date(a.at).toISOString(), recordedBy: { id: a.recorded_by, name: a.name }, probeSite: a.probe_site },
      created: result.created,
      flag: evaluated
        ? {
            id: flagId,
            key: flag.key,
            status: evaluated.status,
            recheckDueAt: evaluated.recheckDueAt ? evaluated.recheckDueAt.toISOString() : null,
            recheckCountsFrom: evaluated.recheckCountsFrom ? evaluated.recheckCountsFrom.toISOString() : null,
          }
        : { id: flagId, key: flag.key, status: 'closed', recheckDueAt: null, recheckCountsFrom: null },
      ...evaluationBody(flag.infant_id, result.sync),
    });
  });

  /**
   * Undo a mistaken action: an action_undos row marks it entered in error (the action stays on
   * record). The rules run again without it; when the action had let a recheck close the flag,
   * the flag reopens (a `reopened` event). Idempotent: undoing an undone action answers with the
   * first undo.
   */
  router.post('/flags/:flagId/actions/:id/undo', allow(ctx, 'chart:write'), validate('body', undoActionSchema), (req, res) => {
    const { flagId, id: actionId } = req.params as { flagId: string; id: string };
    const input = valid<UndoActionInput>(req, 'body');
    const flag = prepared(sqlite, 'SELECT id, unit_id, infant_id FROM flags WHERE id = ?').get(flagId) as { id: string; unit_id: string; infant_id: string } | undefined;
    if (!flag) throw notFound('That flag');
    assertUnit(req, flag.unit_id);
    const action = prepared(sqlite, 'SELECT id, flag_id, infant_id, unit_id, kind, at FROM actions WHERE id = ? AND flag_id = ?').get(actionId, flagId) as
      | { id: string; flag_id: string; infant_id: string; unit_id: string; kind: string; at: number }
      | undefined;
    if (!action) throw notFound('That action');
    const auth = req.auth!;
    const now = ctx.clock.now();
    primeRuleReadings(sqlite, action.infant_id);
    const result = writeTx(sqlite, () => {
      const done = prepared(sqlite, 'SELECT id FROM action_undos WHERE action_id = ?').get(actionId) as { id: string } | undefined;
      if (done) return { created: false, undoId: done.id, sync: syncFlags(sqlite, action.infant_id, now, auth.userId) };
      prepared(sqlite, 'INSERT INTO action_undos (id, action_id, flag_id, infant_id, unit_id, undone_by, note, at, created_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)')
        .run(input.id, actionId, flagId, action.infant_id, action.unit_id, auth.userId, input.note || null, now.getTime(), now.getTime());
      appendAudit(sqlite, { at: now, actorId: auth.userId, action: 'flag-action-undone', entityType: 'action', entityId: actionId, unitId: action.unit_id, after: { undoId: input.id, flagId, kind: action.kind, note: input.note ?? null } });
      appendFlagEvent(dbOf(sqlite), { flagId, infantId: action.infant_id, unitId: action.unit_id, event: 'action-undone', at: now, actorId: auth.userId, detail: { actionId, kind: action.kind }, now });
      // An undone move of the probe no longer says where the probe is.
      if (action.kind === 'moved-probe') refreshPlacement(sqlite, action.infant_id, action.unit_id, now);
      return { created: true, undoId: input.id, sync: syncFlags(sqlite, action.infant_id, now, auth.userId) };
    });
    res.status(result.created ? 201 : 200).json({
      undo: { id: result.undoId, actionId, flagId },
      created: result.created,
      reopenedFlagIds: result.sync.raised,
      ...evaluationBody(action.infant_id, result.sync),
    });
  });

  /** A flag's lifecycle in words (and its earlier rows when it was reopened), oldest first. */
  router.get('/flags/:id/history', allow(ctx, 'chart:read'), async (req, res) => {
    const { id: flagId } = req.params as IdParams;
    const flag = prepared(sqlite, 'SELECT id, unit_id, infant_id FROM flags WHERE id = ?').get(flagId) as { id: string; unit_id: string; infant_id: string } | undefined;
    if (!flag) throw notFound('That flag');
    assertUnit(req, flag.unit_id);
    const events = flagHistory(sqlite, flagId);
    await auditRead(sqlite, { at: ctx.clock.now(), actorId: req.auth!.userId, action: 'chart-read', entityType: 'flag', entityId: flagId, unitId: flag.unit_id, after: { view: 'flag-history', infantId: flag.infant_id } });
    res.json({ flagId, events });
  });

  /** End a skin-to-skin session. Ending an ended session answers with it, unchanged. */
  router.post('/skin-to-skin/:id/end', allow(ctx, 'chart:write'), validate('body', endSessionSchema), (req, res) => {
    const { id } = req.params as IdParams;
    const input = valid<EndSession>(req, 'body');
    const session = loadSession(sqlite, id);
    if (!session) throw notFound('That skin-to-skin session');
    assertUnit(req, session.unit_id);
    const auth = req.auth!;
    const now = ctx.clock.now();
    if (session.ended_at !== null) {
      res.status(200).json({ session: sessionJson(session), created: false });
      return;
    }
    const endedAt = input.endedAt ? new Date(input.endedAt) : now;
    if (endedAt.getTime() > now.getTime() + 2 * 60_000) throw badRequest('The end time is in the future.', { endedAt: 'The time cannot be in the future.' });
    if (endedAt.getTime() < session.started_at) throw badRequest('The end time is before the start.', { endedAt: 'The end is before the start.' });
    writeTx(sqlite, () => {
      const changed = prepared(sqlite, 'UPDATE skin_to_skin_sessions SET ended_at = ?, ended_by = ? WHERE id = ? AND ended_at IS NULL').run(endedAt.getTime(), auth.userId, id);
      if (changed.changes === 0) return;
      appendAudit(sqlite, {
        at: now,
        actorId: auth.userId,
        action: 'skin-to-skin-end',
        entityType: 'skin-to-skin-session',
        entityId: id,
        unitId: session.unit_id,
        before: { endedAt: null },
        after: { endedAt: endedAt.toISOString() },
      });
      syncFlags(sqlite, session.infant_id, now, auth.userId);
    });
    res.status(200).json({ session: sessionJson(loadSession(sqlite, id)!), created: true });
  });

  return router;
}
