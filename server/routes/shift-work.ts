import { bulkAssignSchema, handoverPlanSchema, type BulkAssign, type HandoverPlanInput } from '../../shared/schemas/shift-work';
import type { AppContext } from '../context';
import { allow, assertUnit, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import { auditListRead, auditRead } from '../read-audit';
import { loadInfantFor } from '../services/infants';
import { bulkAssign, currentPlan, unitPlans, writePlan } from '../services/shift-work';

/** Shift change for one infant, mounted at /api/infants: its handover plan. */
export function handoverPlanRouter(ctx: AppContext) {
  const router = secureRouter();

  const infantFor = (req: Parameters<typeof assertUnit>[0]) => loadInfantFor(ctx.database.sqlite, req.auth!, (req.params as { id: string }).id);

  router.get('/:id/handover-plan', allow(ctx, 'chart:read'), async (req, res) => {
    const infant = infantFor(req);
    const plan = currentPlan(ctx, infant);
    if (plan)
      await auditRead(ctx.database.sqlite, {
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

/** Shift change for the unit, mounted at /api/units/:unitId: every infant's plan, and every nurse's infants assigned in one step. */
export function unitShiftWorkRouter(ctx: AppContext) {
  const router = secureRouter({ mergeParams: true });

  router.get('/handover-plans', allow(ctx, 'unit:manage'), async (req, res) => {
    const { unitId } = req.params as { unitId: string };
    assertUnit(req, unitId);
    const plans = unitPlans(ctx, unitId);
    await auditListRead(ctx.database.sqlite, {
      at: ctx.clock.now(),
      actorId: req.auth!.userId,
      view: 'handover-plans',
      infants: plans.map((p) => ({ infantId: p.infantId, unitId })),
    });
    res.json({ plans });
  });

  router.post(
    '/assignments/bulk',
    allow(ctx, 'unit:manage'),
    (req, _res, next) => (assertUnit(req, (req.params as { unitId: string }).unitId), next()),
    validate('body', bulkAssignSchema),
    (req, res) => {
      const { unitId } = req.params as { unitId: string };
      res.status(201).json({ assignments: bulkAssign(ctx, unitId, valid<BulkAssign>(req, 'body'), req.auth!.userId) });
    },
  );

  return router;
}
