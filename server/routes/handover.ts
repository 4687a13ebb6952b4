import type { AppContext } from '../context';
import { allow, secureRouter } from '../middleware/access';
import { infantHandover, infantHandoverCsv, myHandovers, unitHandovers } from '../services/handover';

/** My handover, mounted at /api/nurses: the infants assigned to the signed-in nurse. Every read is audited by the service. */
export function nursesRouter(ctx: AppContext) {
  const router = secureRouter();

  router.get('/me/handover', allow(ctx, 'chart:read'), (req, res) => {
    res.json(myHandovers(ctx, req.auth!, ctx.clock.now()));
  });

  return router;
}

/** The unit's handover, mounted at /api/units/:unitId. Every read is audited by the service. */
export function unitHandoverRouter(ctx: AppContext) {
  const router = secureRouter({ mergeParams: true });

  /** The charge nurse's handover to the next charge nurse: every admitted infant of the unit, by bed. */
  router.get('/handover', allow(ctx, 'unit:manage'), (req, res) => {
    res.json(unitHandovers(ctx, (req.params as { unitId: string }).unitId, req.auth!.userId, ctx.clock.now()));
  });

  return router;
}

/** One infant's handover and its readings as CSV, mounted at /api/infants. Every read is audited by the service. */
export function infantHandoverRouter(ctx: AppContext) {
  const router = secureRouter();

  router.get('/:id/handover', allow(ctx, 'chart:read'), (req, res) => {
    res.json(infantHandover(ctx, (req.params as { id: string }).id, req.auth!, ctx.clock.now()));
  });

  router.get('/:id/handover.csv', allow(ctx, 'chart:read'), (req, res) => {
    const { filename, csv } = infantHandoverCsv(ctx, (req.params as { id: string }).id, req.auth!, ctx.clock.now());
    res.set('Content-Type', 'text/csv; charset=utf-8');
    res.set('Content-Disposition', `attachment; filename="${filename}"`);
    res.send(csv);
  });

  return router;
}
