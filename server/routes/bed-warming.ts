import { startWarmingSchema, endWarmingSchema, type StartWarming } from '../../shared/schemas/warming';
import type { AppContext } from '../context';
import { allow, assertUnit, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import { startWarming, stopWarming, unitWarmings } from '../services/bed-warming';

type BedParams = { unitId: string; bedId: string };

/** Empty beds warmed for the next admission, mounted at /api/units/:unitId: the charge nurse marks them; the board shows them. */
export function bedWarmingRouter(ctx: AppContext) {
  const router = secureRouter({ mergeParams: true });
  const unitMember = (req: Parameters<typeof assertUnit>[0], _res: unknown, next: () => void) => {
    assertUnit(req, (req.params as BedParams).unitId);
    next();
  };

  router.get('/warmings', allow(ctx, 'chart:read'), unitMember, (req, res) => {
    res.json({ warmings: unitWarmings(ctx, (req.params as BedParams).unitId) });
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

  return router;
}
