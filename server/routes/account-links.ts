import { linkPasswordSchema, requestResetSchema, type LinkPasswordInput } from '../../shared/schemas/auth';
import type { AppContext } from '../context';
import { allow, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import { enqueueMailJob } from '../mail/queue';
import { sendResetLink, useLink } from '../services/email-links';
import { recordAttempt, resetRequestBudget } from '../services/sign-in-throttle';
import { batchedWrite } from '../write-batch';

/** Public: accepting an invitation, and resetting a password, by e-mailed link. Mounted under /auth. */
export function accountLinksRouter(ctx: AppContext) {
  const router = secureRouter();

  router.post('/invitations/accept', allow(ctx, 'public'), validate('body', linkPasswordSchema), async (req, res) => {
    const { token, password } = valid<LinkPasswordInput>(req, 'body');
    await useLink(ctx, 'invite', token, password);
    res.status(204).end();
  });

  router.post('/password-reset', allow(ctx, 'public'), validate('body', linkPasswordSchema), async (req, res) => {
    const { token, password } = valid<LinkPasswordInput>(req, 'body');
    await useLink(ctx, 'reset', token, password);
    res.status(204).end();
  });

  /**
   * Always 202, whether or not the address has an account, and in the same time: before the answer
   * only the throttle is checked and the request counted (the same work for every address); the
   * account is looked up, and its link made and mailed, from the mail queue after the answer.
   */
  router.post('/password-reset/request', allow(ctx, 'public'), validate('body', requestResetSchema), async (req, res) => {
    const { email } = valid<{ email: string }>(req, 'body');
    const address = req.ip ?? 'unknown';
    resetRequestBudget(ctx, email, address);
    await batchedWrite(ctx.database.sqlite, () => recordAttempt(ctx, 'reset-request', email, address, true));
    res.status(202).json({ message: 'If that address has an account, a reset link is on its way.' });
    enqueueMailJob(ctx, () => sendResetLink(ctx, email));
  });

  return router;
}
