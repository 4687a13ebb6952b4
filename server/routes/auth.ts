import {
  changePasswordSchema,
  linkPasswordSchema,
  preferencesSchema,
  requestResetSchema,
  signInSchema,
  type ChangePasswordInput,
  type LinkPasswordInput,
  type PreferencesInput,
  type SignInInput,
} from '../../shared/schemas/auth';
import type { AppContext } from '../context';
import { unauthorized } from '../errors';
import { enqueueMailJob } from '../mail/queue';
import { allow, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import { changePassword, loadSessionUser, signIn, signOut, updatePreferences } from '../services/auth';
import { sendResetLink, useLink } from '../services/email-links';
import { DEVICE_COOKIE_MAX_AGE_MS, DEVICE_COOKIE_PATH, recordResetRequest, resetRequestBudget } from '../services/sign-in-throttle';

/** Signing in and out, the signed-in user's own account, and (public) the e-mailed invitation and password-reset links. */
export function authRouter(ctx: AppContext) {
  const router = secureRouter();

  router.post('/sign-in', allow(ctx, 'public'), validate('body', signInSchema), async (req, res) => {
    const { email, password } = valid<SignInInput>(req, 'body');
    const address = req.ip ?? 'unknown';
    // signIn also writes the sign-in's audit event, in the same transaction as the session.
    const result = await signIn(ctx, email, password, address, req.headers.cookie);
    // The device cookie: this browser keeps its own failure budget for this account from now on.
    // HttpOnly and sent only to the sign-in route; Secure whenever the app is served over HTTPS.
    res.cookie(result.deviceCookie.name, result.deviceCookie.value, {
      httpOnly: true,
      sameSite: 'strict',
      secure: req.secure || ctx.config.publicUrl.startsWith('https:'),
      path: DEVICE_COOKIE_PATH,
      maxAge: DEVICE_COOKIE_MAX_AGE_MS,
    });
    res.json({ token: result.token, expiresAt: new Date(result.expiresAt).toISOString(), user: result.user });
  });

  router.post('/sign-out', allow(ctx, 'signed-in'), (req, res) => {
    signOut(ctx, req.auth!);
    res.status(204).end();
  });

  router.get('/me', allow(ctx, 'signed-in'), (req, res) => {
    const user = loadSessionUser(ctx, req.auth!.userId);
    if (!user) throw unauthorized();
    res.json({ user });
  });

  router.patch('/me/preferences', allow(ctx, 'signed-in'), validate('body', preferencesSchema), (req, res) => {
    updatePreferences(ctx, req.auth!.userId, valid<PreferencesInput>(req, 'body'));
    res.json({ user: loadSessionUser(ctx, req.auth!.userId) });
  });

  router.post('/me/password', allow(ctx, 'signed-in'), validate('body', changePasswordSchema), async (req, res) => {
    await changePassword(ctx, req.auth!.userId, valid<ChangePasswordInput>(req, 'body'), req.ip ?? 'unknown');
    res.status(204).end();
  });

  // Public: accepting an invitation, and resetting a password, by e-mailed link.
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
    recordResetRequest(ctx, email, address);
    res.status(202).json({ message: 'If that address has an account, a reset link is on its way.' });
    enqueueMailJob(ctx, () => sendResetLink(ctx, email));
  });

  return router;
}
