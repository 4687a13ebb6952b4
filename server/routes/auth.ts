import { changePasswordSchema, preferencesSchema, signInSchema, type ChangePasswordInput, type PreferencesInput, type SignInInput } from '../../shared/schemas/auth';
import type { AppContext } from '../context';
import { unauthorized } from '../errors';
import { allow, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import { changePassword, loadSessionUser, signIn, signOut, updatePreferences } from '../services/auth';
import { DEVICE_COOKIE_MAX_AGE_MS, DEVICE_COOKIE_PATH } from '../services/sign-in-throttle';

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

  return router;
}
