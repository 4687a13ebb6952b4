import type Database from 'better-sqlite3';
import { appendAudit, type AuditInput } from './audit';
import { batchedWrite } from './write-batch';

/**
 * Record a chart read in the audit trail, committed before the caller answers; reads that arrive
 * together share one transaction and so one fsync (the group commit of server/write-batch.ts).
 * Kept for the read budgets of `npm run bench`: see the comment in write-batch.ts.
 */
export function auditRead(sqlite: Database.Database, input: AuditInput): Promise<void> {
  return batchedWrite(sqlite, () => {
    appendAudit(sqlite, input);
  });
}

/** What a list answer returned: each infant with its unit. */
export interface ListedInfant {
  infantId: string;
  unitId: string;
}

/**
 * Record that a list answer (My infants, the unit's infants, the board, the review queue…) showed
 * these infants: one 'list-read' event per unit, naming the infants of that unit in the order
 * shown, plus the view and the filter asked for. An answer that showed no infant writes nothing.
 * Group-committed with the other reads in flight (auditRead); await it before answering.
 */
export async function auditListRead(
  sqlite: Database.Database,
  read: { at: Date; actorId: string; view: string; infants: readonly ListedInfant[]; filter?: Record<string, unknown> },
): Promise<void> {
  const byUnit = new Map<string, string[]>();
  for (const { infantId, unitId } of read.infants) {
    const ids = byUnit.get(unitId) ?? [];
    if (!ids.includes(infantId)) ids.push(infantId);
    byUnit.set(unitId, ids);
  }
  await Promise.all(
    [...byUnit].map(([unitId, infantIds]) =>
      auditRead(sqlite, {
        at: read.at,
        actorId: read.actorId,
        action: 'list-read',
        entityType: 'infant-list',
        entityId: null,
        unitId,
        after: { view: read.view, infantIds, ...(read.filter ? { filter: read.filter } : {}) },
      }),
    ),
  );
}
