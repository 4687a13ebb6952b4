import { prepared } from '../../db/client';
import type Database from 'better-sqlite3';
import { shiftAt } from '../../shared/shifts';
import type { InfantSummary } from '../../shared/types/bedside';
import type { BoardBed, BoardEscalation, BoardResponse, UrgencyTier } from '../../shared/types/board';
import { needsAttention, type FlagKind, type Severity } from '../../shared/thermal';
import type { UnitRow } from './flags';
import { summarizeInfants } from './summaries';

interface FullUnitRow extends UnitRow {
  name: string;
  hospital_name: string;
}

/**
 * Where a bed stands, from the stored severities and clocks (shared/thermal/severity.ts): tier 0
 * needs attention (a critical or urgent open flag, or any check clock overdue: remote site,
 * manual mode, a recheck), tier 1 a check due soon or a caution flag, tier 2 the rest. Within
 * tier 0 a critical flag comes first (`rank`); `since` then orders a tier: longest waiting first.
 */
export function urgencyOf(infant: InfantSummary): { tier: UrgencyTier; since: string | null; rank: number } {
  const checks = infant.checks;
  const clocks = checks ? [checks.remote, ...(checks.manual ? [checks.manual] : []), ...checks.rechecks] : [infant.nextCheck];
  const attention: string[] = infant.openFlags.filter((f) => needsAttention(f.severity ?? 'urgent')).map((f) => f.raisedAt);
  for (const c of clocks) if (c.status === 'overdue' && c.dueAt) attention.push(c.dueAt);
  const rank = infant.openFlags.some((f) => f.severity === 'critical') ? 0 : 1;
  if (attention.length) return { tier: 0, since: earliest(attention), rank };
  const soon: string[] = infant.openFlags.map((f) => f.raisedAt);
  for (const c of clocks) if (c.status === 'due-soon' && c.dueAt) soon.push(c.dueAt);
  if (soon.length) return { tier: 1, since: earliest(soon), rank };
  return { tier: 2, since: checks?.next.dueAt ?? infant.nextCheck.dueAt, rank };
}

function earliest(isos: string[]): string {
  return isos.reduce((a, b) => (Date.parse(b) < Date.parse(a) ? b : a));
}

export function compareBeds(a: BoardBed & { sortOrder: number; rank?: number }, b: BoardBed & { sortOrder: number; rank?: number }): number {
  if (a.tier !== b.tier) return a.tier - b.tier;
  if ((a.rank ?? 1) !== (b.rank ?? 1)) return (a.rank ?? 1) - (b.rank ?? 1);
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
      `SELECT e.id, e.flag_id, f.kind, f.infant_id, e.escalated_at, e.mailed_at, e.acknowledged_at, e.acknowledged_by, u.name AS ack_name, e.acknowledge_note,
              e.recipient, e.severity
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
    recipient: string | null;
    severity: Severity | null;
  }>;
  const nurses = prepared(
    sqlite,
      // Only people who accepted their invitation (a password set): nobody else can be on shift.
      `SELECT u.id, u.name, u.role FROM users u JOIN user_units m ON m.user_id = u.id
        WHERE m.unit_id = ? AND u.active = 1 AND u.password_hash IS NOT NULL AND u.role IN ('nurse', 'charge') ORDER BY u.name`,
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
      sentAt: e.mailed_at === null ? null : new Date(e.mailed_at).toISOString(),
      to: e.recipient ? (JSON.parse(e.recipient) as BoardEscalation['to']) : [],
      recipient: e.recipient ? (JSON.parse(e.recipient) as BoardEscalation['to']) : [],
      severity: e.severity ?? 'urgent',
    });
    escalationsByInfant.set(e.infant_id, list);
  }

  const infantByBed = new Map(admitted.map((i) => [i.bed_id, i.id]));
  const rows = beds.map((bed) => {
    const infantId = infantByBed.get(bed.id);
    const infant = infantId ? (summaries.get(infantId) ?? null) : null;
    const { tier, since, rank } = infant ? urgencyOf(infant) : { tier: 3 as const, since: null, rank: 1 };
    return {
      bedId: bed.id,
      label: bed.label,
      sortOrder: bed.sort_order,
      rank,
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
    beds: rows.map(({ sortOrder: _sortOrder, rank: _rank, ...bed }) => bed),
    nurses,
  };
}
