import type Database from 'better-sqlite3';
import { writeTx } from '../db/client';
import { appendAudit, type AuditInput } from './audit';

interface Waiting {
  input: AuditInput;
  resolve: () => void;
  reject: (err: unknown) => void;
}

const queues = new WeakMap<Database.Database, { pending: Waiting[]; scheduled: boolean }>();

/**
 * Record a chart read in the audit trail, committed before the caller answers, as before; but
 * reads that arrive together share one transaction and so one fsync (group commit). Under
 * synchronous=FULL the fsync, not the insert, is what a read costs; with a busy board, dozens of
 * reads now commit for the price of one. The chain stays in commit order, as appendAudit needs.
 */
export function auditRead(sqlite: Database.Database, input: AuditInput): Promise<void> {
  let queue = queues.get(sqlite);
  if (!queue) {
    queue = { pending: [], scheduled: false };
    queues.set(sqlite, queue);
  }
  const q = queue;
  return new Promise<void>((resolve, reject) => {
    q.pending.push({ input, resolve, reject });
    if (q.scheduled) return;
    q.scheduled = true;
    // setImmediate: after this turn's other requests have been parsed and queued.
    setImmediate(() => {
      q.scheduled = false;
      const batch = q.pending.splice(0);
      try {
        writeTx(sqlite, () => {
          for (const w of batch) appendAudit(sqlite, w.input);
        });
      } catch (err) {
        for (const w of batch) w.reject(err);
        return;
      }
      for (const w of batch) w.resolve();
    });
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
