import { acknowledgeEscalationSchema, type AcknowledgeEscalationInput } from '../../shared/schemas/unit';
import type { AppContext } from '../context';
import { allow, assertUnit, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import { acknowledgeEscalation } from '../services/escalations';

/** Acknowledging escalations, mounted at /api/escalations. (The demo's mailbox lives in routes/mailbox.ts.) */
export function escalationsRouter(ctx: AppContext) {
  const router = secureRouter();

  router.post('/:id/acknowledge', allow(ctx, 'unit:manage'), validate('body', acknowledgeEscalationSchema), (req, res) => {
    const { note } = valid<AcknowledgeEscalationInput>(req, 'body');
    const auth = req.auth!;
    const result = acknowledgeEscalation(ctx, (req.params as { id: string }).id, auth, note || null, (unitId) => assertUnit(req, unitId));
    res.json({ escalation: result });
  });

  return router;
}
