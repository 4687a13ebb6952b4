import { bulkAssignSchema, handoverPlanSchema, type BulkAssign, type HandoverPlanInput } from '../../shared/schemas/shift-work';
import type { AppContext } from '../context';
import { allow, assertUnit, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import { loadInfant } from '../services/admissions';
import { bulkAssign, currentPlan, unitPlans, writePlan } from '../services/shift-work';

/** Shift change: the handover plan per infant and the assignment of every nurse's infants in one step. */
export function shiftWorkRouter(ctx: AppContext) {
  const router = secureRouter();

  const infantFor = (req: Parameters<typeof assertUnit>[0]) => {
    const infant = loadInfant(ctx, (req.params as { id: string }).id);
    assertUnit(req, infant.unit_id);
    return infant;
  };

  router.get('/infants/:id/handover-plan', allow(ctx, 'chart:read'), (req, res) => {
    res.json({ plan: currentPlan(ctx, infantFor(req)) });
  });

  router.post('/infants/:id/handover-plan', allow(ctx, 'chart:write'), validate('body', handoverPlanSchema), (req, res) => {
    const infant = infantFor(req);
    res.status(201).json({ plan: writePlan(ctx, infant, valid<HandoverPlanInput>(req, 'body').plan, req.auth!.userId) });
  });

  router.get('/units/:unitId/handover-plans', allow(ctx, 'unit:manage'), (req, res) => {
    const { unitId } = req.params as { unitId: string };
    assertUnit(req, unitId);
    res.json({ plans: unitPlans(ctx, unitId) });
  });

  router.post('/units/:unitId/assignments/bulk', allow(ctx, 'unit:manage'), (req, _res, next) => (assertUnit(req, (req.params as { unitId: string }).unitId), next()), validate('body', bulkAssignSchema), (req, res) => {
    const { unitId } = req.params as { unitId: string };
    res.status(201).json({ assignments: bulkAssign(ctx, unitId, valid<BulkAssign>(req, 'body'), req.auth!.userId) });
  });

  return router;
}
