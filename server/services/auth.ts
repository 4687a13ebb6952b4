import { and, eq, gt, sql } from 'drizzle-orm';
import jwt from 'jsonwebtoken';
import { createSecretKey, randomUUID, type KeyObject } from 'node:crypto';
import { authSessions, units as unitsTable, userUnits, users } from '../../db/schema';
import type { PreferencesInput, SessionUser } from '../../shared/schemas/auth';
import { writeTx } from '../../db/client';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { ApiError, badRequest, unauthorized } from '../errors';
import type { AuthContext } from '../types';
import { hashPassword, verifyPassword } from './password-hash';
import { assertPasswordAllowed } from './passwords';
import { perConnection } from './prepared-queries';
import { deviceFromCookies, issueDeviceCookie, passwordCheckBudget, recordAttempt, signInBudget } from './sign-in-throttle';

export { hashPassword, verifyPassword } from './password-hash';

/** ASVS 3.3: idle and absolute session limits. */
export const IDLE_LIMIT_MS = 30 * 60_000;
export const ABSOLUTE_LIMIT_MS = 12 * 60 * 60_000;
const ALGORITHM = 'HS256' as const;

const dummyHashes = new Map<number, Promise<string>>();
/**
 * Compared against when the account does not exist, so both answers take about as long. Made at
 * start-up (server/index.ts), so not even the first unknown address is slower.
 */
export function timingDummy(cost: number): Promise<string> {
  let hash = dummyHashes.get(cost);
  if (!hash) dummyHashes.set(cost, (hash = hashPassword('warmfold-not-a-real-password', cost)));
  return hash;
}

// sql fragment: an increment in place, so a concurrent change cannot be lost (Drizzle has no column arithmetic).
/** `users.session_version + 1`: bumping it ends every token issued before. */
export const nextSessionVersion = sql<number>`${users.sessionVersion} + 1`;

export function loadSessionUser(ctx: AppContext, userId: string): SessionUser | null {
  const { db } = ctx.database;
  const user = db.select().from(users).where(eq(users.id, userId)).get();
  if (!user) return null;
  const units = db
    .select({ id: unitsTable.id, name: unitsTable.name, timeZone: unitsTable.timeZone })
    .from(userUnits)
    .innerJoin(unitsTable, eq(unitsTable.id, userUnits.unitId))
    .where(eq(userUnits.userId, userId))
    .orderBy(unitsTable.name)
    .all();
  const unitIds = units.map((u) => u.id);
  return { id: user.id, email: user.email, name: user.name, role: user.role, unitIds, units, tempUnit: user.tempUnit, clock: user.clock, theme: user.theme };
}

export interface SignInResult {
  token: string;
  user: SessionUser;
  expiresAt: number;
  /** A fresh device cookie for this browser and account (OWASP device cookies). */
  deviceCookie: { name: string; value: string };
}

/**
 * Sign in with e-mail and password. `cookieHeader` is the request's Cookie header: a valid device
 * cookie for this account gives the browser its own failure budget (sign-in-throttle.ts).
 */
export async function signIn(ctx: AppContext, email: string, password: string, address: string, cookieHeader?: string): Promise<SignInResult> {
  const { device } = signInBudget(ctx, email, address, deviceFromCookies(ctx, cookieHeader, email));
  const { db } = ctx.database;
  const user = db.select().from(users).where(eq(users.email, email)).get();
  const hash = user?.passwordHash ?? (await timingDummy(ctx.config.bcryptCost));
  const matches = await verifyPassword(password, hash);
  const ok = Boolean(user && user.active && user.passwordHash && matches);
  const now = ctx.clock.now();
  if (!ok || !user) {
    writeTx(ctx.database.sqlite, () => recordAttempt(ctx, 'sign-in', email, address, false, device));
    throw new ApiError(401, 'unauthorized', 'That e-mail and password do not match an active account.', { password: 'Check the e-mail and password.' });
  }
  const sessionId = randomUUID();
  const expiresAt = now.getTime() + ABSOLUTE_LIMIT_MS;
  // The attempt, the session and the audit event in one transaction: one fsync, not three.
  writeTx(ctx.database.sqlite, () => {
    recordAttempt(ctx, 'sign-in', email, address, true, device);
    db.insert(authSessions)
      .values({ id: sessionId, userId: user.id, sessionVersion: user.sessionVersion, createdAt: now, lastSeenAt: now, expiresAt: new Date(expiresAt) })
      .run();
    appendAudit(ctx.database.sqlite, { at: now, actorId: user.id, action: 'sign-in', entityType: 'user', entityId: user.id, unitId: null });
  });
  // iat follows the app's clock, so exp agrees with the session row even under a test clock.
  const iat = Math.floor(now.getTime() / 1000);
  // The cached secret KeyObject: from a string, jsonwebtoken first tries it as a private key and fails.
  const token = jwt.sign({ sub: user.id, sv: user.sessionVersion, iat }, secretKey(ctx.config.jwtSecret), {
    algorithm: ALGORITHM,
    jwtid: sessionId,
    expiresIn: Math.floor(ABSOLUTE_LIMIT_MS / 1000),
  });
  return { token, user: loadSessionUser(ctx, user.id)!, expiresAt, deviceCookie: issueDeviceCookie(ctx, email) };
}

