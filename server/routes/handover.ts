import type { AppContext } from '../context';
import { allow, secureRouter } from '../middleware/access';
import { infantHandover, infantHandoverCsv, myHandovers, unitHandovers } from '../services/handover';

/** The shift handover: one infant, all of mine, the whole unit, and one infant's readings as CSV. Every read is audited by the service. */
export function handoverRouter(ctx: AppContext) {
  const router = secureRouter();

  router.get('/nurses/me/handover', allow(ctx, 'chart:read'), (req, res) => {
    res.json(myHandovers(ctx, req.auth!, ctx.clock.now()));
  });

  /** The charge nurse's handover to the next charge nurse: every admitted infant of the unit, by bed. */
  router.get('/units/:unitId/handover', allow(ctx, 'unit:manage'), (req, res) => {
    res.json(unitHandovers(ctx, (req.params as { unitId: string }).unitId, req.auth!.userId, ctx.clock.now()));
  });

  router.get('/infants/:id/handover', allow(ctx, 'chart:read'), (req, res) => {
    res.json(infantHandover(ctx, (req.params as { id: string }).id, req.auth!, ctx.clock.now()));
  });

  router.get('/infants/:id/handover.csv', allow(ctx, 'chart:read'), (req, res) => {
    const { filename, csv } = infantHandoverCsv(ctx, (req.params as { id: string }).id, req.auth!, ctx.clock.now());
    res.set('Content-Type', 'text/csv; charset=utf-8');
    res.set('Content-Disposition', `attachment; filename="${filename}"`);
    res.send(csv);
  });

  return router;
}
