import Papa from 'papaparse';
import { and, asc, desc, eq, gte, isNull, or, sql } from 'drizzle-orm';
import { writeTx } from '../../db/client';
import { assignments, beds, infants, readings, skinToSkinSessions, units, users } from '../../db/schema';
import { shiftAt } from '../../shared/shifts';
import { currentReadings, fromCentiCelsius, type TempUnit } from '../../shared/thermal';
import type { HandoverInfant, HandoverReading, HandoverResponse } from '../../shared/types/board';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { forbidden, notFound } from '../errors';
import { readClocks, type StoredLatest } from './flag-lifecycle';
import { loadInfantState } from './flags';
import { viewerPrefs } from './review';
import { storedFlowsheetFlags, summarizeInfants } from './summaries';

export const HANDOVER_HOURS = 12;

// sql fragment: rowid (the order rows were stored in) breaks a tie of created_at; Drizzle has no column for it.
const storedOrder = sql`${assignments}.rowid`;

const iso = (d: Date | null) => (d === null ? null : d.toISOString());

function shiftTimes(ctx: AppContext, unitId: string) {
  return ctx.database.db
    .select({ dayShiftStart: units.dayShiftStart, nightShiftStart: units.nightShiftStart, timeZone: units.timeZone })
    .from(units)
    .where(eq(units.id, unitId))
    .get();
}

/** One infant's last 12 hours: current readings, flags with their actions, sessions, settings and the next check. */
function buildHandover(ctx: AppContext, infantId: string, now: Date): { unitId: string; handover: HandoverInfant } | null {
  const { sqlite, db } = ctx.database;
  const infant = db
    .select({
      id: infants.id,
      unitId: infants.unitId,
      displayName: infants.displayName,
      bedLabel: beds.label,
      gestationWeeks: infants.gestationWeeks,
      gestationDays: infants.gestationDays,
      weightGrams: infants.weightGrams,
      birthAt: infants.birthAt,
      heatSource: infants.heatSource,
      status: infants.status,
    })
    .from(infants)
    .leftJoin(beds, eq(beds.id, infants.bedId))
    .where(eq(infants.id, infantId))
    .get();
  if (!infant) return null;
  const unit = shiftTimes(ctx, infant.unitId)!;
  const from = now.getTime() - HANDOVER_HOURS * 3_600_000;
  const state = loadInfantState(sqlite, infantId);
  // What the last evaluation stored: the views never evaluate the rules again.
  const [summary] = summarizeInfants(sqlite, [infantId], now);
  const clock = readClocks(db, infantId);
  const latest: Partial<StoredLatest> = clock ? (JSON.parse(clock.latest) as StoredLatest) : {};

  const extras = new Map(
    db
      .select({ id: readings.id, note: readings.note, byName: users.name })
      .from(readings)
      .innerJoin(users, eq(users.id, readings.recordedBy))
      .where(and(eq(readings.infantId, infantId), gte(readings.takenAt, new Date(from))))
      .all()
      .map((r) => [r.id, r]),
  );
  const current: HandoverReading[] = currentReadings(state.readings)
    .filter((r) => r.takenAt.getTime() >= from && r.takenAt.getTime() <= now.getTime())
    .map((r) => {
      const extra = extras.get(r.id);
      return {
        id: r.id,
        takenAt: r.takenAt.toISOString(),
        probeCenti: r.probeCenti,
        remoteCenti: r.remoteCenti,
        remoteSite: r.remoteSite,
        airCenti: r.airCenti,
        setCenti: r.setCenti,
        controlMode: r.controlMode,
        heaterOutputPct: r.heaterOutputPct,
        heartRate: r.heartRate,
        heatSigns: [...r.heatSigns],
        note: extra?.note ?? null,
        recordedBy: extra?.byName ?? '',
        corrects: r.replacesId !== null,
      };
    });

  const flagRows = storedFlowsheetFlags(sqlite, infantId, from, now).reverse();

  const sessions = db
    .select({
      id: skinToSkinSessions.id,
      startedAt: skinToSkinSessions.startedAt,
      endedAt: skinToSkinSessions.endedAt,
      referenceCenti: skinToSkinSessions.referenceCenti,
      limitCenti: skinToSkinSessions.limitCenti,
      carer: skinToSkinSessions.carer,
    })
    .from(skinToSkinSessions)
    .where(and(eq(skinToSkinSessions.infantId, infantId), or(isNull(skinToSkinSessions.endedAt), gte(skinToSkinSessions.endedAt, new Date(from)))))
    .orderBy(asc(skinToSkinSessions.startedAt))
    .all();

  const slot = shiftAt(now, unit);
  const nurse = db
    .select({ id: users.id, name: users.name })
    .from(assignments)
    .innerJoin(users, eq(users.id, assignments.nurseId))
    .where(and(eq(assignments.infantId, infantId), eq(assignments.shiftDate, slot.shiftDate), eq(assignments.shift, slot.shift)))
    .orderBy(desc(assignments.createdAt), desc(storedOrder))
    .limit(1)
    .get();

  const handover: HandoverInfant = {
    infant: {
      id: infant.id,
      displayName: infant.displayName,
      bedLabel: infant.bedLabel,
      gestationWeeks: infant.gestationWeeks,
      gestationDays: infant.gestationDays,
      weightGrams: infant.weightGrams,
      birthAt: infant.birthAt.toISOString(),
      heatSource: infant.heatSource,
      status: infant.status,
    },
    from: new Date(from).toISOString(),
    to: now.toISOString(),
    timeZone: unit.timeZone,
    settings: {
      controlMode: latest.controlMode ?? null,
      setCenti: latest.setCenti ?? null,
      heaterOutputPct: latest.heaterOutputPct ?? null,
      probeCenti: latest.probeCenti ?? null,
      remoteCenti: latest.remoteCenti ?? null,
      remoteTakenAt: latest.remoteTakenAt ?? null,
      // The current placement and its prompt, as stored (the same as every other view).
      placement: summary!.placement ?? null,
    },
    nextCheck: summary!.nextCheck,
    checks: summary!.checks,
    readings: current,
    flags: flagRows.map((f) => ({
      id: f.id!,
      kind: f.kind,
      raisedAt: f.raisedAt,
      closedAt: f.closedAt,
      how: f.how ?? null,
      actions: f.actions.map((a) => ({ kind: a.kind, note: a.note, at: a.at, by: a.recordedBy.name })),
      // Only an escalation that went out counts as escalated.
      escalatedAt: f.escalation?.sentAt ?? null,
      acknowledgedAt: f.escalation?.acknowledgedAt ?? null,
      severity: f.severity,
      escalation: f.escalation ?? null,
      withdrawn: f.withdrawn ? { reason: f.withdrawn.reason, readingId: f.withdrawn.readingId } : null,
      detail: f.detail,
      band: f.kind === 'cold-stress' && typeof f.detail?.band === 'string' ? f.detail.band : null,
    })),
    sessions: sessions.map((s) => ({
      id: s.id,
      startedAt: s.startedAt.toISOString(),
      endedAt: iso(s.endedAt),
      referenceCenti: s.referenceCenti,
      limitCenti: s.limitCenti,
      carer: s.carer,
    })),
    nurse: nurse ?? null,
  };
  return { unitId: infant.unitId, handover };
}

