import { randomUUID } from 'node:crypto';
import { and, asc, desc, eq, inArray, isNotNull, isNull, sql } from 'drizzle-orm';
import { writeTx } from '../../db/client';
import type { z } from 'zod';
import type { AdmitInfant, AssignNurseInput, updateInfantSchema, DischargeInfant } from '../../shared/schemas/unit';
import { nextShift, shiftAt, type ShiftSlot } from '../../shared/shifts';
import { toCentiCelsius } from '../../shared/thermal';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { badRequest, conflict, notFound } from '../errors';
import { assignments, beds, flagResolutions, flags, infants, readings, userUnits, users } from '../../db/schema';
import { appendFlagEvent } from './flag-lifecycle';
import { refreshPlacement } from './placement';
import { recordBedStay } from './bed-stays';
import { endWarmingOnAdmission } from './bed-warming';
import { loadUnitRow, syncFlags } from './flags';
import type { Infant } from './infants';

/** A bed that is active, in the unit and has no admitted infant on it; otherwise a 400 or 409 naming `bedId`. */
function requireEmptyBed(ctx: AppContext, unitId: string, bedId: string): { id: string; label: string } {
  const { db } = ctx.database;
  const bed = db
    .select({ id: beds.id, label: beds.label })
    .from(beds)
    .where(and(eq(beds.id, bedId), eq(beds.unitId, unitId), eq(beds.active, true)))
    .get();
  if (!bed) throw badRequest('Choose a bed in this unit.', { bedId: 'This bed is not in this unit.' });
  const occupant = db
    .select({ displayName: infants.displayName })
    .from(infants)
    .where(and(eq(infants.bedId, bedId), eq(infants.status, 'admitted')))
    .get();
  if (occupant) throw conflict(`Bed ${bed.label} is taken.`, { bedId: `Bed ${bed.label} already has ${occupant.displayName}.` });
  return bed;
}

export function admitInfant(ctx: AppContext, unitId: string, input: AdmitInfant, actorId: string): { id: string } {
  const { sqlite } = ctx.database;
  const now = ctx.clock.now();
  if (Date.parse(input.birthAt) > now.getTime() + 5 * 60_000) throw badRequest('The birth cannot be in the future.', { birthAt: 'The time of birth is in the future.' });
  // Admission is now: a birth after it is in the future (above); one over a year before is a typing slip on a neonatal unit.
  if (Date.parse(input.birthAt) < now.getTime() - 366 * 86_400_000) throw badRequest('Check the date of birth.', { birthAt: 'The birth is more than a year before admission.' });
  const setCenti = toCentiCelsius(input.setTemperature, input.tempUnit, 'setTemperature');
  return writeTx(sqlite, () => {
    const bed = requireEmptyBed(ctx, unitId, input.bedId);
    const id = randomUUID();
    ctx.database.db
      .insert(infants)
      .values({
        id,
        unitId,
        bedId: bed.id,
        displayName: input.displayName,
        birthAt: new Date(Date.parse(input.birthAt)),
        gestationWeeks: input.gestationWeeks,
        gestationDays: input.gestationDays,
        birthWeightGrams: input.birthWeightGrams,
        weightGrams: input.birthWeightGrams,
        heatSource: input.heatSource,
        status: 'admitted',
        admittedAt: now,
        hospitalNumber: input.hospitalNumber ?? null,
        sex: input.sex ?? null,
      })
      .run();
    recordBedStay(ctx.database.db, { id: randomUUID(), infantId: id, unitId, bedId: bed.id, event: 'admitted', at: now, recordedBy: actorId });
    // A bed warmed for this admission stops being "warming": it now holds the infant.
    const warming = endWarmingOnAdmission(ctx, unitId, bed.id, id, actorId, now);
    // The initial settings (with the probe's place) are charted as the first reading, so the
    // flowsheet and rules see them; the placement carries forward from it.
    const readingId = randomUUID();
    ctx.database.db
      .insert(readings)
      .values({
        id: readingId,
        infantId: id,
        unitId,
        takenAt: now,
        recordedAt: now,
        recordedBy: actorId,
        setCenti,
        controlMode: input.controlMode,
        heatSigns: '[]',
        note: 'Settings on admission.',
        enteredUnit: input.tempUnit,
        probeSite: input.probeSite ?? null,
        probeCovered: input.probeCovered ?? null,
        infantPosition: input.position ?? null,
      })
      .run();
    refreshPlacement(sqlite, id, unitId, now);
    appendAudit(sqlite, {
      at: now,
      actorId,
      action: 'infant-admitted',
      entityType: 'infant',
      entityId: id,
      unitId,
      after: { ...input, bedLabel: bed.label, setCenti, initialReadingId: readingId, ...(warming ? { warmingId: warming.id } : {}) },
    });
    syncFlags(sqlite, id, now, actorId);
    return { id };
  });
}

