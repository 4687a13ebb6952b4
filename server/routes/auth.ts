import { eq } from 'drizzle-orm';
import { users } from '../../db/schema';
import { writeTx } from '../../db/client';
import { changePasswordSchema, preferencesSchema, signInSchema, type ChangePasswordInput, type PreferencesInput, type SignInInput } from '../../shared/schemas/auth';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { badRequest, unauthorized } from '../errors';
import { allow, secureRouter } from '../middleware/access';
import { batchedWrite } from '../write-batch';
import { valid, validate } from '../middleware/validate';
import { hashPassword, loadSessionUser, revokeAllSessions, revokeSession, signIn, verifyPassword } from '../services/auth';
import { assertPasswordAllowed } from '../services/passwords';
import { DEVICE_COOKIE_MAX_AGE_MS, DEVICE_COOKIE_PATH, passwordCheckBudget, recordAttempt } from '../services/sign-in-throttle';

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
    const auth = req.auth!;
    writeTx(ctx.database.sqlite, () => {
      revokeSession(ctx, auth.sessionId);
      appendAudit(ctx.database.sqlite, { at: ctx.clock.now(), actorId: auth.userId, action: 'sign-out', entityType: 'user', entityId: auth.userId, unitId: null });
    });
    res.status(204).end();
  });

  router.get('/me', allow(ctx, 'signed-in'), (req, res) => {
    const user = loadSessionUser(ctx, req.auth!.userId);
    if (!user) throw unauthorized();
    res.json({ user });
  });

  router.patch('/me/preferences', allow(ctx, 'signed-in'), validate('body', preferencesSchema), (req, res) => {
    const changes = valid<PreferencesInput>(req, 'body');
    const auth = req.auth!;
    writeTx(ctx.database.sqlite, () => {
      const before = ctx.database.db.select({ tempUnit: users.tempUnit, clock: users.clock, theme: users.theme }).from(users).where(eq(users.id, auth.userId)).get();
      ctx.database.db.update(users).set({ ...changes, updatedAt: ctx.clock.now() }).where(eq(users.id, auth.userId)).run();
      appendAudit(ctx.database.sqlite, { at: ctx.clock.now(), actorId: auth.userId, action: 'preferences-change', entityType: 'user', entityId: auth.userId, unitId: null, before, after: changes });
    });
    res.json({ user: loadSessionUser(ctx, auth.userId) });
  });

  router.post('/me/password', allow(ctx, 'signed-in'), validate('body', changePasswordSchema), async (req, res) => {
    const { currentPassword, newPassword } = valid<ChangePasswordInput>(req, 'body');
    const auth = req.auth!;
    const user = ctx.database.db.select().from(users).where(eq(users.id, auth.userId)).get();
    if (!user) throw unauthorized();
    // A stolen session must not become a way to guess the password behind it.
    passwordCheckBudget(ctx, user.email);
    const right = user.passwordHash !== null && (await verifyPassword(currentPassword, user.passwordHash));
    await batchedWrite(ctx.database.sqlite, () => recordAttempt(ctx, 'password-check', user.email, req.ip ?? 'unknown', right));
    if (!right) throw badRequest('Your current password is not right.', { currentPassword: 'This is not your current password.' });
    assertPasswordAllowed(newPassword, 'newPassword', [user.email, user.name]);
    const hash = await hashPassword(newPassword, ctx.config.bcryptCost);
    writeTx(ctx.database.sqlite, () => {
      ctx.database.db
        .update(users)
        .set({ passwordHash: hash, sessionVersion: user.sessionVersion + 1, updatedAt: ctx.clock.now() })
        .where(eq(users.id, user.id))
        .run();
      revokeAllSessions(ctx, user.id);
      appendAudit(ctx.database.sqlite, { at: ctx.clock.now(), actorId: user.id, action: 'password-change', entityType: 'user', entityId: user.id, unitId: null });
    });
    res.status(204).end();
  });

  return router;
}
