import { prepared, writeTx } from '../../db/client';
import {
  createReadingSchema,
  flowsheetQuerySchema,
  infantListQuerySchema,
  startSessionSchema,
  type CreateReading,
  type FlowsheetQuery,
  type InfantListQuery,
  type StartSession,
} from '../../shared/schemas/bedside';
import { checkPlausibility, toCentiCelsius } from '../../shared/thermal';
import { shiftAt } from '../../shared/shifts';
import type { CreateReadingResult, InfantDetail } from '../../shared/types/bedside';
import { appendAudit } from '../audit';
import { auditListRead, auditRead } from '../read-audit';
import { batchedWrite } from '../write-batch';
import type { AppContext } from '../context';
import { ApiError, badRequest, conflict } from '../errors';
import { allow, assertUnit, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import {
  checkTakenAt,
  convertAndCheck,
  dischargeOf,
  flowsheetBody,
  insertReading,
  loadInfantFor,
  loadReading,
  loadSession,
  readingJson,
  requestHash,
  requireAdmitted,
  sessionAt,
  sessionJson,
} from '../services/bedside';
import { escalateAfterWrite } from '../services/escalations';
import { recordPlacementChange, refreshPlacement, storedPlacement } from '../services/placement';
import { placementChangeSchema, type PlacementChange } from '../../shared/schemas/placement';
import { remoteSiteConflict } from '../../shared/thermal/placement';
import { currentFlagIds, loadUnitRow, primeRuleReadings, syncFlags } from '../services/flags';
import { nextCheckJson, openFlagJson, summarizeInfants } from '../services/summaries';

type IdParams = { id: string };

export function infantsRouter(ctx: AppContext) {
  const router = secureRouter();
  const { sqlite } = ctx.database;

  /** The signed-in nurse's infants for the current shift (the latest assignment row wins). */
  router.get('/mine', allow(ctx, 'chart:read'), async (req, res) => {
    const auth = req.auth!;
    const now = ctx.clock.now();
    const ids: string[] = [];
    for (const unitId of auth.unitIds) {
      const unit = loadUnitRow(sqlite, unitId);
      if (!unit) continue;
      const slot = shiftAt(now, { dayShiftStart: unit.dayShiftStart, nightShiftStart: unit.nightShiftStart, timeZone: unit.timeZone });
      const rows = prepared(
    sqlite,
          `SELECT a.infant_id, a.nurse_id FROM assignments a JOIN infants i ON i.id = a.infant_id LEFT JOIN beds b ON b.id = i.bed_id
            WHERE a.unit_id = ? AND a.shift_date = ? AND a.shift = ? AND i.status = 'admitted'
            ORDER BY a.created_at, a.id`,
        )
        .all(unitId, slot.shiftDate, slot.shift) as Array<{ infant_id: string; nurse_id: string }>;
      const latest = new Map<string, string>();
      for (const r of rows) latest.set(r.infant_id, r.nurse_id);
      for (const [infantId, nurseId] of latest) if (nurseId === auth.userId) ids.push(infantId);
    }
    const ordered = orderByBed(ids);
    const infants = summarizeInfants(sqlite, ordered, now);
    await auditListRead(sqlite, { at: now, actorId: auth.userId, view: 'my-infants', infants: infants.map((i) => ({ infantId: i.id, unitId: i.unitId })) });
    res.json({ infants });
  });

  /** Every admitted infant of one of my units, or of all of them. */
  router.get('/', allow(ctx, 'chart:read'), validate('query', infantListQuerySchema), async (req, res) => {
    const { unitId } = valid<InfantListQuery>(req, 'query');
    if (unitId) assertUnit(req, unitId);
    const unitIds = unitId ? [unitId] : req.auth!.unitIds;
    const rows = prepared(
    sqlite,
        `SELECT i.id FROM infants i LEFT JOIN beds b ON b.id = i.bed_id
          WHERE i.unit_id IN (SELECT value FROM json_each(?)) AND i.status = 'admitted'
          ORDER BY i.unit_id, b.sort_order, b.label, i.display_name`,
      )
      .all(JSON.stringify(unitIds)) as Array<{ id: string }>;
    const now = ctx.clock.now();
    const infants = summarizeInfants(sqlite, rows.map((r) => r.id), now);
    await auditListRead(sqlite, { at: now, actorId: req.auth!.userId, view: 'unit-infants', infants: infants.map((i) => ({ infantId: i.id, unitId: i.unitId })), filter: unitId ? { unitId } : undefined });
    res.json({ infants });
  });

  router.get('/:id', allow(ctx, 'chart:read'), (req, res) => {
    const { id } = req.params as IdParams;
    const infant = loadInfantFor(sqlite, req, id);
    const now = ctx.clock.now();
    const unit = loadUnitRow(sqlite, infant.unit_id)!;
    primeRuleReadings(sqlite, id);
    writeTx(sqlite, () => {
      // Only time has passed: the rules need only run from now (syncFlags widens this as needed).
      if (infant.status === 'admitted') syncFlags(sqlite, id, now, null, { from: now.getTime() });
      appendAudit(sqlite, { at: now, actorId: req.auth!.userId, action: 'chart-read', entityType: 'infant', entityId: id, unitId: infant.unit_id, after: { view: 'summary' } });
    });
    const [summary] = summarizeInfants(sqlite, [id], now);
    const last = (column: string) =>
      (prepared(sqlite, `SELECT ${column} AS v FROM readings r WHERE infant_id = ? AND ${column} IS NOT NULL AND entered_in_error = 0 AND NOT EXISTS (SELECT 1 FROM readings y WHERE y.replaces_id = r.id) ORDER BY taken_at DESC, recorded_at DESC LIMIT 1`).get(id) as { v: unknown } | undefined)?.v ?? null;
    const placement = storedPlacement(sqlite, id);
    const left = infant.status === 'discharged' ? dischargeOf(sqlite, id) : null;
    const detail: InfantDetail = {
      infant: summary!,
      birthAt: new Date(infant.birth_at).toISOString(),
      birthWeightGrams: infant.birth_weight_grams,
      admittedAt: new Date(infant.admitted_at).toISOString(),
      unitName: unit.name,
      timeZone: unit.timeZone,
      defaults: {
        controlMode: summary!.controlMode,
        setCenti: summary!.setCenti,
        remoteSite: last('remote_site') as InfantDetail['defaults']['remoteSite'],
        placement: placement
          ? { probeSite: placement.probeSite, probeCovered: placement.probeCovered, position: placement.position, prompt: placement.prompt?.code ?? null }
          : null,
      },
      discharge: left,
    };
    res.json(detail);
  });

  /**
   * The flowsheet, from a cache the database invalidates (flowsheetBody); the read is audited on
   * every request, group-committed with the other reads in flight before the answer goes out.
   */
  router.get('/:id/flowsheet', allow(ctx, 'chart:read'), validate('query', flowsheetQuerySchema), async (req, res) => {
    const { id } = req.params as IdParams;
    const { hours } = valid<FlowsheetQuery>(req, 'query');
    const infant = loadInfantFor(sqlite, req, id);
    const now = ctx.clock.now();
    const body = flowsheetBody(sqlite, id, infant.unit_id, hours, now);
    await auditRead(sqlite, { at: now, actorId: req.auth!.userId, action: 'chart-read', entityType: 'infant', entityId: id, unitId: infant.unit_id, after: { view: 'flowsheet', hours } });
    body.send(req, res);
  });

  /**
   * Record a reading. Idempotent by the client's id: a retry returns the stored reading. The
   * checks run here, per request; the insert, its audit event and the flag sync run in a
   * group-committed batch (batchedWrite) and the answer goes out once the batch is durable.
   */
  router.post('/:id/readings', allow(ctx, 'chart:write'), validate('body', createReadingSchema), async (req, res) => {
    const { id: infantId } = req.params as IdParams;
    const input = valid<CreateReading>(req, 'body');
    const infant = loadInfantFor(sqlite, req, infantId);
    const auth = req.auth!;
    const now = ctx.clock.now();
    const hash = requestHash({ ...input, infantId });

    const replay = () => {
      const existing = loadReading(sqlite, input.id);
      if (!existing) return null;
      if (existing.request_hash !== hash || existing.infant_id !== infantId) {
        throw conflict('A different reading was already saved with this id.', { id: 'This id belongs to another reading.' });
      }
      return existing;
    };
    const already = replay();
    if (!already) requireAdmitted(infant);
    // The probe on the axilla (charted now, or carried from before) leaves the axilla taken.
    if (!already) {
      const probeSite = input.probeSite !== undefined ? input.probeSite : (storedPlacement(sqlite, infantId)?.probeSite ?? null);
      const taken = remoteSiteConflict(probeSite, input.remoteSite, input.remote != null);
      if (taken) throw badRequest(taken, { remoteSite: taken });
    }
    const converted = already ? null : convertAndCheck(input, input.confirmedImplausible);
    const takenAt = input.takenAt ? new Date(input.takenAt) : now;
    if (!already) checkTakenAt(takenAt, now, infant.admitted_at, input.lateReason);

    // Outside any transaction: the rules' copy of the chart is brought up to date from committed rows.
    primeRuleReadings(sqlite, infantId);
    const result = await batchedWrite(sqlite, () => {
      const again = replay();
      // Nothing changed: the rules need only run from now (syncFlags widens this as needed).
      if (again) return { created: false, sync: syncFlags(sqlite, infantId, now, auth.userId, { from: now.getTime() }) };
      // Other requests may have run since the check above (a discharge among them).
      requireAdmitted(loadInfantFor(sqlite, req, infantId));
      const row = {
        id: input.id,
        infantId,
        unitId: infant.unit_id,
        takenAt: takenAt.getTime(),
        recordedAt: now.getTime(),
        recordedBy: auth.userId,
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
      refreshPlacement(sqlite, infantId, infant.unit_id, now);
      appendAudit(sqlite, { at: now, actorId: auth.userId, action: 'reading-create', entityType: 'reading', entityId: row.id, unitId: infant.unit_id, after: { ...row, requestHash: undefined } });
      // The chart changed from the reading's time on: the rules start at or before it.
      return { created: true, sync: syncFlags(sqlite, infantId, now, auth.userId, { from: row.takenAt, excludeReadingId: row.id }) };
    });
    const stored = loadReading(sqlite, input.id)!;
    const stored_ = currentFlagIds(sqlite, infantId);
    const body: CreateReadingResult = {
      reading: readingJson(stored),
      created: result.created,
      openFlags: result.sync.evaluation.openFlags.map((f) => openFlagJson(f, stored_.get(f.key) ?? null, false)),
      nextCheck: nextCheckJson(result.sync.evaluation.nextCheck),
      raisedFlagIds: result.sync.raised,
      closedFlagIds: result.sync.closed,
    };
    escalateAfterWrite(ctx, now, result.sync);
    res.status(result.created ? 201 : 200).json(body);
  });

  /**
   * Chart a change of the probe's placement on its own: the probe moved (to the back or flank when
   * the infant lies prone), the cover, the infant turned. Stored append-only; the current
   * placement and its prompt are stored again with it. Idempotent by the client's id.
   */
  router.post('/:id/placement', allow(ctx, 'chart:write'), validate('body', placementChangeSchema), (req, res) => {
    const { id: infantId } = req.params as IdParams;
    const input = valid<PlacementChange>(req, 'body');
    const infant = loadInfantFor(sqlite, req, infantId);
    const now = ctx.clock.now();
    // A retry answers with the stored change; a new one needs the infant still admitted.
    const result = writeTx(sqlite, () => recordPlacementChange(sqlite, infant, input, req.auth!.userId, now, () => requireAdmitted(loadInfantFor(sqlite, req, infantId))));
    res.status(result.created ? 201 : 200).json({ created: result.created, placement: storedPlacement(sqlite, infantId) });
  });

  /** Start a skin-to-skin session; one at a time per infant. Idempotent by the client's id. */
  router.post('/:id/skin-to-skin', allow(ctx, 'chart:write'), validate('body', startSessionSchema), (req, res) => {
    const { id: infantId } = req.params as IdParams;
    const input = valid<StartSession>(req, 'body');
    const infant = loadInfantFor(sqlite, req, infantId);
    const auth = req.auth!;
    const now = ctx.clock.now();
    const existing = loadSession(sqlite, input.id);
    if (existing) {
      if (existing.infant_id !== infantId) throw conflict('This id belongs to another session.', { id: 'Already used.' });
      res.status(200).json({ session: sessionJson(existing) });
      return;
    }
    requireAdmitted(infant);
    const referenceCenti = toCentiCelsius(input.reference, input.unit, 'reference');
    const check = checkPlausibility('remote', referenceCenti, input.unit);
    if (check.result === 'refuse') throw badRequest(check.reason, { reference: check.reason });
    const startedAt = input.startedAt ? new Date(input.startedAt) : now;
    if (startedAt.getTime() > now.getTime() + 2 * 60_000) throw badRequest('The start time is in the future.', { startedAt: 'The time cannot be in the future.' });
    if (now.getTime() - startedAt.getTime() > 12 * 3_600_000) throw badRequest('The start time is too far back.', { startedAt: 'Start a session within the last 12 hours.' });
    writeTx(sqlite, () => {
      const running = prepared(sqlite, 'SELECT id FROM skin_to_skin_sessions WHERE infant_id = ? AND ended_at IS NULL').get(infantId) as { id: string } | undefined;
      if (running) throw new ApiError(409, 'conflict', 'A skin-to-skin session is already running. End it before starting another.', { id: running.id });
      prepared(sqlite, 'INSERT INTO skin_to_skin_sessions (id, infant_id, unit_id, started_at, started_by, reference_centi, limit_centi, carer) VALUES (?, ?, ?, ?, ?, ?, ?, ?)')
        .run(input.id, infantId, infant.unit_id, startedAt.getTime(), auth.userId, referenceCenti, input.limitCenti, input.carer || null);
      appendAudit(sqlite, {
        at: now,
        actorId: auth.userId,
        action: 'skin-to-skin-start',
        entityType: 'skin-to-skin-session',
        entityId: input.id,
        unitId: infant.unit_id,
        after: { infantId, startedAt: startedAt.toISOString(), referenceCenti, limitCenti: input.limitCenti, carer: input.carer ?? null },
      });
      syncFlags(sqlite, infantId, now, auth.userId);
    });
    res.status(201).json({ session: sessionJson(loadSession(sqlite, input.id)!) });
  });

  function orderByBed(ids: string[]): string[] {
    if (ids.length === 0) return ids;
    const rows = prepared(
    sqlite,
        `SELECT i.id FROM infants i LEFT JOIN beds b ON b.id = i.bed_id WHERE i.id IN (SELECT value FROM json_each(?))
          ORDER BY i.unit_id, b.sort_order, b.label, i.display_name`,
      )
      .all(JSON.stringify(ids)) as Array<{ id: string }>;
    return rows.map((r) => r.id);
  }

  return router;
}
