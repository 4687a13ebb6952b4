import type Database from 'better-sqlite3';
import { writeTx } from '../db/client';

type Outcome = { ok: true; value: unknown } | { ok: false; error: unknown };

interface Job {
  run: () => unknown;
  resolve: (value: unknown) => void;
  reject: (err: unknown) => void;
}

const queues = new WeakMap<Database.Database, { pending: Job[]; scheduled: boolean }>();

/**
 * Run `fn` as a write transaction of its own, as writeTx does, and settle once it is durable;
 * but writes that arrive together share one BEGIN IMMEDIATE … COMMIT and so one fsync (group
 * commit). Under synchronous=FULL the fsync, not the insert, is what a write costs.
 *
 * Kept for one budget: chart reads are audited before they answer (server/read-audit.ts), and
 * `npm run bench` measured the board at 39 % and the 72-h flowsheet at 36 % of the bare route
 * without this queue, against 60 % and 54 % with it (budget: 50 %). Readings and sign-ins do
 * not use it: their writes measured 330/s without it against a 200/s budget, so they commit
 * with writeTx directly.
 *
 * Each `fn` runs in its own SAVEPOINT (a nested better-sqlite3 transaction), in arrival order:
 * it sees the writes queued before it, and when it throws only its own changes are rolled back
 * and only its caller gets the error; the others still commit. Nothing settles before the COMMIT
 * returns, so an answer never claims a write a crash could lose; if the COMMIT fails, every
 * caller in the batch gets the error. The audit chain stays in commit order, because the
 * batch's appendAudit calls run one after another inside the one transaction. The row ledger's
 * events (server/ledger.ts) are written by triggers inside each job's savepoint, so a job that
 * throws takes its row events with it and needs no hook here.
 *
 * `fn` must be synchronous and must not await: it runs later, in the batch, not at the call.
 */
export function batchedWrite<T>(sqlite: Database.Database, fn: () => T): Promise<T> {
  let queue = queues.get(sqlite);
  if (!queue) {
    queue = { pending: [], scheduled: false };
    queues.set(sqlite, queue);
  }
  const q = queue;
  return new Promise<T>((resolve, reject) => {
    q.pending.push({ run: fn, resolve: resolve as (value: unknown) => void, reject });
    if (q.scheduled) return;
    q.scheduled = true;
    // setImmediate: after this turn's other requests have been parsed and queued.
    setImmediate(() => {
      q.scheduled = false;
      const batch = q.pending.splice(0);
      const outcomes: Outcome[] = [];
      try {
        writeTx(sqlite, () => {
          for (const job of batch) {
            try {
              // Nested inside writeTx, a better-sqlite3 transaction is a SAVEPOINT.
              outcomes.push({ ok: true, value: sqlite.transaction(job.run)() });
            } catch (error) {
              outcomes.push({ ok: false, error });
            }
          }
        });
      } catch (err) {
        for (const job of batch) job.reject(err);
        return;
      }
      batch.forEach((job, i) => {
        const outcome = outcomes[i]!;
        if (outcome.ok) job.resolve(outcome.value);
        else job.reject(outcome.error);
      });
    });
  });
}
