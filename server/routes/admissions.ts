import { dischargeInfantSchema, moveInfantSchema, updateInfantSchema, type DischargeInfant, type MoveInfantInput } from '../../shared/schemas/unit';
import type { AppContext } from '../context';
import { allow, assertUnit, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import { dischargeInfant, loadInfant, moveInfant, updateInfant } from '../services/admissions';

type InfantParams = { id: string };

/** Moving, changing and discharging an admitted infant: the charge nurse's work. */
export function admissionsRouter(ctx: AppContext) {
  const router = secureRouter();

  const infantFor = (req: Express.Request & { params: unknown }) => {
    const infant = loadInfant(ctx, (req.params as InfantParams).id);
    assertUnit(req as Parameters<typeof assertUnit>[0], infant.unit_id);
    return infant;
  };

  router.post('/infants/:id/move', allow(ctx, 'unit:manage'), validate('body', moveInfantSchema), (req, res) => {
    const infant = infantFor(req);
    const { bedId } = valid<MoveInfantInput>(req, 'body');
    res.json({ infant: { id: infant.id, ...moveInfant(ctx, infant, bedId, req.auth!.userId) } });
  });

  router.patch('/infants/:id', allow(ctx, 'unit:manage'), validate('body', updateInfantSchema), (req, res) => {
    const infant = infantFor(req);
    const input = valid<{ heatSource?: 'radiant-warmer' | 'incubator' | 'convertible'; weightGrams?: number }>(req, 'body');
    updateInfant(ctx, infant, input, req.auth!.userId);
    const after = loadInfant(ctx, infant.id);
    res.json({ infant: { id: after.id, heatSource: after.heat_source, weightGrams: after.weight_grams } });
  });

  router.post('/infants/:id/discharge', allow(ctx, 'unit:manage'), validate('body', dischargeInfantSchema), (req, res) => {
    const infant = infantFor(req);
    const input = valid<DischargeInfant>(req, 'body');
    const result = dischargeInfant(ctx, infant, input, req.auth!.userId);
    res.json({ infant: { id: infant.id, status: 'discharged' }, ...result });
  });

  return router;
}
