import { prepared } from '../../db/client';
import type Database from 'better-sqlite3';
import { shiftAt } from '../../shared/shifts';
import type { InfantSummary } from '../../shared/types/bedside';
import type { BoardBed, BoardEscalation, BoardResponse, UrgencyTier } from '../../shared/types/board';
import type { FlagKind } from '../../shared/thermal';
import type { UnitRow } from './flags';
import { summarizeInfants } from './summaries';

interface FullUnitRow extends UnitRow {
  name: string;
  hospital_name: string;
}

/** Flags that put a bed at the top of the board: the ones that also escalate. */
export const ATTENTION_KINDS: readonly FlagKind[] = ['gap', 'overdue-check'];

/**
 * Where a bed stands: tier 0 an overdue check or an unresolved gap flag, tier 1 a check due
 * soon or any other open flag, tier 2 the rest. `since` orders a tier: longest waiting first.
 */
export function urgencyOf(infant: InfantSummary): { tier: UrgencyTier; since: string | null } {
  const attention: string[] = infant.openFlags.filter((f) => ATTENTION_KINDS.includes(f.kind)).map((f) => f.raisedAt);
  if (infant.nextCheck.status === 'overdue' && infant.nextCheck.dueAt) attention.push(infant.nextCheck.dueAt);
  if (attention.length) return { tier: 0, since: earliest(attention) };
  const soon: string[] = infant.openFlags.map((f) => f.raisedAt);
  if (infant.nextCheck.status === 'due-soon' && infant.nextCheck.dueAt) soon.push(infant.nextCheck.dueAt);
  if (soon.length) return { tier: 1, since: earliest(soon) };
  return { tier: 2, since: infant.nextCheck.dueAt };
}

function earliest(isos: string[]): string {
  return isos.reduce((a, b) => (Date.parse(b) < Date.parse(a) ? b : a));
}

export function compareBeds(a: BoardBed & { sortOrder: number }, b: BoardBed & { sortOrder: number }): number {
  if (a.tier !== b.tier) return a.tier - b.tier;
  const as = a.since ? Date.parse(a.since) : Number.POSITIVE_INFINITY;
  const bs = b.since ? Date.parse(b.since) : Number.POSITIVE_INFINITY;
  if (as !== bs) return as - bs;
  return a.sortOrder - b.sortOrder || a.label.localeCompare(b.label);
}

/**
 * Everything the board shows, in one answer. A fixed number of queries whatever the size of the
 * unit: the unit, its beds, its admitted infants, their summaries (one query per table inside
 * summarizeInfants), their escalations and the unit's staff.
 */
export function buildBoard(sqlite: Database.Database, unitId: string, now: Date): BoardResponse | null {
  const unit = prepared(sqlite, 'SELECT * FROM units WHERE id = ?').get(unitId) as FullUnitRow | undefined;
  if (!unit) return null;
  const beds = prepared(sqlite, 'SELECT id, label, sort_order FROM beds WHERE unit_id = ? AND active = 1 ORDER BY sort_order, label')
    .all(unitId) as Array<{ id: string; label: string; sort_order: number }>;
  const admitted = prepared(sqlite, "SELECT id, bed_id FROM infants WHERE unit_id = ? AND status = 'admitted' AND bed_id IS NOT NULL")
    .all(unitId) as Array<{ id: string; bed_id: string }>;
  const summaries = new Map(summarizeInfants(sqlite, admitted.map((i) => i.id), now).map((s) => [s.id, s]));
  const escalations = prepared(
    sqlite,
      `SELECT e.id, e.flag_id, f.kind, f.infant_id, e.escalated_at, e.mailed_at, e.acknowledged_at, e.acknowledged_by, u.name AS ack_name, e.acknowledge_note
         FROM escalations e
         JOIN flags f ON f.id = e.flag_id
         LEFT JOIN flag_resolutions r ON r.flag_id = e.flag_id
         LEFT JOIN users u ON u.id = e.acknowledged_by
        WHERE e.unit_id = ? AND r.flag_id IS NULL
        ORDER BY e.escalated_at`,
    )
    .all(unitId) as Array<{
    id: string;
    flag_id: string;
    kind: FlagKind;
    infant_id: string;
    escalated_at: number;
    mailed_at: number | null;
    acknowledged_at: number | null;
    acknowledged_by: string | null;
    ack_name: string | null;
    acknowledge_note: string | null;
  }>;
  const nurses = prepared(
    sqlite,
      `SELECT u.id, u.name, u.role FROM users u JOIN user_units m ON m.user_id = u.id
        WHERE m.unit_id = ? AND u.active = 1 AND u.role IN ('nurse', 'charge') ORDER BY u.name`,
    )
    .all(unitId) as Array<{ id: string; name: string; role: 'nurse' | 'charge' }>;

  const escalationsByInfant = new Map<string, BoardEscalation[]>();
  for (const e of escalations) {
    const list = escalationsByInfant.get(e.infant_id) ?? [];
    list.push({
      id: e.id,
      flagId: e.flag_id,
      flagKind: e.kind,
      escalatedAt: new Date(e.escalated_at).toISOString(),
      mailedAt: e.mailed_at === null ? null : new Date(e.mailed_at).toISOString(),
      acknowledgedAt: e.acknowledged_at === null ? null : new Date(e.acknowledged_at).toISOString(),
      acknowledgedBy: e.acknowledged_by ? { id: e.acknowledged_by, name: e.ack_name ?? '' } : null,
      note: e.acknowledge_note,
    });
    escalationsByInfant.set(e.infant_id, list);
  }

  const infantByBed = new Map(admitted.map((i) => [i.bed_id, i.id]));
  const rows = beds.map((bed) => {
    const infantId = infantByBed.get(bed.id);
    const infant = infantId ? (summaries.get(infantId) ?? null) : null;
    const { tier, since } = infant ? urgencyOf(infant) : { tier: 3 as const, since: null };
    return {
      bedId: bed.id,
      label: bed.label,
      sortOrder: bed.sort_order,
      tier,
      since,
      infant,
      escalations: infant ? (escalationsByInfant.get(infant.id) ?? []) : [],
    };
  });
  rows.sort(compareBeds);

  const slot = shiftAt(now, { dayShiftStart: unit.day_shift_start, nightShiftStart: unit.night_shift_start, timeZone: unit.time_zone });
  return {
    serverTime: now.toISOString(),
    unit: {
      id: unit.id,
      name: unit.name,
      hospitalName: unit.hospital_name,
      timeZone: unit.time_zone,
      checkIntervalMinutes: unit.check_interval_minutes,
      dueSoonMinutes: unit.due_soon_minutes,
      gapLimitCenti: unit.gap_limit_centi,
      escalationDelayMinutes: unit.escalation_delay_minutes,
      dayShiftStart: unit.day_shift_start,
      nightShiftStart: unit.night_shift_start,
    },
    shift: { shiftDate: slot.shiftDate, shift: slot.shift, startsAt: slot.startsAt.toISOString(), endsAt: slot.endsAt.toISOString() },
    beds: rows.map(({ sortOrder: _sortOrder, ...bed }) => bed),
    nurses,
  };
}
