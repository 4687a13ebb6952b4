import type { AppContext } from '../context';
import { allow, secureRouter } from '../middleware/access';
import { myHandovers } from '../services/handover';

/** My handover, mounted at /api/nurses: the infants assigned to the signed-in nurse. Every read is audited by the service. */
export function nursesRouter(ctx: AppContext) {
  const router = secureRouter();

  router.get('/me/handover', allow(ctx, 'chart:read'), (req, res) => {
    res.json(myHandovers(ctx, req.auth!, ctx.clock.now()));
  });

  return router;
}
