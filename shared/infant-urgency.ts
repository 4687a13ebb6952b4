/**
 * The order of a nurse's infants by urgency, from what the server stored and sent (the open
 * flags' severities and the check clocks in `InfantSummary`); nothing here runs the rules.
 * First the most severe open flag (critical, then urgent, then caution, then none), then the
 * check clock: overdue (longest overdue first), never checked, then the soonest due; then the bed.
 */
import type { InfantSummary } from './types/bedside';
import { SEVERITY_RANK, type Severity } from './thermal/severity';

type UrgencyFields = Pick<InfantSummary, 'openFlags' | 'nextCheck' | 'bedLabel' | 'displayName'> & Partial<Pick<InfantSummary, 'attention' | 'checks'>>;

/** The most severe stored severity among the open flags, as a number (0 for none). */
export function severityRankOf(infant: UrgencyFields): number {
  let rank = infant.attention?.severity ? SEVERITY_RANK[infant.attention.severity] : 0;
  for (const f of infant.openFlags) rank = Math.max(rank, SEVERITY_RANK[(f.severity ?? 'urgent') as Severity]);
  return rank;
}

const CLOCK_ORDER = { overdue: 0, never: 1, 'due-soon': 2, ok: 2 } as const;

function clockKey(infant: UrgencyFields): [number, number] {
  const next = infant.checks?.next ?? infant.nextCheck;
  const due = next.dueAt ? Date.parse(next.dueAt) : Number.POSITIVE_INFINITY;
  return [CLOCK_ORDER[next.status], due];
}

const beds = new Intl.Collator('en', { numeric: true, sensitivity: 'base' });

export function compareByUrgency(a: UrgencyFields, b: UrgencyFields): number {
  const severity = severityRankOf(b) - severityRankOf(a);
  if (severity !== 0) return severity;
  const [ao, ad] = clockKey(a);
  const [bo, bd] = clockKey(b);
  if (ao !== bo) return ao - bo;
  if (ad !== bd) return ad < bd ? -1 : 1;
  if (a.bedLabel !== b.bedLabel) {
    if (a.bedLabel === null) return 1;
    if (b.bedLabel === null) return -1;
    return beds.compare(a.bedLabel, b.bedLabel);
  }
  return beds.compare(a.displayName, b.displayName);
}

/** A sorted copy. */
export function byUrgency<T extends UrgencyFields>(infants: readonly T[]): T[] {
  return [...infants].sort(compareByUrgency);
}