/** The admitted infants whose latest assignment row for the current shift names this nurse. */
function myInfantIds(ctx: AppContext, userId: string, unitIds: string[], now: Date): string[] {
  const ids: string[] = [];
  for (const unitId of unitIds) {
    const unit = shiftTimes(ctx, unitId);
    if (!unit) continue;
    const slot = shiftAt(now, unit);
    const rows = ctx.database.db
      .select({ infantId: assignments.infantId, nurseId: assignments.nurseId })
      .from(assignments)
      .innerJoin(infants, eq(infants.id, assignments.infantId))
      .where(and(eq(assignments.unitId, unitId), eq(assignments.shiftDate, slot.shiftDate), eq(assignments.shift, slot.shift), eq(infants.status, 'admitted')))
      .orderBy(asc(assignments.createdAt), asc(storedOrder))
      .all();
    const latest = new Map<string, string>();
    for (const r of rows) latest.set(r.infantId, r.nurseId);
    for (const [infantId, nurseId] of latest) if (nurseId === userId) ids.push(infantId);
  }
  return ids;
}

/** Every admitted infant of the unit, in bed order (infants without a bed last). */
function unitInfantIds(ctx: AppContext, unitId: string): string[] {
  return ctx.database.db
    .select({ id: infants.id })
    .from(infants)
    .leftJoin(beds, eq(beds.id, infants.bedId))
    .where(and(eq(infants.unitId, unitId), eq(infants.status, 'admitted')))
    .orderBy(isNull(beds.label), asc(beds.label), asc(infants.displayName))
    .all()
    .map((r) => r.id);
}

type HandoverAction = 'handover-read' | 'handover-export';

/** Many infants' handovers (unknown ids left out), each read audited, in one answer. */
function readHandovers(ctx: AppContext, actorId: string, infantIds: string[], now: Date, action: HandoverAction = 'handover-read'): HandoverInfant[] {
  const { sqlite } = ctx.database;
  const built = infantIds.map((id) => buildHandover(ctx, id, now)).filter((h) => h !== null);
  writeTx(sqlite, () => {
    for (const { unitId, handover } of built) {
      appendAudit(sqlite, { at: ctx.clock.now(), actorId, action, entityType: 'infant', entityId: handover.infant.id, unitId });
    }
  });
  return built.map((b) => b.handover);
}

