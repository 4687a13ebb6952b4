import type { AppContext } from '../context';
import { allow, secureRouter } from '../middleware/access';
import { checkDatabase } from '../services/health';

export function healthRouter(ctx: AppContext) {
  const router = secureRouter();
  router.get('/health', allow(ctx, 'public'), (_req, res) => {
    checkDatabase(ctx.database);
    // `mode` lets the app show the demo's mailbox link only where a mailbox exists.
    res.json({ status: 'ok', time: ctx.clock.now().toISOString(), mode: ctx.config.mode });
  });
  /** A bare route for the benchmark's baseline: no database, no auth. */
  router.get('/ping', allow(ctx, 'public'), (_req, res) => {
    res.json({ pong: true });
  });
  return router;
}
