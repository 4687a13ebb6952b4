import type Database from 'better-sqlite3';
import { and, asc, eq, inArray, isNotNull, isNull, sql } from 'drizzle-orm';
import { beds, escalations, flagResolutions, flags, infants, units, userUnits, users } from '../../db/schema';
import { shiftAt } from '../../shared/shifts';
import type { InfantSummary } from '../../shared/types/bedside';
import type { BoardBed, BoardEscalation, BoardResponse, UrgencyTier } from '../../shared/types/board';
import { needsAttention } from '../../shared/thermal';
import { perConnection } from './prepared-queries';
import { summarizeInfants } from './summaries';

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
/**
 * The board's reads, prepared: the board is read on every poll of every screen on the ward (bench
 * budget: "unit board" req/s at least 50 % of the baseline route's).
 */
const boardQueries = perConnection((db) => {
  const unitId = sql.placeholder('unitId');
  return {
    unit: db.select().from(units).where(eq(units.id, unitId)).prepare(),
    beds: db
      .select({ id: beds.id, label: beds.label, sortOrder: beds.sortOrder })
      .from(beds)
      .where(and(eq(beds.unitId, unitId), eq(beds.active, true)))
      .orderBy(asc(beds.sortOrder), asc(beds.label))
      .prepare(),
    admitted: db
      .select({ id: infants.id, bedId: infants.bedId })
      .from(infants)
      .where(and(eq(infants.unitId, unitId), eq(infants.status, 'admitted'), isNotNull(infants.bedId)))
      .prepare(),
    escalations: db
      .select({
        id: escalations.id,
        flagId: escalations.flagId,
        kind: flags.kind,
        infantId: flags.infantId,
        escalatedAt: escalations.escalatedAt,
        mailedAt: escalations.mailedAt,
        acknowledgedAt: escalations.acknowledgedAt,
        acknowledgedBy: escalations.acknowledgedBy,
        ackName: users.name,
        acknowledgeNote: escalations.acknowledgeNote,
        recipient: escalations.recipient,
        severity: escalations.severity,
      })
      .from(escalations)
      .innerJoin(flags, eq(flags.id, escalations.flagId))
      .leftJoin(flagResolutions, eq(flagResolutions.flagId, escalations.flagId))
      .leftJoin(users, eq(users.id, escalations.acknowledgedBy))
      .where(and(eq(escalations.unitId, unitId), isNull(flagResolutions.flagId)))
      .orderBy(asc(escalations.escalatedAt))
      .prepare(),
    nurses: db
      .select({ id: users.id, name: users.name, role: users.role })
      .from(users)
      .innerJoin(userUnits, eq(userUnits.userId, users.id))
      // Only people who accepted their invitation (a password set): nobody else can be on shift.
      .where(and(eq(userUnits.unitId, unitId), eq(users.active, true), isNotNull(users.passwordHash), inArray(users.role, ['nurse', 'charge'])))
      .orderBy(asc(users.name))
      .prepare(),
  };
});

export function buildBoard(sqlite: Database.Database, unitId: string, now: Date): BoardResponse | null {
  const q = boardQueries(sqlite);
  const unit = q.unit.get({ unitId });
  if (!unit) return null;
  const bedRows = q.beds.all({ unitId });
  const admitted = q.admitted.all({ unitId });
  const summaries = new Map(
    summarizeInfants(
      sqlite,
      admitted.map((i) => i.id),
      now,
    ).map((s) => [s.id, s]),
  );
  const open = q.escalations.all({ unitId });
  const nurses = q.nurses.all({ unitId }).map((n) => ({ id: n.id, name: n.name, role: n.role === 'charge' ? ('charge' as const) : ('nurse' as const) }));

  const iso = (d: Date | null) => (d === null ? null : d.toISOString());
  const escalationsByInfant = new Map<string, BoardEscalation[]>();
  for (const e of open) {
    const list = escalationsByInfant.get(e.infantId) ?? [];
    const to = e.recipient ? (JSON.parse(e.recipient) as BoardEscalation['to']) : [];
    list.push({
      id: e.id,
      flagId: e.flagId,
      flagKind: e.kind,
      escalatedAt: e.escalatedAt.toISOString(),
      mailedAt: iso(e.mailedAt),
      acknowledgedAt: iso(e.acknowledgedAt),
      acknowledgedBy: e.acknowledgedBy ? { id: e.acknowledgedBy, name: e.ackName ?? '' } : null,
      note: e.acknowledgeNote,
      sentAt: iso(e.mailedAt),
      to,
      recipient: to,
      severity: e.severity ?? 'urgent',
    });
    escalationsByInfant.set(e.infantId, list);
  }

  const infantByBed = new Map(admitted.map((i) => [i.bedId, i.id]));
  const rows = bedRows.map((bed) => {
    const infantId = infantByBed.get(bed.id);
    const infant = infantId ? (summaries.get(infantId) ?? null) : null;
    const { tier, since, rank } = infant ? urgencyOf(infant) : { tier: 3 as const, since: null, rank: 1 };
    return {
      bedId: bed.id,
      label: bed.label,
      sortOrder: bed.sortOrder,
      rank,
      tier,
      since,
      infant,
      escalations: infant ? (escalationsByInfant.get(infant.id) ?? []) : [],
    };
  });
  rows.sort(compareBeds);

  const slot = shiftAt(now, { dayShiftStart: unit.dayShiftStart, nightShiftStart: unit.nightShiftStart, timeZone: unit.timeZone });
  return {
    serverTime: now.toISOString(),
    unit: {
      id: unit.id,
      name: unit.name,
      hospitalName: unit.hospitalName,
      timeZone: unit.timeZone,
      checkIntervalMinutes: unit.checkIntervalMinutes,
      dueSoonMinutes: unit.dueSoonMinutes,
      gapLimitCenti: unit.gapLimitCenti,
      escalationDelayMinutes: unit.escalationDelayMinutes,
      dayShiftStart: unit.dayShiftStart,
      nightShiftStart: unit.nightShiftStart,
    },
    shift: { shiftDate: slot.shiftDate, shift: slot.shift, startsAt: slot.startsAt.toISOString(), endsAt: slot.endsAt.toISOString() },
    beds: rows.map(({ sortOrder: _sortOrder, rank: _rank, ...bed }) => bed),
    nurses,
  };
}
