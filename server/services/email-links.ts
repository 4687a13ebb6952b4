import type Database from 'better-sqlite3';
import { and, count, eq, gt, isNotNull } from 'drizzle-orm';
import { writeTx } from '../../db/client';
import { emailTokens, users } from '../../db/schema';
import { createHash, randomBytes, randomUUID } from 'node:crypto';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { badRequest } from '../errors';
import { assertPasswordAllowed } from './passwords';
import { hashPassword, revokeAllSessions } from './auth';

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
export function issueLink(ctx: AppContext, sqlite: Database.Database, userId: string, kind: LinkKind, actorId: string | null): IssuedLink {
  const user = sqlite.prepare('SELECT id, email, name FROM users WHERE id = ?').get(userId) as { id: string; email: string; name: string };
  const now = ctx.clock.now();
  const token = randomBytes(32).toString('base64url');
  const expiresAt = new Date(now.getTime() + LINK_LIFETIME_MS[kind]);
  sqlite.prepare('UPDATE email_tokens SET used_at = ? WHERE user_id = ? AND kind = ? AND used_at IS NULL').run(now.getTime(), userId, kind);
  sqlite
    .prepare('INSERT INTO email_tokens (id, user_id, kind, token_hash, created_at, expires_at, used_at) VALUES (?, ?, ?, ?, ?, ?, NULL)')
    .run(randomUUID(), userId, kind, hashToken(token), now.getTime(), expiresAt.getTime());
  appendAudit(sqlite, { at: now, actorId, action: kind === 'invite' ? 'invitation-sent' : 'password-reset-sent', entityType: 'user', entityId: userId, unitId: null, after: { expiresAt: expiresAt.toISOString() } });
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
  const { db, sqlite } = ctx.database;
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
  const link = writeTx(sqlite, () => issueLink(ctx, sqlite, user.id, 'reset', null));
  await mailLinkSafely(ctx, link);
}

/**
 * Use a link to set a password. A link that is unknown, used, expired or of the other kind is
 * refused with the same kind of answer, on the `token` field.
 */
export async function useLink(ctx: AppContext, kind: LinkKind, token: string, password: string): Promise<{ userId: string }> {
  const { sqlite } = ctx.database;
  const row = sqlite
    .prepare('SELECT t.id, t.user_id, t.kind, t.expires_at, t.used_at, u.email, u.name, u.active, u.session_version FROM email_tokens t JOIN users u ON u.id = t.user_id WHERE t.token_hash = ?')
    .get(hashToken(token)) as { id: string; user_id: string; kind: LinkKind; expires_at: number; used_at: number | null; email: string; name: string; active: number; session_version: number } | undefined;
  const now = ctx.clock.now();
  if (!row || row.kind !== kind || !row.active) throw badRequest('This link is not valid.', { token: 'This link is not valid. Ask your administrator for a new one.' });
  if (row.used_at !== null) throw badRequest('This link was already used.', { token: 'This link was already used. Ask your administrator for a new one.' });
  if (now.getTime() > row.expires_at) throw badRequest('This link has expired.', { token: 'This link has expired. Ask your administrator for a new one.' });
  assertPasswordAllowed(password, 'password', [row.email, row.name]);
  const hash = await hashPassword(password, ctx.config.bcryptCost);
  sqlite
    .transaction(() => {
      // Check again under the write lock: two tabs submitting the same link must not both win.
      const used = sqlite.prepare('UPDATE email_tokens SET used_at = ? WHERE id = ? AND used_at IS NULL').run(now.getTime(), row.id);
      if (used.changes !== 1) throw badRequest('This link was already used.', { token: 'This link was already used.' });
      sqlite.prepare('UPDATE users SET password_hash = ?, session_version = session_version + 1, updated_at = ? WHERE id = ?').run(hash, now.getTime(), row.user_id);
      revokeAllSessions(ctx, row.user_id);
      appendAudit(sqlite, { at: now, actorId: row.user_id, action: kind === 'invite' ? 'invitation-accepted' : 'password-reset', entityType: 'user', entityId: row.user_id, unitId: null });
    })
    .immediate();
  return { userId: row.user_id };
}
