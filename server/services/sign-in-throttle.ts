import { and, count, eq, gt, isNull, min } from 'drizzle-orm';
import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import { writeTx } from '../../db/client';
import { signInAttempts } from '../../db/schema';
import type { AppContext } from '../context';
import { ApiError } from '../errors';

/**
 * Throttling that slows a guesser without locking the nurse out: OWASP's device cookies
 * ("Slow Down Online Guessing Attacks with Device Cookies"). A browser that has signed in to an
 * account before carries a signed cookie naming that account; its failures count against its own
 * budget. Every other client shares the account's budget for unknown devices, and running it out
 * locks only unknown devices. A device cookie that runs out its own budget is treated as unknown.
 * Counting is by the e-mail typed, so an address without an account answers exactly alike.
 */

/** ASVS 2.2.1: at most five failures in fifteen minutes, for the account's unknown devices and for each known device. */
export const ACCOUNT_FAILURE_LIMIT = 5;
export const DEVICE_FAILURE_LIMIT = 5;
export const ADDRESS_FAILURE_LIMIT = 30;
export const THROTTLE_WINDOW_MS = 15 * 60_000;
/** Current-password checks when changing a password: five wrong ones per account in the window. */
export const PASSWORD_CHECK_LIMIT = 5;
/** Reset requests: three per e-mail entered and ten per client address in the window, known account or not. */
export const RESET_REQUESTS_PER_EMAIL = 3;
export const RESET_REQUESTS_PER_ADDRESS = 10;

export const DEVICE_COOKIE_PREFIX = 'wf_device_';
export const DEVICE_COOKIE_PATH = '/api/auth/sign-in';
export const DEVICE_COOKIE_MAX_AGE_MS = 180 * 24 * 60 * 60_000;

type Kind = (typeof signInAttempts.$inferInsert)['kind'] & string;

function deviceKey(ctx: AppContext): Buffer {
  return createHmac('sha256', ctx.config.jwtSecret).update('warmfold device cookie v1').digest();
}

function mac(ctx: AppContext, text: string): string {
  return createHmac('sha256', deviceKey(ctx)).update(text).digest('base64url');
}

/** One cookie per account a browser has signed in to, so colleagues sharing a ward computer keep their own. */
export function deviceCookieName(ctx: AppContext, email: string): string {
  return DEVICE_COOKIE_PREFIX + mac(ctx, `name|${email}`).slice(0, 16).replace(/[-_]/g, 'x');
}

export function issueDeviceCookie(ctx: AppContext, email: string): { name: string; value: string } {
  const id = randomBytes(16).toString('base64url');
  return { name: deviceCookieName(ctx, email), value: `${id}.${mac(ctx, `device|${email}|${id}`)}` };
}

/** The device id of a valid cookie for this account from the request's Cookie header, or null. */
export function deviceFromCookies(ctx: AppContext, cookieHeader: string | undefined, email: string): string | null {
  if (!cookieHeader) return null;
  const name = deviceCookieName(ctx, email);
  for (const part of cookieHeader.split(';')) {
    const split = part.indexOf('=');
    if (split < 0 || part.slice(0, split).trim() !== name) continue;
    const [id, sig] = part
      .slice(split + 1)
      .trim()
      .split('.');
    if (!id || !sig) return null;
    const expected = Buffer.from(mac(ctx, `device|${email}|${id}`));
    const given = Buffer.from(sig);
    return expected.length === given.length && timingSafeEqual(expected, given) ? id : null;
  }
  return null;
}