interface TokenClaims {
  sub: string;
  sv: number;
  jti: string;
  exp: number;
}

const secretKeys = new Map<string, KeyObject>();
/** jsonwebtoken builds a key object from a string secret on every verify; build it once. */
function secretKey(secret: string): KeyObject {
  let key = secretKeys.get(secret);
  if (!key) {
    key = createSecretKey(Buffer.from(secret, 'utf8'));
    secretKeys.set(secret, key);
  }
  return key;
}

// Prepared once per connection: the session, its user and their units are read on every signed-in request (bench: unit board and 72-h flowsheet ≥ 50 % of /api/ping).
const sessionQuery = perConnection((db) => {
  // sql fragment: group_concat has no Drizzle helper; the user's units come in the same query as the session.
  const unitList = db
    .select({ ids: sql<string>`group_concat(${userUnits.unitId}, char(31))` })
    .from(userUnits)
    .where(eq(userUnits.userId, users.id));
  return db
    .select({
      id: authSessions.id,
      userId: authSessions.userId,
      sessionVersion: authSessions.sessionVersion,
      lastSeenAt: authSessions.lastSeenAt,
      expiresAt: authSessions.expiresAt,
      revokedAt: authSessions.revokedAt,
      role: users.role,
      name: users.name,
      email: users.email,
      active: users.active,
      userVersion: users.sessionVersion,
      // sql fragment: only wraps the subquery above as a scalar column.
      unitIds: sql<string | null>`${unitList}`,
    })
    .from(authSessions)
    .innerJoin(users, eq(users.id, authSessions.userId))
    .where(eq(authSessions.id, sql.placeholder('id')))
    .prepare();
});

/**
 * The token's signature and expiry, checked on every request. (A cache of verified signatures was
 * tried and removed: it saved about 10 µs of HMAC per request, nothing a budget needed, on the
 * security path.)
 */
function verifiedClaims(ctx: AppContext, token: string): TokenClaims {
  const nowSeconds = Math.floor(ctx.clock.now().getTime() / 1000);
  return jwt.verify(token, secretKey(ctx.config.jwtSecret), { algorithms: [ALGORITHM], clockTimestamp: nowSeconds }) as TokenClaims;
}

/** Check a bearer token against its signature, its session row and the user's current state. */
export function verifyToken(ctx: AppContext, token: string): AuthContext {
  let claims: TokenClaims;
  try {
    claims = verifiedClaims(ctx, token);
  } catch {
    throw unauthorized('Your session has ended. Please sign in again.');
  }
  if (typeof claims.jti !== 'string' || typeof claims.sub !== 'string' || typeof claims.exp !== 'number') {
    throw unauthorized('Your session has ended. Please sign in again.');
  }
  const now = ctx.clock.now();
  const { db } = ctx.database;
  const row = sessionQuery(ctx.database.sqlite).get({ id: claims.jti });
  if (!row || row.userId !== claims.sub || row.revokedAt !== null) throw unauthorized('Your session has ended. Please sign in again.');
  if (now.getTime() > row.expiresAt.getTime()) throw unauthorized('Your session reached its 12-hour limit. Please sign in again.');
  const idle = now.getTime() - row.lastSeenAt.getTime();
  if (idle > IDLE_LIMIT_MS) throw unauthorized('You were signed out after 30 minutes without activity.');
  if (!row.active || row.userVersion !== row.sessionVersion || claims.sv !== row.userVersion) {
    throw unauthorized('Your account changed. Please sign in again.');
  }
  // Keep the idle timer fresh without writing on every request.
  if (idle > 15_000) db.update(authSessions).set({ lastSeenAt: now }).where(eq(authSessions.id, row.id)).run();
  const unitIds = row.unitIds ? row.unitIds.split('\u001f') : [];
  return { userId: row.userId, sessionId: row.id, role: row.role, unitIds, name: row.name, email: row.email };
}

