import { desc, eq, like, or } from 'drizzle-orm';
import { caughtMail } from '../../db/schema';
import type { CaughtMail } from '../../shared/types/board';
import type { AppContext } from '../context';
import { allow, secureRouter } from '../middleware/access';

export const MAILBOX_LIMIT = 200;

/** A link that carries a single-use token (invitation, password reset): whoever opens it sets that person's password. */
const TOKEN_LINK = /\S*[?&]token=[^\s]*/gi;

function recipients(to: string): string[] {
  return to
    .split(',')
    .map((a) => a.trim().toLowerCase())
    .filter(Boolean);
}

/**
 * What a person may read of one caught message, or null: mail addressed to them, whole (a link
 * with a token only when they are its one recipient), and mail their own action sent to someone
 * else (an admin's invitation) with its links withheld. Nobody reads a link that would let them
 * act as someone else.
 */
export function mailboxView(row: typeof caughtMail.$inferSelect, reader: { userId: string; email: string }): CaughtMail | null {
  const to = recipients(row.to);
  const addressed = to.includes(reader.email.toLowerCase());
  if (!addressed && row.sentBy !== reader.userId) return null;
  const whole = addressed && to.length === 1;
  const text = whole ? row.text : row.text.replace(TOKEN_LINK, `[link withheld: only ${row.to} can open it, from their own mailbox]`);
  return { id: row.id, receivedAt: row.receivedAt.toISOString(), from: row.from, to: row.to, subject: row.subject, text };
}

/**
 * The demo's mailbox: what the local mail catcher kept, for the signed-in person only. Mounted
 * only in demo mode (routes/index.ts); production has no mail catcher and no mailbox.
 */
export function mailboxRouter(ctx: AppContext) {
  const router = secureRouter();
  router.get('', allow(ctx, 'signed-in'), (req, res) => {
    const auth = req.auth!;
    // The LIKE narrows the rows (it may also match a longer address); mailboxView decides exactly.
    const rows = ctx.database.db
      .select()
      .from(caughtMail)
      .where(or(eq(caughtMail.sentBy, auth.userId), like(caughtMail.to, `%${auth.email}%`)))
      .orderBy(desc(caughtMail.receivedAt), desc(caughtMail.id))
      .all();
    const messages: CaughtMail[] = [];
    for (const row of rows) {
      const view = mailboxView(row, { userId: auth.userId, email: auth.email });
      if (view) messages.push(view);
      if (messages.length === MAILBOX_LIMIT) break;
    }
    res.json({ messages });
  });
  return router;
}
