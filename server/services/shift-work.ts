import { randomUUID } from 'node:crypto';
import { and, desc, eq, sql } from 'drizzle-orm';
import { writeTx } from '../../db/client';
import { handoverPlans, infants, users } from '../../db/schema';
import type { BulkAssign, HandoverPlan } from '../../shared/schemas/shift-work';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { assignNurse, shiftSlot } from './admissions';
import type { Infant } from './infants';

type Db = AppContext['database']['db'];

/** The latest plan written for the infant in that shift, or null. */
function latestPlan(db: Db, infantId: string, shiftDate: string, shift: 'day' | 'night'): HandoverPlan | null {
  const row = db
    .select({ p: handoverPlans, by: users.name })
    .from(handoverPlans)
    .leftJoin(users, eq(users.id, handoverPlans.writtenBy))
    .where(and(eq(handoverPlans.infantId, infantId), eq(handoverPlans.shiftDate, shiftDate), eq(handoverPlans.shift, shift)))
    // sql fragment: the insertion order breaks a tie of created_at (two versions in one millisecond), and rowid is not a schema column.
    .orderBy(desc(handoverPlans.createdAt), desc(sql`${handoverPlans}.rowid`))
    .limit(1)
    .get();
  return row ? { infantId, shiftDate, shift, plan: row.p.plan, writtenBy: row.by, writtenAt: row.p.createdAt.toISOString() } : null;
}

/** The current shift's plan for one infant. */
export function currentPlan(ctx: AppContext, infant: Infant): HandoverPlan | null {
  const slot = shiftSlot(ctx, infant.unitId, 'current');
  return latestPlan(ctx.database.db, infant.id, slot.shiftDate, slot.shift);
}

/** The current shift's plans for every admitted infant of the unit that has one. */
export function unitPlans(ctx: AppContext, unitId: string): HandoverPlan[] {
  const slot = shiftSlot(ctx, unitId, 'current');
  const admitted = ctx.database.db
    .select({ id: infants.id })
    .from(infants)
    .where(and(eq(infants.unitId, unitId), eq(infants.status, 'admitted')))
    .all();
  return admitted.map((i) => latestPlan(ctx.database.db, i.id, slot.shiftDate, slot.shift)).filter((p): p is HandoverPlan => p !== null);
}

/** A new version of the infant's plan for the current shift (earlier versions stay). */
export function writePlan(ctx: AppContext, infant: Infant, plan: string, actorId: string): HandoverPlan {
  const now = ctx.clock.now();
  const slot = shiftSlot(ctx, infant.unitId, 'current');
  return writeTx(ctx.database.sqlite, () => {
    const id = randomUUID();
    ctx.database.db
      .insert(handoverPlans)
      .values({ id, unitId: infant.unitId, infantId: infant.id, shiftDate: slot.shiftDate, shift: slot.shift, plan, writtenBy: actorId, createdAt: now })
      .run();
    appendAudit(ctx.database.sqlite, {
      at: now,
      actorId,
      action: 'handover-plan-written',
      entityType: 'infant',
      entityId: infant.id,
      unitId: infant.unitId,
      after: { planId: id, shiftDate: slot.shiftDate, shift: slot.shift },
    });
    return latestPlan(ctx.database.db, infant.id, slot.shiftDate, slot.shift)!;
  });
}

/** Shift change: every nurse's infants assigned in one transaction (all or nothing). */
export function bulkAssign(ctx: AppContext, unitId: string, input: BulkAssign, actorId: string) {
  return writeTx(ctx.database.sqlite, () =>
    input.assignments.flatMap((a) => a.infantIds.map((infantId) => assignNurse(ctx, unitId, { infantId, nurseId: a.nurseId, shift: input.shift }, actorId))),
  );
}
