import { randomUUID } from 'node:crypto';
import { writeTx } from '../../db/client';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { conflict, notFound } from '../errors';
import { syncFlags } from './flags';

export interface EscalationRun {
  /** Escalations created by this run. */
  created: string[];
  /** Escalations whose e-mail this run sent. */
  mailed: string[];
}

interface Candidate {
  flag_id: string;
  unit_id: string;
  kind: 'gap' | 'overdue-check';
  raised_at: number;
  infant_id: string;
}

interface Pending {
  id: string;
  unit_id: string;
  kind: 'gap' | 'overdue-check';
  raised_at: number;
  escalated_at: number;
  display_name: string;
  bed_label: string | null;
  time_zone: string;
}

const WHAT: Record<Pending['kind'], { subject: string; line: string }> = {
  gap: { subject: 'probe and remote site still apart', line: 'a gap flag (probe and remote-site temperatures more than the unit limit apart) is still unresolved' },
  'overdue-check': { subject: 'remote-site check overdue', line: 'the remote-site temperature check is overdue and has not been recorded' },
};

/** Bring every admitted infant's stored flags up to date, so time-based flags (overdue checks) exist as rows. */
export function syncAdmittedInfants(ctx: AppContext, now: Date): void {
  const { sqlite } = ctx.database;
  writeTx(sqlite, () => {
    const ids = sqlite.prepare("SELECT id FROM infants WHERE status = 'admitted'").all() as Array<{ id: string }>;
    for (const { id } of ids) syncFlags(sqlite, id, now, null);
  });
}

/**
 * Escalate every gap or overdue-check flag that has stayed open longer than its unit's
 * escalation delay, then e-mail the unit's charge nurses about each escalation not yet mailed.
 *
 * Never twice: the escalation row is unique per flag (INSERT OR IGNORE), and a mail is claimed
 * by setting mailed_at in a write transaction before it is sent, so a second run, in this process
 * or another, finds nothing to send. A failed send releases the claim for the next run.
 */
export async function runEscalations(ctx: AppContext, now: Date): Promise<EscalationRun> {
  const { sqlite } = ctx.database;
  syncAdmittedInfants(ctx, now);

  const created = writeTx(sqlite, () => {
    const candidates = sqlite
      .prepare(
        `SELECT f.id AS flag_id, f.unit_id, f.kind, f.raised_at, f.infant_id
           FROM flags f
           JOIN infants i ON i.id = f.infant_id
           JOIN units u ON u.id = f.unit_id
           LEFT JOIN flag_resolutions r ON r.flag_id = f.id
           LEFT JOIN escalations e ON e.flag_id = f.id
          WHERE f.kind IN ('gap', 'overdue-check')
            AND r.flag_id IS NULL AND e.id IS NULL AND i.status = 'admitted'
            AND f.raised_at + u.escalation_delay_minutes * 60000 < ?`,
      )
      .all(now.getTime()) as Candidate[];
    const insert = sqlite.prepare('INSERT OR IGNORE INTO escalations (id, flag_id, unit_id, escalated_at) VALUES (?, ?, ?, ?)');
    const ids: string[] = [];
    for (const c of candidates) {
      const id = randomUUID();
      if (insert.run(id, c.flag_id, c.unit_id, now.getTime()).changes !== 1) continue;
      appendAudit(sqlite, {
        at: now,
        actorId: null,
        action: 'escalation-raised',
        entityType: 'escalation',
        entityId: id,
        unitId: c.unit_id,
        after: { flagId: c.flag_id, kind: c.kind, infantId: c.infant_id, raisedAt: new Date(c.raised_at).toISOString() },
      });
      ids.push(id);
    }
    return ids;
  });

  const pending = sqlite
    .prepare(
      `SELECT e.id, e.unit_id, f.kind, f.raised_at, e.escalated_at, i.display_name, b.label AS bed_label, u.time_zone
         FROM escalations e
         JOIN flags f ON f.id = e.flag_id
         JOIN infants i ON i.id = f.infant_id
         JOIN units u ON u.id = e.unit_id
         LEFT JOIN beds b ON b.id = i.bed_id
         LEFT JOIN flag_resolutions r ON r.flag_id = f.id
        WHERE e.mailed_at IS NULL AND r.flag_id IS NULL
        ORDER BY e.escalated_at`,
    )
    .all() as Pending[];

  const mailed: string[] = [];
  for (const p of pending) {
    const to = chargeNurseEmails(ctx, p.unit_id);
    if (to.length === 0) continue;
    const claimed = writeTx(sqlite, () => sqlite.prepare('UPDATE escalations SET mailed_at = ? WHERE id = ? AND mailed_at IS NULL').run(now.getTime(), p.id).changes === 1);
    if (!claimed) continue;
    try {
      await ctx.mailer.send({ to, ...escalationMail(p, now, ctx.config.publicUrl) });
      writeTx(sqlite, () =>
        appendAudit(sqlite, { at: now, actorId: null, action: 'escalation-mailed', entityType: 'escalation', entityId: p.id, unitId: p.unit_id, after: { to } }),
      );
      mailed.push(p.id);
    } catch (err) {
      writeTx(sqlite, () => sqlite.prepare('UPDATE escalations SET mailed_at = NULL WHERE id = ?').run(p.id));
      ctx.log(`escalation ${p.id}: the e-mail could not be sent (${err instanceof Error ? err.message : String(err)}); it will be tried again.`);
    }
  }
  return { created, mailed };
}

