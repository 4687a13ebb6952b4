import type { z } from 'zod';
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
import { placementChangeSchema, type PlacementChange } from '../../shared/schemas/placement';
import { handoverPlanSchema, type HandoverPlanInput } from '../../shared/schemas/shift-work';
import { dischargeInfantSchema, moveInfantSchema, updateInfantSchema, type DischargeInfant, type MoveInfantInput } from '../../shared/schemas/unit';
import type { AppContext } from '../context';
import { allow, assertUnit, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import { auditListRead, auditRead } from '../read-audit';
import { dischargeInfant, moveInfant, updateInfant } from '../services/admissions';
import { flowsheetBody } from '../services/bedside';
import { chartPlacementChange, createReading, startSession } from '../services/charting';
import { infantHandover, infantHandoverCsv } from '../services/handover';
import { admittedInfantIds, infantDetail, loadInfantFor, myInfantIds } from '../services/infants';
import { currentPlan, writePlan } from '../services/shift-work';
import { summarizeInfants } from '../services/summaries';

type IdParams = { id: string };

/**
 * Everything under /api/infants: the lists and the chart, the bedside's writes, the charge nurse's
 * moves, changes and discharges, the infant's handover (every read audited by the service) and its
 * handover plan.
 */
export function infantsRouter(ctx: AppContext) {
  const router = secureRouter();
  const { sqlite } = ctx.database;
  const infantFor = (req: Parameters<typeof assertUnit>[0]) => loadInfantFor(sqlite, req.auth!, (req.params as IdParams).id);

  /** The signed-in nurse's infants for the current shift (the latest assignment row wins). */
  router.get('/mine', allow(ctx, 'chart:read'), async (req, res) => {
    const auth = req.auth!;
    const now = ctx.clock.now();
    const infants = summarizeInfants(sqlite, myInfantIds(sqlite, auth, now), now);
    await auditListRead(sqlite, { at: now, actorId: auth.userId, view: 'my-infants', infants: infants.map((i) => ({ infantId: i.id, unitId: i.unitId })) });
    res.json({ infants });
  });

  /** Every admitted infant of one of my units, or of all of them. */
  router.get('/', allow(ctx, 'chart:read'), validate('query', infantListQuerySchema), async (req, res) => {
    const { unitId } = valid<InfantListQuery>(req, 'query');
    if (unitId) assertUnit(req, unitId);
    const now = ctx.clock.now();
    const infants = summarizeInfants(sqlite, admittedInfantIds(sqlite, unitId ? [unitId] : req.auth!.unitIds), now);
    await auditListRead(sqlite, {
      at: now,
      actorId: req.auth!.userId,
      view: 'unit-infants',
      infants: infants.map((i) => ({ infantId: i.id, unitId: i.unitId })),
      filter: unitId ? { unitId } : undefined,
    });
    res.json({ infants });
  });

  router.get('/:id', allow(ctx, 'chart:read'), (req, res) => {
    const infant = loadInfantFor(sqlite, req.auth!, (req.params as IdParams).id);
    res.json(infantDetail(sqlite, infant, req.auth!.userId, ctx.clock.now()));
  });

  /**
   * The flowsheet, from a cache the database invalidates (flowsheetBody); the read is audited on
   * every request, group-committed with the other reads in flight before the answer goes out.
   */
  router.get('/:id/flowsheet', allow(ctx, 'chart:read'), validate('query', flowsheetQuerySchema), async (req, res) => {
    const { id } = req.params as IdParams;
    const { hours } = valid<FlowsheetQuery>(req, 'query');
    const infant = loadInfantFor(sqlite, req.auth!, id);
    const now = ctx.clock.now();
    const body = flowsheetBody(sqlite, id, infant.unitId, hours, now);
    await auditRead(sqlite, {
      at: now,
      actorId: req.auth!.userId,
      action: 'chart-read',
      entityType: 'infant',
      entityId: id,
      unitId: infant.unitId,
      after: { view: 'flowsheet', hours },
    });
    body.send(req, res);
  });

  /** Record a reading. Idempotent by the client's id: a retry returns the stored reading. */
  router.post('/:id/readings', allow(ctx, 'chart:write'), validate('body', createReadingSchema), async (req, res) => {
    const result = await createReading(ctx, (req.params as IdParams).id, valid<CreateReading>(req, 'body'), req.auth!);
    res.status(result.created ? 201 : 200).json(result);
  });

  /**
   * Chart a change of the probe's placement on its own: the probe moved (to the back or flank when
   * the infant lies prone), the cover, the infant turned. Stored append-only; the current
   * placement and its prompt are stored again with it. Idempotent by the client's id.
   */
  router.post('/:id/placement', allow(ctx, 'chart:write'), validate('body', placementChangeSchema), (req, res) => {
    const result = chartPlacementChange(ctx, (req.params as IdParams).id, valid<PlacementChange>(req, 'body'), req.auth!);
    res.status(result.created ? 201 : 200).json(result);
  });

  /** Start a skin-to-skin session; one at a time per infant. Idempotent by the client's id. */
  router.post('/:id/skin-to-skin', allow(ctx, 'chart:write'), validate('body', startSessionSchema), (req, res) => {
    const { session, created } = startSession(ctx, (req.params as IdParams).id, valid<StartSession>(req, 'body'), req.auth!);
    res.status(created ? 201 : 200).json({ session });
  });

  // Moving, changing and discharging an admitted infant: the charge nurse's work.
  router.post('/:id/move', allow(ctx, 'unit:manage'), validate('body', moveInfantSchema), (req, res) => {
    const infant = infantFor(req);
    const { bedId } = valid<MoveInfantInput>(req, 'body');
    res.json({ infant: { id: infant.id, ...moveInfant(ctx, infant, bedId, req.auth!.userId) } });
  });

  router.patch('/:id', allow(ctx, 'unit:manage'), validate('body', updateInfantSchema), (req, res) => {
    const infant = infantFor(req);
    res.json({ infant: updateInfant(ctx, infant, valid<z.output<typeof updateInfantSchema>>(req, 'body'), req.auth!.userId) });
  });

  router.post('/:id/discharge', allow(ctx, 'unit:manage'), validate('body', dischargeInfantSchema), (req, res) => {
    const infant = infantFor(req);
    const result = dischargeInfant(ctx, infant, valid<DischargeInfant>(req, 'body'), req.auth!.userId);
    res.json({ infant: { id: infant.id, status: 'discharged' }, ...result });
  });

  // One infant's handover and its readings as CSV. Every read is audited by the service.
  router.get('/:id/handover', allow(ctx, 'chart:read'), (req, res) => {
    res.json(infantHandover(ctx, (req.params as IdParams).id, req.auth!, ctx.clock.now()));
  });

  router.get('/:id/handover.csv', allow(ctx, 'chart:read'), (req, res) => {
    const { filename, csv } = infantHandoverCsv(ctx, (req.params as IdParams).id, req.auth!, ctx.clock.now());
    res.set('Content-Type', 'text/csv; charset=utf-8');
    res.set('Content-Disposition', `attachment; filename="${filename}"`);
    res.send(csv);
  });

  // Shift change for one infant: its handover plan.
  router.get('/:id/handover-plan', allow(ctx, 'chart:read'), async (req, res) => {
    const infant = infantFor(req);
    const plan = currentPlan(ctx, infant);
    if (plan)
      await auditRead(sqlite, {
        at: ctx.clock.now(),
        actorId: req.auth!.userId,
        action: 'chart-read',
        entityType: 'infant',
        entityId: infant.id,
        unitId: infant.unitId,
        after: { view: 'handover-plan' },
      });
    res.json({ plan });
  });

  router.post('/:id/handover-plan', allow(ctx, 'chart:write'), validate('body', handoverPlanSchema), (req, res) => {
    const infant = infantFor(req);
    res.status(201).json({ plan: writePlan(ctx, infant, valid<HandoverPlanInput>(req, 'body').plan, req.auth!.userId) });
  });

  return router;
}
