import { randomUUID } from 'node:crypto';
import { and, desc, eq, sql } from 'drizzle-orm';
import { writeTx } from '../../db/client';
import { bedWarmings, beds, infants, users } from '../../db/schema';
import type { BedWarming, StartWarming } from '../../shared/schemas/warming';
import { toCentiCelsius } from '../../shared/thermal';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { badRequest, conflict, notFound } from '../errors';

type Db = AppContext['database']['db'];

/** The bed's warming now: its latest row, when that row started one; else null. */
export function currentWarming(db: Db, bedId: string): BedWarming | null {
  const row = db
    .select({ w: bedWarmings, by: users.name })
    .from(bedWarmings)
    .leftJoin(users, eq(users.id, bedWarmings.recordedBy))
    .where(eq(bedWarmings.bedId, bedId))
    // Rows written in the same millisecond keep their order of insertion.
    .orderBy(desc(bedWarmings.createdAt), desc(sql`${bedWarmings}.rowid`))
    .limit(1)
    .get();
  if (!row || row.w.event !== 'started' || !row.w.heatSource || !row.w.controlMode || row.w.setCenti === null || !row.w.since) return null;
  return {
    id: row.w.id,
    bedId: row.w.bedId,
    heatSource: row.w.heatSource,
    controlMode: row.w.controlMode,
    setCenti: row.w.setCenti,
    since: row.w.since.toISOString(),
    expectedInfant: row.w.expectedInfant,
    startedBy: row.by,
  };
}

/** Every bed of the unit being warmed now, by bed. */
export function unitWarmings(ctx: AppContext, unitId: string): BedWarming[] {
  const { db } = ctx.database;
  const unitBeds = db
    .select({ id: beds.id })
    .from(beds)
    .where(and(eq(beds.unitId, unitId), eq(beds.active, true)))
    .all();
  return unitBeds.map((b) => currentWarming(db, b.id)).filter((w): w is BedWarming => w !== null);
}

function requireEmptyBed(ctx: AppContext, unitId: string, bedId: string): { id: string; label: string } {
  const { db } = ctx.database;
  const bed = db
    .select({ id: beds.id, label: beds.label, active: beds.active })
    .from(beds)
    .where(and(eq(beds.id, bedId), eq(beds.unitId, unitId)))
    .get();
  if (!bed || !bed.active) throw notFound('That bed');
  const occupant = db
    .select({ name: infants.displayName })
    .from(infants)
    .where(and(eq(infants.bedId, bedId), eq(infants.status, 'admitted')))
    .get();
  if (occupant) throw conflict(`Bed ${bed.label} has ${occupant.name}: only an empty bed is warmed for an admission.`, { bedId: `Bed ${bed.label} is not empty.` });
  return bed;
}

/** The charge nurse marks an empty bed as warming for the next admission (a new row; a running warming is replaced). */
export function startWarming(ctx: AppContext, unitId: string, bedId: string, input: StartWarming, actorId: string): BedWarming {
  const now = ctx.clock.now();
  const since = input.since ? new Date(Date.parse(input.since)) : now;
  if (since.getTime() > now.getTime() + 5 * 60_000) throw badRequest('The warming cannot start in the future.', { since: 'This time is in the future.' });
  if (since.getTime() < now.getTime() - 24 * 3_600_000) throw badRequest('Check when the warming started.', { since: 'This is more than a day ago.' });
  const setCenti = toCentiCelsius(input.setTemperature, input.tempUnit, 'setTemperature');
  return writeTx(ctx.database.sqlite, () => {
    const bed = requireEmptyBed(ctx, unitId, bedId);
    const id = randomUUID();
    ctx.database.db
      .insert(bedWarmings)
      .values({
        id,
        unitId,
        bedId: bed.id,
        event: 'started',
        heatSource: input.heatSource,
        controlMode: input.controlMode,
        setCenti,
        since,
        expectedInfant: input.expectedInfant || null,
        enteredUnit: input.tempUnit,
        recordedBy: actorId,
        createdAt: now,
      })
      .run();
    appendAudit(ctx.database.sqlite, {
      at: now,
      actorId,
      action: 'bed-warming-started',
      entityType: 'bed',
      entityId: bed.id,
      unitId,
      after: { warmingId: id, bedLabel: bed.label, ...input, setCenti },
    });
    return currentWarming(ctx.database.db, bed.id)!;
  });
}

/** Stop a bed's warming (nobody came, or the plan changed). */
export function stopWarming(ctx: AppContext, unitId: string, bedId: string, actorId: string): void {
  const now = ctx.clock.now();
  writeTx(ctx.database.sqlite, () => {
    const bed = ctx.database.db
      .select({ id: beds.id, label: beds.label })
      .from(beds)
      .where(and(eq(beds.id, bedId), eq(beds.unitId, unitId)))
      .get();
    if (!bed) throw notFound('That bed');
    const warming = currentWarming(ctx.database.db, bed.id);
    if (!warming) throw conflict(`Bed ${bed.label} is not being warmed.`);
    ctx.database.db.insert(bedWarmings).values({ id: randomUUID(), unitId, bedId: bed.id, event: 'ended', endReason: 'stopped', recordedBy: actorId, createdAt: now }).run();
    appendAudit(ctx.database.sqlite, { at: now, actorId, action: 'bed-warming-stopped', entityType: 'bed', entityId: bed.id, unitId, before: { warmingId: warming.id } });
  });
}

/**
 * Inside an admission's transaction: the infant admitted into a warmed bed ends its warming and
 * names the infant; returns the warming that was running (its settings went into the admission).
 */
export function endWarmingOnAdmission(ctx: AppContext, unitId: string, bedId: string, infantId: string, actorId: string, at: Date): BedWarming | null {
  const warming = currentWarming(ctx.database.db, bedId);
  if (!warming) return null;
  ctx.database.db.insert(bedWarmings).values({ id: randomUUID(), unitId, bedId, event: 'ended', endReason: 'admitted', infantId, recordedBy: actorId, createdAt: at }).run();
  return warming;
}