function chargeNurseEmails(ctx: AppContext, unitId: string): string[] {
  const rows = ctx.database.sqlite
    .prepare(
      `SELECT u.email FROM users u JOIN user_units m ON m.user_id = u.id
        WHERE m.unit_id = ? AND u.role = 'charge' AND u.active = 1 ORDER BY u.email`,
    )
    .all(unitId) as Array<{ email: string }>;
  return rows.map((r) => r.email);
}

function localTime(ms: number, timeZone: string): string {
  return new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', day: 'numeric', month: 'short', hour12: false }).format(new Date(ms));
}

/** Only what the charge nurse needs to act: bed, display name, what, since when. */
export function escalationMail(p: Pending, now: Date, publicUrl: string): { subject: string; text: string } {
  const bed = p.bed_label ?? 'no bed';
  const minutes = Math.max(0, Math.floor((now.getTime() - p.raised_at) / 60_000));
  const what = WHAT[p.kind];
  return {
    subject: `Warmfold escalation: bed ${bed}, ${what.subject}`,
    text: [
      `Bed ${bed}, ${p.display_name}: ${what.line}.`,
      `Open since ${localTime(p.raised_at, p.time_zone)} (${p.time_zone}), ${minutes} minutes ago.`,
      '',
      `Please look at the board and acknowledge the escalation there: ${publicUrl}/board`,
      '',
      'Warmfold supports your judgment; follow unit policy, the device instructions and licensed practice.',
    ].join('\n'),
  };
}

export interface Acknowledged {
  id: string;
  acknowledgedAt: string;
  acknowledgedBy: string;
  note: string | null;
}

/** Record the charge nurse's acknowledgement; a second acknowledgement is a conflict. */
export function acknowledgeEscalation(
  ctx: AppContext,
  escalationId: string,
  actor: { userId: string; unitIds: string[] },
  note: string | null,
  assertUnit: (unitId: string) => void,
): Acknowledged {
  const { sqlite } = ctx.database;
  const now = ctx.clock.now();
  return writeTx(sqlite, () => {
    const row = sqlite.prepare('SELECT id, unit_id, acknowledged_at FROM escalations WHERE id = ?').get(escalationId) as
      | { id: string; unit_id: string; acknowledged_at: number | null }
      | undefined;
    if (!row) throw notFound('That escalation');
    assertUnit(row.unit_id);
    if (row.acknowledged_at !== null) throw conflict('This escalation has already been acknowledged.');
    sqlite.prepare('UPDATE escalations SET acknowledged_at = ?, acknowledged_by = ?, acknowledge_note = ? WHERE id = ?').run(now.getTime(), actor.userId, note, row.id);
    appendAudit(sqlite, {
      at: now,
      actorId: actor.userId,
      action: 'escalation-acknowledged',
      entityType: 'escalation',
      entityId: row.id,
      unitId: row.unit_id,
      before: { acknowledgedAt: null },
      after: { acknowledgedAt: now.toISOString(), note },
    });
    return { id: row.id, acknowledgedAt: now.toISOString(), acknowledgedBy: actor.userId, note };
  });
}