function tally(ctx: AppContext, kind: Kind, since: number, where: 'email' | 'address' | 'device', value: string | null, failuresOnly: boolean) {
  const column = where === 'email' ? signInAttempts.email : where === 'address' ? signInAttempts.address : signInAttempts.device;
  const conditions = [eq(signInAttempts.kind, kind), gt(signInAttempts.at, new Date(since)), value === null ? isNull(column) : eq(column, value)];
  if (failuresOnly) conditions.push(eq(signInAttempts.succeeded, false));
  // Failures from unknown devices only, for the account's shared budget.
  if (where !== 'device' && kind === 'sign-in') conditions.push(isNull(signInAttempts.device));
  const row = ctx.database.db
    .select({ n: count(), oldest: min(signInAttempts.at) })
    .from(signInAttempts)
    .where(and(...conditions))
    .get();
  return { n: row?.n ?? 0, oldest: row?.oldest?.getTime() ?? null };
}

function tooMany(message: string, oldest: number | null, now: number): ApiError {
  const retryAfter = Math.max(1, Math.ceil(((oldest ?? now) + THROTTLE_WINDOW_MS - now) / 1000));
  return new ApiError(429, 'too-many-requests', message.replace('{minutes}', String(Math.ceil(retryAfter / 60))), undefined, { 'Retry-After': String(retryAfter) });
}

/**
 * Check a sign-in against its budget and say which one it spends: the known device's own, or
 * (device null) the account's budget for unknown devices and the client address's.
 */
export function signInBudget(ctx: AppContext, email: string, address: string, device: string | null): { device: string | null } {
  const now = ctx.clock.now().getTime();
  const since = now - THROTTLE_WINDOW_MS;
  if (device !== null && tally(ctx, 'sign-in', since, 'device', device, true).n < DEVICE_FAILURE_LIMIT) return { device };
  const message = 'Too many sign-in attempts. Try again in {minutes} minutes, or ask your administrator to reset your password.';
  const byAccount = tally(ctx, 'sign-in', since, 'email', email, true);
  if (byAccount.n >= ACCOUNT_FAILURE_LIMIT) throw tooMany(message, byAccount.oldest, now);
  const byAddress = tally(ctx, 'sign-in', since, 'address', address, true);
  if (byAddress.n >= ADDRESS_FAILURE_LIMIT) throw tooMany(message, byAddress.oldest, now);
  return { device: null };
}

/** A reset request, counted for its throttle in a write transaction of its own (known and unknown addresses alike). */
export function recordResetRequest(ctx: AppContext, email: string, address: string): void {
  writeTx(ctx.database.sqlite, () => recordAttempt(ctx, 'reset-request', email, address, true));
}

export function recordAttempt(ctx: AppContext, kind: Kind, email: string, address: string, succeeded: boolean, device: string | null = null): void {
  ctx.database.db.insert(signInAttempts).values({ kind, email, address, at: ctx.clock.now(), succeeded, device }).run();
}

/** The current-password check of a password change: throttled per account, like a sign-in. */
export function passwordCheckBudget(ctx: AppContext, email: string): void {
  const now = ctx.clock.now().getTime();
  const failures = tally(ctx, 'password-check', now - THROTTLE_WINDOW_MS, 'email', email, true);
  if (failures.n >= PASSWORD_CHECK_LIMIT) {
    throw tooMany('Too many wrong current passwords. Try again in {minutes} minutes, or sign out and reset your password by e-mail.', failures.oldest, now);
  }
}

/** Reset requests, counted by the e-mail typed and by address alike for known and unknown accounts. */
export function resetRequestBudget(ctx: AppContext, email: string, address: string): void {
  const now = ctx.clock.now().getTime();
  const since = now - THROTTLE_WINDOW_MS;
  const message = 'Too many reset requests. Try again in {minutes} minutes, or ask your administrator.';
  const byEmail = tally(ctx, 'reset-request', since, 'email', email, false);
  if (byEmail.n >= RESET_REQUESTS_PER_EMAIL) throw tooMany(message, byEmail.oldest, now);
  const byAddress = tally(ctx, 'reset-request', since, 'address', address, false);
  if (byAddress.n >= RESET_REQUESTS_PER_ADDRESS) throw tooMany(message, byAddress.oldest, now);
}