export function moveInfant(ctx: AppContext, infant: Infant, bedId: string, actorId: string): { bedId: string; bedLabel: string } {
  const { sqlite } = ctx.database;
  const now = ctx.clock.now();
  if (infant.status !== 'admitted') throw conflict('This infant has been discharged.');
  return writeTx(sqlite, () => {
    const bed = requireEmptyBed(ctx, infant.unitId, bedId);
    ctx.database.db.update(infants).set({ bedId: bed.id }).where(eq(infants.id, infant.id)).run();
    recordBedStay(ctx.database.db, { id: randomUUID(), infantId: infant.id, unitId: infant.unitId, bedId: bed.id, event: 'moved', at: now, recordedBy: actorId });
    appendAudit(sqlite, {
      at: now,
      actorId,
      action: 'infant-moved',
      entityType: 'infant',
      entityId: infant.id,
      unitId: infant.unitId,
      before: { bedId: infant.bedId },
      after: { bedId: bed.id },
    });
    return { bedId: bed.id, bedLabel: bed.label };
  });
}

export function updateInfant(
  ctx: AppContext,
  infant: Infant,
  input: z.output<typeof updateInfantSchema>,
  actorId: string,
): { id: string; heatSource: Infant['heatSource']; weightGrams: number } {
  const { sqlite } = ctx.database;
  const now = ctx.clock.now();
  if (infant.status !== 'admitted') throw conflict('This infant has been discharged.');
  const after = { heatSource: input.heatSource ?? infant.heatSource, weightGrams: input.weightGrams ?? infant.weightGrams };
  writeTx(sqlite, () => {
    ctx.database.db.update(infants).set(after).where(eq(infants.id, infant.id)).run();
    appendAudit(sqlite, {
      at: now,
      actorId,
      action: 'infant-updated',
      entityType: 'infant',
      entityId: infant.id,
      unitId: infant.unitId,
      before: { heatSource: infant.heatSource, weightGrams: infant.weightGrams },
      after,
    });
  });
  return { id: infant.id, ...after };
}

/**
 * The infant stays in the record; the bed is freed; the discharge's reason and destination are
 * kept on the infant's row; every open flag closes with the discharge as its stated reason (a
 * resolution `discharged` and a `closed` lifecycle event saying so). Answers with the flags it
 * closed, so the screen can say which.
 */
export function dischargeInfant(
  ctx: AppContext,
  infant: Infant,
  input: DischargeInfant,
  actorId: string,
): { closedFlags: number; closed: { id: string; kind: string }[]; discharge: { at: string; reason: string; destination: string | null } } {
  const { sqlite, db } = ctx.database;
  const now = ctx.clock.now();
  if (infant.status !== 'admitted') throw conflict('This infant has already been discharged.');
  const destination = input.destination?.trim() || null;
  return writeTx(sqlite, () => {
    // Store what the rules say up to the discharge first, so the record is complete.
    syncFlags(sqlite, infant.id, now, actorId);
    db.update(infants)
      .set({ status: 'discharged', dischargedAt: now, bedId: null, dischargeReason: input.reason, dischargeDestination: destination, dischargeNote: input.note?.trim() || null })
      .where(eq(infants.id, infant.id))
      .run();
    recordBedStay(ctx.database.db, { id: randomUUID(), infantId: infant.id, unitId: infant.unitId, bedId: null, event: 'discharged', at: now, recordedBy: actorId });
    const open = db
      .select({ id: flags.id, key: flags.key, kind: flags.kind })
      .from(flags)
      .leftJoin(flagResolutions, eq(flagResolutions.flagId, flags.id))
      .where(and(eq(flags.infantId, infant.id), isNull(flagResolutions.flagId)))
      .orderBy(asc(flags.raisedAt), asc(flags.key))
      .all();
    for (const f of open) {
      db.insert(flagResolutions).values({ flagId: f.id, closedAt: now, closedByReadingId: null, how: 'discharged', createdAt: now }).run();
      appendFlagEvent(db, {
        flagId: f.id,
        infantId: infant.id,
        unitId: infant.unitId,
        event: 'closed',
        at: now,
        actorId,
        detail: { how: 'discharged', reason: 'discharged', dischargeReason: input.reason },
        now,
      });
      appendAudit(sqlite, {
        at: now,
        actorId,
        action: 'flag-closed',
        entityType: 'flag',
        entityId: f.id,
        unitId: infant.unitId,
        after: { key: f.key, how: 'discharged', reason: 'discharged' },
      });
    }
    appendAudit(sqlite, {
      at: now,
      actorId,
      action: 'infant-discharged',
      entityType: 'infant',
      entityId: infant.id,
      unitId: infant.unitId,
      before: { status: 'admitted', bedId: infant.bedId },
      after: { status: 'discharged', reason: input.reason, destination, note: input.note ?? null, closedFlagIds: open.map((f) => f.id) },
    });
    return {
      closedFlags: open.length,
      closed: open.map((f) => ({ id: f.id, kind: f.kind })),
      discharge: { at: now.toISOString(), reason: input.reason, destination },
    };
  });
}

