/**
 * The infant's record as the routes need it: one loader (the whole infants row, typed from the
 * schema), the lists of admitted infants (mine this shift, a unit's) in bed order, and the infant
 * detail the bedside form opens with.
 */
import type Database from 'better-sqlite3';
import { and, asc, desc, eq, inArray, isNotNull, notExists, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/sqlite-core';
import { drizzleOf, writeTx } from '../../db/client';
import { assignments, beds, infants, readings } from '../../db/schema';
import { shiftAt } from '../../shared/shifts';
import type { Flowsheet, InfantDetail } from '../../shared/types/bedside';
import { appendAudit } from '../audit';
import { ApiError, forbidden, notFound } from '../errors';
import { loadUnitRow, syncFlags } from './flags';
import { storedPlacement } from './placement';
import { perConnection } from './prepared-queries';
import { summarizeInfants } from './summaries';

export type Infant = typeof infants.$inferSelect;

/** Who is asking: the signed-in user and their units (from the session, never the request). */
export interface Actor {
  userId: string;
  unitIds: readonly string[];
}

/** 403 unless the user belongs to the unit (the access rule checked it already; this says so again). */
export function assertActorUnit(actor: Actor, unitId: string): void {
  if (!actor.unitIds.includes(unitId)) throw forbidden('This infant or record belongs to a unit you are not part of.');
}

// Prepared once per connection: every reading posted and every flowsheet read loads the infant (bench: durable writes >= 200/s, 72-h flowsheet >= 50 % of the baseline).
const infantQueries = perConnection((db) => ({
  byId: db
    .select()
    .from(infants)
    .where(eq(infants.id, sql.placeholder('id')))
    .prepare(),
}));

/** The infant, or 404. */
export function loadInfant(sqlite: Database.Database, infantId: string): Infant {
  const row = infantQueries(sqlite).byId.get({ id: infantId });
  if (!row) throw notFound('That infant');
  return row;
}

/** The infant, or 404; then 403 unless the actor belongs to its unit. */
export function loadInfantFor(sqlite: Database.Database, actor: Actor, infantId: string): Infant {
  const infant = loadInfant(sqlite, infantId);
  assertActorUnit(actor, infant.unitId);
  return infant;
}

export function requireAdmitted(infant: Pick<Infant, 'status'>): void {
  if (infant.status !== 'admitted') throw new ApiError(409, 'conflict', 'This infant has been discharged; the chart is closed.');
}

/** When, why and where to the infant left; null while admitted. */
export function dischargeOf(sqlite: Database.Database, infantId: string): Flowsheet['discharge'] {
  const row = drizzleOf(sqlite)
    .select({ at: infants.dischargedAt, reason: infants.dischargeReason, destination: infants.dischargeDestination })
    .from(infants)
    .where(eq(infants.id, infantId))
    .get();
  return row?.at ? { at: row.at.toISOString(), reason: row.reason, destination: row.destination } : null;
}

/** These infants' ids in bed order: unit, the bed's place, its label, then the name. */
function inBedOrder(sqlite: Database.Database, where: ReturnType<typeof and>): string[] {
  return drizzleOf(sqlite)
    .select({ id: infants.id })
    .from(infants)
    .leftJoin(beds, eq(beds.id, infants.bedId))
    .where(where)
    .orderBy(asc(infants.unitId), asc(beds.sortOrder), asc(beds.label), asc(infants.displayName))
    .all()
    .map((r) => r.id);
}

/** The admitted infants assigned to the user for each unit's current shift (the latest assignment row wins), in bed order. */
export function myInfantIds(sqlite: Database.Database, actor: Actor, now: Date): string[] {
  const db = drizzleOf(sqlite);
  const ids: string[] = [];
  for (const unitId of actor.unitIds) {
    const unit = loadUnitRow(sqlite, unitId);
    if (!unit) continue;
    const slot = shiftAt(now, { dayShiftStart: unit.dayShiftStart, nightShiftStart: unit.nightShiftStart, timeZone: unit.timeZone });
    const rows = db
      .select({ infantId: assignments.infantId, nurseId: assignments.nurseId })
      .from(assignments)
      .innerJoin(infants, eq(infants.id, assignments.infantId))
      .where(and(eq(assignments.unitId, unitId), eq(assignments.shiftDate, slot.shiftDate), eq(assignments.shift, slot.shift), eq(infants.status, 'admitted')))
      .orderBy(asc(assignments.createdAt), asc(assignments.id))
      .all();
    const latest = new Map<string, string>();
    for (const r of rows) latest.set(r.infantId, r.nurseId);
    for (const [infantId, nurseId] of latest) if (nurseId === actor.userId) ids.push(infantId);
  }
  return ids.length === 0 ? ids : inBedOrder(sqlite, and(inArray(infants.id, ids)));
}

/** Every admitted infant of these units, in bed order. */
export function admittedInfantIds(sqlite: Database.Database, unitIds: readonly string[]): string[] {
  if (unitIds.length === 0) return [];
  return inBedOrder(sqlite, and(inArray(infants.unitId, [...unitIds]), eq(infants.status, 'admitted')));
}

/** The remote site of the infant's latest current reading that charted one (the form's default). */
function lastRemoteSite(sqlite: Database.Database, infantId: string): InfantDetail['defaults']['remoteSite'] {
  const db = drizzleOf(sqlite);
  const newer = alias(readings, 'newer');
  const row = db
    .select({ remoteSite: readings.remoteSite })
    .from(readings)
    .where(
      and(
        eq(readings.infantId, infantId),
        isNotNull(readings.remoteSite),
        eq(readings.enteredInError, false),
        notExists(db.select({ id: newer.id }).from(newer).where(eq(newer.replacesId, readings.id))),
      ),
    )
    .orderBy(desc(readings.takenAt), desc(readings.recordedAt))
    .limit(1)
    .get();
  return row?.remoteSite ?? null;
}

/**
 * The infant's summary with what the bedside form opens with; the read is audited in the same
 * transaction as the rules' catch-up (only time has passed, so they run from now).
 */
export function infantDetail(sqlite: Database.Database, infant: Infant, actorId: string, now: Date): InfantDetail {
  const unit = loadUnitRow(sqlite, infant.unitId)!;
  writeTx(sqlite, () => {
    // Only time has passed: the rules need only run from now (syncFlags widens this as needed).
    if (infant.status === 'admitted') syncFlags(sqlite, infant.id, now, null, { from: now.getTime() });
    appendAudit(sqlite, { at: now, actorId, action: 'chart-read', entityType: 'infant', entityId: infant.id, unitId: infant.unitId, after: { view: 'summary' } });
  });
  const [summary] = summarizeInfants(sqlite, [infant.id], now);
  const placement = storedPlacement(sqlite, infant.id);
  return {
    infant: summary!,
    birthAt: infant.birthAt.toISOString(),
    birthWeightGrams: infant.birthWeightGrams,
    admittedAt: infant.admittedAt.toISOString(),
    unitName: unit.name,
    timeZone: unit.timeZone,
    defaults: {
      controlMode: summary!.controlMode,
      setCenti: summary!.setCenti,
      remoteSite: lastRemoteSite(sqlite, infant.id),
      placement: placement ? { probeSite: placement.probeSite, probeCovered: placement.probeCovered, position: placement.position, prompt: placement.prompt?.code ?? null } : null,
    },
    discharge: infant.status === 'discharged' ? dischargeOf(sqlite, infant.id) : null,
  };
}
