import type { RequestHandler } from 'express';
import { bulkAssignSchema, type BulkAssign } from '../../shared/schemas/shift-work';
import { admitInfantSchema, assignNurseSchema, type AdmitInfant } from '../../shared/schemas/unit';
import { startWarmingSchema, endWarmingSchema, type StartWarming } from '../../shared/schemas/warming';
import type { AppContext } from '../context';
import { allow, assertUnit, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import { auditListRead } from '../read-audit';
import { admitInfant, assignNurse, listAssignableNurses } from '../services/admissions';
import { startWarming, stopWarming, unitWarmings } from '../services/bed-warming';
import { readBoard } from '../services/board-cache';
import { unitHandovers } from '../services/handover';
import { bulkAssign, unitPlans } from '../services/shift-work';

type UnitParams = { unitId: string };
type BedParams = UnitParams & { bedId: string };

/** The unit in the path must be one of the signed-in user's units; checked before the body. */
const unitMember: RequestHandler = (req, _res, next) => {
  assertUnit(req, (req.params as UnitParams).unitId);
  next();
};

/**
 * The charge nurse's unit, mounted at /api/units/:unitId (built with mergeParams, so every route
 * sees the unit): the board, admissions and assignments, the warmed beds, the unit's handover and
 * the shift change.
 */
export function unitsRouter(ctx: AppContext) {
  const router = secureRouter({ mergeParams: true });
  const { sqlite } = ctx.database;

  router.get('/board', allow(ctx, 'chart:read'), unitMember, async (req, res) => {
    const body = await readBoard(sqlite, (req.params as UnitParams).unitId, req.auth!.userId, ctx.clock.now());
    body.send(req, res);
  });

  router.get('/nurses', allow(ctx, 'unit:manage'), unitMember, (req, res) => {
    res.json({ nurses: listAssignableNurses(ctx, (req.params as UnitParams).unitId) });
  });

  router.post('/assignments', allow(ctx, 'unit:manage'), unitMember, validate('body', assignNurseSchema), (req, res) => {
    const input = valid<{ infantId: string; nurseId: string; shift: 'current' | 'next' }>(req, 'body');
    res.status(201).json({ assignment: assignNurse(ctx, (req.params as UnitParams).unitId, input, req.auth!.userId) });
  });

  router.post('/infants', allow(ctx, 'unit:manage'), unitMember, validate('body', admitInfantSchema), (req, res) => {
    const input = valid<AdmitInfant>(req, 'body');
    const { id } = admitInfant(ctx, (req.params as UnitParams).unitId, input, req.auth!.userId);
    res.status(201).json({ infant: { id, bedId: input.bedId, displayName: input.displayName } });
  });

  // Empty beds warmed for the next admission: the charge nurse marks them; the board shows them.
  router.get('/warmings', allow(ctx, 'chart:read'), unitMember, (req, res) => {
    res.json({ warmings: unitWarmings(ctx, (req.params as UnitParams).unitId) });
  });

  router.post('/beds/:bedId/warming', allow(ctx, 'unit:manage'), unitMember, validate('body', startWarmingSchema), (req, res) => {
    const { unitId, bedId } = req.params as BedParams;
    res.status(201).json({ warming: startWarming(ctx, unitId, bedId, valid<StartWarming>(req, 'body'), req.auth!.userId) });
  });

  router.post('/beds/:bedId/warming/end', allow(ctx, 'unit:manage'), unitMember, validate('body', endWarmingSchema), (req, res) => {
    const { unitId, bedId } = req.params as BedParams;
    stopWarming(ctx, unitId, bedId, req.auth!.userId);
    res.json({ ended: true });
  });

  /** The charge nurse's handover to the next charge nurse: every admitted infant of the unit, by bed. Every read is audited by the service. */
  router.get('/handover', allow(ctx, 'unit:manage'), (req, res) => {
    res.json(unitHandovers(ctx, (req.params as UnitParams).unitId, req.auth!.userId, ctx.clock.now()));
  });

  // Shift change for the unit: every infant's plan, and every nurse's infants assigned in one step.
  router.get('/handover-plans', allow(ctx, 'unit:manage'), async (req, res) => {
    const { unitId } = req.params as UnitParams;
    assertUnit(req, unitId);
    const plans = unitPlans(ctx, unitId);
    await auditListRead(sqlite, {
      at: ctx.clock.now(),
      actorId: req.auth!.userId,
      view: 'handover-plans',
      infants: plans.map((p) => ({ infantId: p.infantId, unitId })),
    });
    res.json({ plans });
  });

  router.post('/assignments/bulk', allow(ctx, 'unit:manage'), unitMember, validate('body', bulkAssignSchema), (req, res) => {
    const { unitId } = req.params as UnitParams;
    res.status(201).json({ assignments: bulkAssign(ctx, unitId, valid<BulkAssign>(req, 'body'), req.auth!.userId) });
  });

  return router;
}
