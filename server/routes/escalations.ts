import { acknowledgeEscalationSchema, type AcknowledgeEscalationInput } from '../../shared/schemas/unit';
import type { CaughtMail } from '../../shared/types/board';
import type { AppContext } from '../context';
import { allow, assertUnit, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import { acknowledgeEscalation } from '../services/escalations';

export const MAILBOX_LIMIT = 200;

/** Acknowledging escalations, and the admin's view of the mail the local catcher kept. */
export function escalationsRouter(ctx: AppContext) {
  const router = secureRouter();

  router.post('/escalations/:id/acknowledge', allow(ctx, 'unit:manage'), validate('body', acknowledgeEscalationSchema), (req, res) => {
    const { note } = valid<AcknowledgeEscalationInput>(req, 'body');
    const auth = req.auth!;
    const result = acknowledgeEscalation(ctx, (req.params as { id: string }).id, auth, note || null, (unitId) => assertUnit(req, unitId));
    res.json({ escalation: result });
  });

  router.get('/admin/mailbox', allow(ctx, 'admin:manage'), (_req, res) => {
    const rows = ctx.database.sqlite
      .prepare('SELECT id, received_at, from_address, to_addresses, subject, text_body FROM caught_mail ORDER BY received_at DESC, id DESC LIMIT ?')
      .all(MAILBOX_LIMIT) as Array<{ id: number; received_at: number; from_address: string; to_addresses: string; subject: string; text_body: string }>;
    const messages: CaughtMail[] = rows.map((r) => ({
      id: r.id,
      receivedAt: new Date(r.received_at).toISOString(),
      from: r.from_address,
      to: r.to_addresses,
      subject: r.subject,
      text: r.text_body,
    }));
    res.json({ messages });
  });

  return router;
}