/** The signed-in nurse's infants this shift, by bed. */
export function myHandovers(ctx: AppContext, auth: { userId: string; unitIds: string[] }, now: Date): HandoverResponse {
  const infantsOut = readHandovers(ctx, auth.userId, myInfantIds(ctx, auth.userId, auth.unitIds, now), now);
  infantsOut.sort((a, b) => (a.infant.bedLabel ?? '').localeCompare(b.infant.bedLabel ?? ''));
  return { generatedAt: now.toISOString(), infants: infantsOut };
}

/** The charge nurse's handover to the next charge nurse: every admitted infant of the unit, by bed. */
export function unitHandovers(ctx: AppContext, unitId: string, actorId: string, now: Date): HandoverResponse {
  return { generatedAt: now.toISOString(), infants: readHandovers(ctx, actorId, unitInfantIds(ctx, unitId), now) };
}

/** One infant's handover: 404 for an unknown infant, 403 for one of another unit. */
function oneHandover(ctx: AppContext, infantId: string, auth: { userId: string; unitIds: string[] }, now: Date, action: HandoverAction): HandoverInfant {
  const infant = ctx.database.db.select({ unitId: infants.unitId }).from(infants).where(eq(infants.id, infantId)).get();
  if (!infant) throw notFound('That infant');
  if (!auth.unitIds.includes(infant.unitId)) throw forbidden('This infant or record belongs to a unit you are not part of.');
  const [handover] = readHandovers(ctx, auth.userId, [infantId], now, action);
  if (!handover) throw notFound('That infant');
  return handover;
}

export function infantHandover(ctx: AppContext, infantId: string, auth: { userId: string; unitIds: string[] }, now: Date): HandoverResponse {
  return { generatedAt: now.toISOString(), infants: [oneHandover(ctx, infantId, auth, now, 'handover-read')] };
}

/** One infant's handover readings as a CSV file in the reader's temperature unit; an audited export. */
export function infantHandoverCsv(ctx: AppContext, infantId: string, auth: { userId: string; unitIds: string[] }, now: Date): { filename: string; csv: string } {
  const handover = oneHandover(ctx, infantId, auth, now, 'handover-export');
  const safeName = handover.infant.displayName.replace(/[^A-Za-z0-9-]+/g, '-').replace(/^-|-$/g, '') || 'infant';
  return {
    filename: `handover-${safeName}-${now.toISOString().slice(0, 10)}.csv`,
    csv: handoverCsv(handover, viewerPrefs(ctx, auth.userId).tempUnit, handover.timeZone),
  };
}

const temp = (centi: number | null, unit: TempUnit) => (centi === null ? '' : fromCentiCelsius(centi, unit).toFixed(unit === 'C' ? 2 : 1));

/** The handover's readings as CSV, one row per current reading, in the user's temperature unit. */
export function handoverCsv(handover: HandoverInfant, unit: TempUnit, timeZone: string): string {
  const local = new Intl.DateTimeFormat('en-GB', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', hour12: false });
  return Papa.unparse(
    handover.readings.map((r) => ({
      taken_at_utc: r.takenAt,
      taken_at_local: local.format(new Date(r.takenAt)),
      bed: handover.infant.bedLabel ?? '',
      infant: handover.infant.displayName,
      [`probe_${unit}`]: temp(r.probeCenti, unit),
      [`remote_${unit}`]: temp(r.remoteCenti, unit),
      remote_site: r.remoteSite ?? '',
      [`air_${unit}`]: temp(r.airCenti, unit),
      [`set_${unit}`]: temp(r.setCenti, unit),
      control_mode: r.controlMode ?? '',
      heater_output_pct: r.heaterOutputPct ?? '',
      heart_rate: r.heartRate ?? '',
      heat_signs: r.heatSigns.join(' '),
      note: r.note ?? '',
      recorded_by: r.recordedBy,
    })),
    {
      columns: [
        'taken_at_utc',
        'taken_at_local',
        'bed',
        'infant',
        `probe_${unit}`,
        `remote_${unit}`,
        'remote_site',
        `air_${unit}`,
        `set_${unit}`,
        'control_mode',
        'heater_output_pct',
        'heart_rate',
        'heat_signs',
        'note',
        'recorded_by',
      ],
      // A cell that starts with = + - @ would run as a formula in a spreadsheet.
      escapeFormulae: true,
    },
  );
}