export function shiftSlot(ctx: AppContext, unitId: string, which: 'current' | 'next'): ShiftSlot {
  const unit = loadUnitRow(ctx.database.sqlite, unitId);
  if (!unit) throw notFound('That unit');
  const times = { dayShiftStart: unit.dayShiftStart, nightShiftStart: unit.nightShiftStart, timeZone: unit.timeZone };
  const current = shiftAt(ctx.clock.now(), times);
  return which === 'next' ? nextShift(current, times) : current;
}

/** Who can be assigned infants in the unit: its active nurses and charge nurses who have signed in (a password set). */
function assignable(unitId: string) {
  return and(eq(userUnits.unitId, unitId), eq(users.active, true), isNotNull(users.passwordHash), inArray(users.role, ['nurse', 'charge']));
}

export function listAssignableNurses(ctx: AppContext, unitId: string): { id: string; name: string; role: string }[] {
  return ctx.database.db
    .select({ id: users.id, name: users.name, role: users.role })
    .from(users)
    .innerJoin(userUnits, eq(userUnits.userId, users.id))
    .where(assignable(unitId))
    .orderBy(asc(users.name))
    .all();
}

/** A new assignment row for the shift; the latest row for (infant, shift) is the one that counts. */
export function assignNurse(ctx: AppContext, unitId: string, input: Required<AssignNurseInput>, actorId: string) {
  const { sqlite } = ctx.database;
  const now = ctx.clock.now();
  const slot = shiftSlot(ctx, unitId, input.shift);
  return writeTx(sqlite, () => {
    const { db } = ctx.database;
    const infant = db
      .select({ id: infants.id })
      .from(infants)
      .where(and(eq(infants.id, input.infantId), eq(infants.unitId, unitId), eq(infants.status, 'admitted')))
      .get();
    if (!infant) throw badRequest('Choose an infant admitted to this unit.', { infantId: 'No infant with this id is admitted to this unit.' });
    const nurse = db
      .select({ id: users.id, name: users.name })
      .from(users)
      .innerJoin(userUnits, eq(userUnits.userId, users.id))
      .where(and(eq(users.id, input.nurseId), assignable(unitId)))
      .get();
    if (!nurse) throw badRequest('Choose a nurse of this unit.', { nurseId: 'This person is not a nurse of this unit.' });
    const before = db
      .select({ nurseId: assignments.nurseId })
      .from(assignments)
      .where(and(eq(assignments.infantId, input.infantId), eq(assignments.shiftDate, slot.shiftDate), eq(assignments.shift, slot.shift)))
      // sql fragment: the insertion order breaks a tie of created_at (two rows in one millisecond), and rowid is not a schema column.
      .orderBy(desc(assignments.createdAt), desc(sql`${assignments}.rowid`))
      .limit(1)
      .get();
    const id = randomUUID();
    db.insert(assignments)
      .values({ id, unitId, infantId: input.infantId, nurseId: nurse.id, shiftDate: slot.shiftDate, shift: slot.shift, createdBy: actorId, createdAt: now })
      .run();
    appendAudit(sqlite, {
      at: now,
      actorId,
      action: 'nurse-assigned',
      entityType: 'assignment',
      entityId: id,
      unitId,
      before: before ? { nurseId: before.nurseId } : null,
      after: { infantId: input.infantId, nurseId: nurse.id, shiftDate: slot.shiftDate, shift: slot.shift },
    });
    return {
      id,
      infantId: input.infantId,
      nurse,
      shiftDate: slot.shiftDate,
      shift: slot.shift,
      startsAt: slot.startsAt.toISOString(),
      endsAt: slot.endsAt.toISOString(),
    };
  });
}
