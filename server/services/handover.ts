import Papa from 'papaparse';
import { shiftAt } from '../../shared/shifts';
import { currentReadings, fromCentiCelsius, type TempUnit } from '../../shared/thermal';
import type { HandoverInfant, HandoverReading } from '../../shared/types/board';
import type { AppContext } from '../context';
import { dbOf, readClocks, type StoredLatest } from './flag-lifecycle';
import { loadInfantState, loadUnitRow } from './flags';
import { storedFlowsheetFlags, summarizeInfants } from './summaries';

export const HANDOVER_HOURS = 12;

interface InfantRow {
  id: string;
  unit_id: string;
  display_name: string;
  bed_label: string | null;
  gestation_weeks: number;
  gestation_days: number;
  weight_grams: number;
  birth_at: number;
  heat_source: HandoverInfant['infant']['heatSource'];
  status: 'admitted' | 'discharged';
}

const iso = (ms: number | null) => (ms === null ? null : new Date(ms).toISOString());

/** One infant's last 12 hours: current readings, flags with their actions, sessions, settings and the next check. */
export function buildHandover(ctx: AppContext, infantId: string, now: Date): HandoverInfant | null {
  const { sqlite } = ctx.database;
  const infant = sqlite
    .prepare(
      `SELECT i.id, i.unit_id, i.display_name, b.label AS bed_label, i.gestation_weeks, i.gestation_days, i.weight_grams, i.birth_at, i.heat_source, i.status
         FROM infants i LEFT JOIN beds b ON b.id = i.bed_id WHERE i.id = ?`,
    )
    .get(infantId) as InfantRow | undefined;
  if (!infant) return null;
  const unit = loadUnitRow(sqlite, infant.unit_id)!;
  const from = now.getTime() - HANDOVER_HOURS * 3_600_000;
  const state = loadInfantState(sqlite, infantId);
  // What the last evaluation stored: the views never evaluate the rules again.
  const [summary] = summarizeInfants(sqlite, [infantId], now);
  const clock = readClocks(dbOf(sqlite), infantId);
  const latest: Partial<StoredLatest> = clock ? (JSON.parse(clock.latest) as StoredLatest) : {};

  const extras = new Map(
    (
      sqlite
        .prepare('SELECT r.id, r.note, r.replaces_id, u.name AS by_name FROM readings r JOIN users u ON u.id = r.recorded_by WHERE r.infant_id = ? AND r.taken_at >= ?')
        .all(infantId, from) as Array<{ id: string; note: string | null; replaces_id: string | null; by_name: string }>
    ).map((r) => [r.id, r]),
  );
  const readings: HandoverReading[] = currentReadings(state.readings)
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
        recordedBy: extra?.by_name ?? '',
        corrects: r.replacesId !== null,
      };
    });

  const flagRows = storedFlowsheetFlags(sqlite, infantId, from, now).reverse();

  const sessions = sqlite
    .prepare('SELECT id, started_at, ended_at, reference_centi, limit_centi, carer FROM skin_to_skin_sessions WHERE infant_id = ? AND (ended_at IS NULL OR ended_at >= ?) ORDER BY started_at')
    .all(infantId, from) as Array<{ id: string; started_at: number; ended_at: number | null; reference_centi: number; limit_centi: number; carer: string | null }>;

  const slot = shiftAt(now, { dayShiftStart: unit.day_shift_start, nightShiftStart: unit.night_shift_start, timeZone: unit.time_zone });
  const nurse = sqlite
    .prepare(
      `SELECT u.id, u.name FROM assignments a JOIN users u ON u.id = a.nurse_id
        WHERE a.infant_id = ? AND a.shift_date = ? AND a.shift = ? ORDER BY a.created_at DESC, a.rowid DESC LIMIT 1`,
    )
    .get(infantId, slot.shiftDate, slot.shift) as { id: string; name: string } | undefined;

  return {
    infant: {
      id: infant.id,
      displayName: infant.display_name,
      bedLabel: infant.bed_label,
      gestationWeeks: infant.gestation_weeks,
      gestationDays: infant.gestation_days,
      weightGrams: infant.weight_grams,
      birthAt: new Date(infant.birth_at).toISOString(),
      heatSource: infant.heat_source,
      status: infant.status,
    },
    from: new Date(from).toISOString(),
    to: now.toISOString(),
    timeZone: unit.time_zone,
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
    readings,
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
      startedAt: new Date(s.started_at).toISOString(),
      endedAt: iso(s.ended_at),
      referenceCenti: s.reference_centi,
      limitCenti: s.limit_centi,
      carer: s.carer,
    })),
    nurse: nurse ?? null,
  };
}

/** The admitted infants whose latest assignment row for the current shift names this nurse. */
export function myInfantIds(ctx: AppContext, userId: string, unitIds: string[], now: Date): string[] {
  const { sqlite } = ctx.database;
  const ids: string[] = [];
  for (const unitId of unitIds) {
    const unit = loadUnitRow(sqlite, unitId);
    if (!unit) continue;
    const slot = shiftAt(now, { dayShiftStart: unit.day_shift_start, nightShiftStart: unit.night_shift_start, timeZone: unit.time_zone });
    const rows = sqlite
      .prepare(
        `SELECT a.infant_id, a.nurse_id FROM assignments a JOIN infants i ON i.id = a.infant_id
          LEFT JOIN beds b ON b.id = i.bed_id
          WHERE a.unit_id = ? AND a.shift_date = ? AND a.shift = ? AND i.status = 'admitted'
          ORDER BY a.created_at, a.rowid`,
      )
      .all(unitId, slot.shiftDate, slot.shift) as Array<{ infant_id: string; nurse_id: string }>;
    const latest = new Map<string, string>();
    for (const r of rows) latest.set(r.infant_id, r.nurse_id);
    for (const [infantId, nurseId] of latest) if (nurseId === userId) ids.push(infantId);
  }
  return ids;
}

/** Every admitted infant of the unit, in bed order (infants without a bed last). */
export function unitInfantIds(ctx: AppContext, unitId: string): string[] {
  return (
    ctx.database.sqlite
      .prepare(
        `SELECT i.id FROM infants i LEFT JOIN beds b ON b.id = i.bed_id
          WHERE i.unit_id = ? AND i.status = 'admitted'
          ORDER BY b.label IS NULL, b.label, i.display_name`,
      )
      .all(unitId) as Array<{ id: string }>
  ).map((r) => r.id);
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
        'taken_at_utc', 'taken_at_local', 'bed', 'infant', `probe_${unit}`, `remote_${unit}`, 'remote_site', `air_${unit}`, `set_${unit}`,
        'control_mode', 'heater_output_pct', 'heart_rate', 'heat_signs', 'note', 'recorded_by',
      ],
      // A cell that starts with = + - @ would run as a formula in a spreadsheet.
      escapeFormulae: true,
    },
  );
}
