/**
 * A flag's lifecycle in words, for the flowsheet's history: raised, actions (and undone ones),
 * escalations (whom, when, how), acknowledged, closed, withdrawn (why), reopened. A flag reopened
 * as a new row (see ruleKeyOf in flags.ts) shows the whole chain, oldest first.
 */
import type Database from 'better-sqlite3';
import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import { actions, flagEvents, flags, users } from '../../db/schema';
import { BAND_LABELS } from '../../shared/thermal/bands';
import { SEVERITY_WORDS, type Severity } from '../../shared/thermal/severity';
import { ACTION_LABELS, type ActionKind } from '../../shared/vocabulary';
import { dbOf } from './flag-lifecycle';

export interface FlagHistoryEvent {
  id: string;
  flagId: string;
  event: string;
  /** The clinical instant (ISO). */
  at: string;
  /** Who did it, when a person did. */
  by: { id: string; name: string } | null;
  /** The event in words. */
  text: string;
}

const CLOSED_HOW: Record<string, string> = {
  recheck: 'Closed by a recheck',
  'check-recorded': 'Closed when the check was charted',
  'session-ended': 'Closed when skin-to-skin ended',
  discharged: 'Closed at discharge',
};

const WITHDRAWN_WHY: Record<string, string> = {
  'late-entry-on-time': 'a check charted late was on time',
  'reading-corrected': 'the reading that raised it was corrected',
  'entered-in-error': 'the reading that raised it was entered in error',
};

function words(event: string, severity: Severity | null, d: Record<string, unknown>, note: string | null): string {
  const sev = severity ? ` (${SEVERITY_WORDS[severity]})` : '';
  switch (event) {
    case 'raised':
      return `Raised${sev}`;
    case 'severity-changed':
      return `Worsened to ${typeof d.band === 'string' && d.band in BAND_LABELS ? BAND_LABELS[d.band as keyof typeof BAND_LABELS].toLowerCase() : 'a higher severity'}${sev}`;
    case 'action':
      // "Something else" says what only in its note, so the note is part of the line.
      return `Action: ${ACTION_LABELS[d.kind as ActionKind] ?? 'something done'}${note ? `. Note: ${note}` : ''}`;
    case 'action-undone':
      return `Action undone (entered in error): ${ACTION_LABELS[d.kind as ActionKind] ?? 'an action'}`;
    case 'recheck':
      return 'Rechecked';
    case 'escalated': {
      const to = Array.isArray(d.to)
        ? (d.to as { name?: string | null; email?: string }[])
            .map((r) => r.name ?? r.email ?? '')
            .filter(Boolean)
            .join(', ')
        : '';
      // Each escalation names its severity: a flag that worsens escalates again.
      return `Escalated${sev}: told ${to || 'the unit address'} by e-mail`;
    }
    case 'acknowledged':
      return `Escalation acknowledged${sev}`;
    case 'closed':
      return CLOSED_HOW[String(d.how)] ?? 'Closed';
    case 'withdrawn':
      return `Withdrawn: ${WITHDRAWN_WHY[String(d.reason)] ?? 'it should not have been raised'}`;
    case 'reopened':
      return d.was === 'withdrawn' ? 'Reopened: the rules see it again after a correction' : 'Reopened: what closed it was corrected or undone';
    default:
      return 'Updated';
  }
}

/** The flag ids of one chain of reopenings that `flagId` belongs to, oldest first. */
function chainOf(sqlite: Database.Database, flagId: string): string[] {
  const db = dbOf(sqlite);
  const flag = db.select({ infantId: flags.infantId }).from(flags).where(eq(flags.id, flagId)).get();
  if (!flag) return [];
  const links = db
    .select({ flagId: flagEvents.flagId, detail: flagEvents.detail })
    .from(flagEvents)
    // A reopening names the row before it.
    .where(and(eq(flagEvents.infantId, flag.infantId), eq(flagEvents.event, 'reopened')))
    .all()
    .map((e) => ({ next: e.flagId, previous: (JSON.parse(e.detail) as { previousFlagId?: string }).previousFlagId }))
    .filter((l): l is { next: string; previous: string } => typeof l.previous === 'string');
  let first = flagId;
  for (let i = 0; i < 50; i++) {
    const back = links.find((l) => l.next === first);
    if (!back) break;
    first = back.previous;
  }
  const chain = [first];
  for (let i = 0; i < 50; i++) {
    const on = links.find((l) => l.previous === chain[chain.length - 1]);
    if (!on) break;
    chain.push(on.next);
  }
  return chain;
}

// sql fragment: rowid (the order rows were stored in) breaks ties of created_at; the schema has no column for it.
const eventOrder = sql`${flagEvents}.rowid`;

export function flagHistory(sqlite: Database.Database, flagId: string): FlagHistoryEvent[] {
  const ids = chainOf(sqlite, flagId);
  if (ids.length === 0) return [];
  const rows = dbOf(sqlite)
    .select({
      id: flagEvents.id,
      flagId: flagEvents.flagId,
      event: flagEvents.event,
      at: flagEvents.at,
      severity: flagEvents.severity,
      detail: flagEvents.detail,
      actorId: flagEvents.actorId,
      name: users.name,
    })
    .from(flagEvents)
    .leftJoin(users, eq(users.id, flagEvents.actorId))
    .where(inArray(flagEvents.flagId, ids))
    // Events written in one transaction keep the order they were written in.
    .orderBy(asc(flagEvents.createdAt), asc(eventOrder))
    .all();
  const parsed = rows.map((r) => ({ ...r, d: JSON.parse(r.detail) as Record<string, unknown> }));
  // The notes of the actions named by the events (an action event carries its action's id).
  const actionIds = parsed.flatMap((r) => (r.event === 'action' && typeof r.d.actionId === 'string' ? [r.d.actionId] : []));
  const notes = new Map(
    actionIds.length
      ? dbOf(sqlite)
          .select({ id: actions.id, note: actions.note })
          .from(actions)
          .where(inArray(actions.id, actionIds))
          .all()
          .map((a) => [a.id, a.note?.trim() || null])
      : [],
  );
  return parsed.map((r) => ({
    id: r.id,
    flagId: r.flagId,
    event: r.event,
    at: r.at.toISOString(),
    by: r.actorId && r.name ? { id: r.actorId, name: r.name } : null,
    text: words(r.event, r.severity, r.d, r.event === 'action' && typeof r.d.actionId === 'string' ? (notes.get(r.d.actionId) ?? null) : null),
  }));
}
