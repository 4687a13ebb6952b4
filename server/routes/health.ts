import type { AppContext } from '../context';
import { allow, secureRouter } from '../middleware/access';

export function healthRouter(ctx: AppContext) {
  const router = secureRouter();
  router.get('/health', allow(ctx, 'public'), (_req, res) => {
    const row = ctx.database.sqlite.prepare('SELECT 1 AS ok').get() as { ok: number };
    // `mode` lets the app show the demo's mailbox link only where a mailbox exists.
    res.json({ status: row.ok === 1 ? 'ok' : 'degraded', time: ctx.clock.now().toISOString(), mode: ctx.config.mode });
  });
  /** A bare route for the benchmark's baseline: no database, no auth. */
  router.get('/ping', allow(ctx, 'public'), (_req, res) => {
    res.json({ pong: true });
  });
  return router;
}