export function revokeSession(ctx: AppContext, sessionId: string): void {
  ctx.database.db.update(authSessions).set({ revokedAt: ctx.clock.now() }).where(eq(authSessions.id, sessionId)).run();
}

/** Ends every session of a user, used by password changes, role changes and deactivation. */
export function revokeAllSessions(ctx: AppContext, userId: string): void {
  ctx.database.db
    .update(authSessions)
    .set({ revokedAt: ctx.clock.now() })
    .where(and(eq(authSessions.userId, userId), gt(authSessions.expiresAt, new Date(0))))
    .run();
}

/** Sign out: this session ends, and says so in the audit trail. */
export function signOut(ctx: AppContext, auth: { userId: string; sessionId: string }): void {
  ctx.database.db.transaction(
    () => {
      revokeSession(ctx, auth.sessionId);
      appendAudit(ctx.database.sqlite, { at: ctx.clock.now(), actorId: auth.userId, action: 'sign-out', entityType: 'user', entityId: auth.userId, unitId: null });
    },
    { behavior: 'immediate' },
  );
}

/** The signed-in person's own display preferences, audited with the values before. */
export function updatePreferences(ctx: AppContext, userId: string, changes: PreferencesInput): void {
  ctx.database.db.transaction(
    (tx) => {
      const before = tx.select({ tempUnit: users.tempUnit, clock: users.clock, theme: users.theme }).from(users).where(eq(users.id, userId)).get();
      tx.update(users)
        .set({ ...changes, updatedAt: ctx.clock.now() })
        .where(eq(users.id, userId))
        .run();
      appendAudit(ctx.database.sqlite, {
        at: ctx.clock.now(),
        actorId: userId,
        action: 'preferences-change',
        entityType: 'user',
        entityId: userId,
        unitId: null,
        before,
        after: changes,
      });
    },
    { behavior: 'immediate' },
  );
}

/**
 * Change one's own password: the current one is checked against its own budget (a stolen session
 * must not become a way to guess the password behind it), every session ends.
 */
export async function changePassword(ctx: AppContext, userId: string, input: { currentPassword: string; newPassword: string }, address: string): Promise<void> {
  const { db } = ctx.database;
  const user = db.select().from(users).where(eq(users.id, userId)).get();
  if (!user) throw unauthorized();
  passwordCheckBudget(ctx, user.email);
  const right = user.passwordHash !== null && (await verifyPassword(input.currentPassword, user.passwordHash));
  writeTx(ctx.database.sqlite, () => recordAttempt(ctx, 'password-check', user.email, address, right));
  if (!right) throw badRequest('Your current password is not right.', { currentPassword: 'This is not your current password.' });
  assertPasswordAllowed(input.newPassword, 'newPassword', [user.email, user.name]);
  const hash = await hashPassword(input.newPassword, ctx.config.bcryptCost);
  db.transaction(
    (tx) => {
      tx.update(users)
        .set({ passwordHash: hash, sessionVersion: user.sessionVersion + 1, updatedAt: ctx.clock.now() })
        .where(eq(users.id, user.id))
        .run();
      revokeAllSessions(ctx, user.id);
      appendAudit(ctx.database.sqlite, { at: ctx.clock.now(), actorId: user.id, action: 'password-change', entityType: 'user', entityId: user.id, unitId: null });
    },
    { behavior: 'immediate' },
  );
}
