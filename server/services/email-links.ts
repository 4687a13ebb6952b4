import { and, count, eq, gt, isNotNull, isNull } from 'drizzle-orm';
import { emailTokens, users } from '../../db/schema';
import { createHash, randomBytes, randomUUID } from 'node:crypto';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { badRequest, notFound } from '../errors';
import { assertPasswordAllowed } from './passwords';
import { hashPassword, nextSessionVersion, revokeAllSessions } from './auth';

export type LinkKind = 'invite' | 'reset';

/** An invitation lasts 72 hours; a reset link one hour. */
export const LINK_LIFETIME_MS: Record<LinkKind, number> = { invite: 72 * 60 * 60_000, reset: 60 * 60_000 };
/** At most one reset e-mail per account in this time. */
export const RESET_MAIL_INTERVAL_MS = 5 * 60_000;
const LINK_PATH: Record<LinkKind, string> = { invite: '/accept-invite', reset: '/reset-password' };

export function hashToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

export interface IssuedLink {
  url: string;
  expiresAt: Date;
  to: string;
  name: string;
  kind: LinkKind;
  /** Who made the link (an admin's invitation or reset); null when the person asked for it. */
  sentBy: string | null;
}

/**
 * Make a single-use link and keep only the SHA-256 of its token. Earlier unused links of the same
 * kind for the user stop working. Call inside a write transaction; send the mail after commit.
 */
export function issueLink(ctx: AppContext, userId: string, kind: LinkKind, actorId: string | null): IssuedLink {
  const { db, sqlite } = ctx.database;
  const user = db.select({ email: users.email, name: users.name }).from(users).where(eq(users.id, userId)).get();
  if (!user) throw notFound('That user');
  const now = ctx.clock.now();
  const token = randomBytes(32).toString('base64url');
  const expiresAt = new Date(now.getTime() + LINK_LIFETIME_MS[kind]);
  db.update(emailTokens)
    .set({ usedAt: now })
    .where(and(eq(emailTokens.userId, userId), eq(emailTokens.kind, kind), isNull(emailTokens.usedAt)))
    .run();
  db.insert(emailTokens)
    .values({ id: randomUUID(), userId, kind, tokenHash: hashToken(token), createdAt: now, expiresAt, usedAt: null })
    .run();
  appendAudit(sqlite, {
    at: now,
    actorId,
    action: kind === 'invite' ? 'invitation-sent' : 'password-reset-sent',
    entityType: 'user',
    entityId: userId,
    unitId: null,
    after: { expiresAt: expiresAt.toISOString() },
  });
  return { url: `${ctx.config.publicUrl}${LINK_PATH[kind]}?token=${encodeURIComponent(token)}`, expiresAt, to: user.email, name: user.name, kind, sentBy: actorId };
}

function formatExpiry(at: Date): string {
  return `${at.toISOString().slice(0, 16).replace('T', ' ')} UTC`;
}

export async function mailLink(ctx: AppContext, link: IssuedLink): Promise<void> {
  const invite = link.kind === 'invite';
  const subject = invite ? 'You are invited to Warmfold' : 'Reset your Warmfold password';
  const text = [
    `Hello ${link.name},`,
    '',
    invite
      ? 'Your unit administrator has given you a Warmfold account. Open this link to choose your password:'
      : 'A password reset was asked for your Warmfold account. Open this link to choose a new password:',
    '',
    link.url,
    '',
    `The link works once and expires at ${formatExpiry(link.expiresAt)}${invite ? ' (72 hours)' : ' (1 hour)'}.`,
    invite ? '' : 'If you did not ask for this, ignore this e-mail: your password stays as it is.',
  ].join('\n');
  await ctx.mailer.send({ to: [link.to], subject, text, sentBy: link.sentBy });
}

/** Send after the transaction; a failure is logged, never shown as a failed write (the link can be sent again). */
export async function mailLinkSafely(ctx: AppContext, link: IssuedLink): Promise<boolean> {
  try {
    await mailLink(ctx, link);
    return true;
  } catch (err) {
    ctx.log(`mail to ${link.to} failed: ${String(err)}`);
    return false;
  }
}

/**
 * The queued half of a reset request: mail a reset link if the address has an active account
 * with a password, at most one every five minutes (older unused links stop working).
 */
export async function sendResetLink(ctx: AppContext, email: string): Promise<void> {
  const { db } = ctx.database;
  const user = db
    .select({ id: users.id })
    .from(users)
    .where(and(eq(users.email, email), eq(users.active, true), isNotNull(users.passwordHash)))
    .get();
  if (!user) return;
  const recent = db
    .select({ n: count() })
    .from(emailTokens)
    .where(and(eq(emailTokens.userId, user.id), eq(emailTokens.kind, 'reset'), gt(emailTokens.createdAt, new Date(ctx.clock.now().getTime() - RESET_MAIL_INTERVAL_MS))))
    .get();
  if ((recent?.n ?? 0) > 0) return;
  const link = db.transaction(() => issueLink(ctx, user.id, 'reset', null), { behavior: 'immediate' });
  await mailLinkSafely(ctx, link);
}

/**
 * Use a link to set a password. A link that is unknown, used, expired or of the other kind is
 * refused with the same kind of answer, on the `token` field.
 */
export async function useLink(ctx: AppContext, kind: LinkKind, token: string, password: string): Promise<{ userId: string }> {
  const { db, sqlite } = ctx.database;
  const row = db
    .select({
      id: emailTokens.id,
      userId: emailTokens.userId,
      kind: emailTokens.kind,
      expiresAt: emailTokens.expiresAt,
      usedAt: emailTokens.usedAt,
      email: users.email,
      name: users.name,
      active: users.active,
    })
    .from(emailTokens)
    .innerJoin(users, eq(users.id, emailTokens.userId))
    .where(eq(emailTokens.tokenHash, hashToken(token)))
    .get();
  const now = ctx.clock.now();
  if (!row || row.kind !== kind || !row.active) throw badRequest('This link is not valid.', { token: 'This link is not valid. Ask your administrator for a new one.' });
  if (row.usedAt !== null) throw badRequest('This link was already used.', { token: 'This link was already used. Ask your administrator for a new one.' });
  if (now.getTime() > row.expiresAt.getTime()) throw badRequest('This link has expired.', { token: 'This link has expired. Ask your administrator for a new one.' });
  assertPasswordAllowed(password, 'password', [row.email, row.name]);
  const hash = await hashPassword(password, ctx.config.bcryptCost);
  db.transaction(
    (tx) => {
      // Check again under the write lock: two tabs submitting the same link must not both win.
      const used = tx
        .update(emailTokens)
        .set({ usedAt: now })
        .where(and(eq(emailTokens.id, row.id), isNull(emailTokens.usedAt)))
        .run();
      if (used.changes !== 1) throw badRequest('This link was already used.', { token: 'This link was already used.' });
      tx.update(users).set({ passwordHash: hash, sessionVersion: nextSessionVersion, updatedAt: now }).where(eq(users.id, row.userId)).run();
      revokeAllSessions(ctx, row.userId);
      appendAudit(sqlite, {
        at: now,
        actorId: row.userId,
        action: kind === 'invite' ? 'invitation-accepted' : 'password-reset',
        entityType: 'user',
        entityId: row.userId,
        unitId: null,
      });
    },
    { behavior: 'immediate' },
  );
  return { userId: row.userId };
}
