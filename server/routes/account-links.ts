import { linkPasswordSchema, requestResetSchema, type LinkPasswordInput } from '../../shared/schemas/auth';
import type { AppContext } from '../context';
import { allow, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import { issueLink, mailLinkSafely, useLink, type IssuedLink } from '../services/email-links';

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

  /** Always 202, whether or not the address has an account, so it cannot be used to find accounts. */
  router.post('/password-reset/request', allow(ctx, 'public'), validate('body', requestResetSchema), async (req, res) => {
    const { email } = valid<{ email: string }>(req, 'body');
    const { sqlite } = ctx.database;
    const user = sqlite.prepare('SELECT id FROM users WHERE email = ? AND active = 1 AND password_hash IS NOT NULL').get(email) as { id: string } | undefined;
    if (user) {
      // At most one reset e-mail per account every five minutes.
      const recent = sqlite.prepare("SELECT COUNT(*) AS n FROM email_tokens WHERE user_id = ? AND kind = 'reset' AND created_at > ?").get(user.id, ctx.clock.now().getTime() - 5 * 60_000) as { n: number };
      if (recent.n === 0) {
        const link: IssuedLink = sqlite.transaction(() => issueLink(ctx, sqlite, user.id, 'reset', null)).immediate();
        await mailLinkSafely(ctx, link);
      }
    }
    res.status(202).json({ message: 'If that address has an account, a reset link is on its way.' });
  });

  return router;
}
