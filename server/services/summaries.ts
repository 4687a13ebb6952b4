import { prepared, writeTx } from '../../db/client';
import type Database from 'better-sqlite3';
import { and, asc, eq, gte, inArray, isNotNull, isNull, or } from 'drizzle-orm';
import { actions, actionUndos, escalations, flagEvents, flagResolutions, flags, infantClocks, users } from '../../db/schema';
import { dueStatus, needsAttention, worseSeverity, type EvaluatedFlag, type FlagKind, type InfantEvaluation, type Severity } from '../../shared/thermal';
import { shiftAt } from '../../shared/shifts';
import type { CheckClocks, ClockStatus, EscalationSent, FlowsheetFlag, InfantSummary, NextCheck, OpenFlagSummary, RecheckClock } from '../../shared/types/bedside';
import { dbOf, type ClockRow, type StoredLatest, type StoredOpenFlag } from './flag-lifecycle';
import { syncFlags, type UnitRow } from './flags';

const DAY_MS = 86_400_000;

interface InfantRow {
  id: string;
  unit_id: string;
  bed_id: string | null;
  bed_label: string | null;
  display_name: string;
  birth_at: number;
  gestation_weeks: number;
  gestation_days: number;
  weight_grams: number;
  heat_source: InfantSummary['heatSource'];
  admitted_at: number;
}

/** JSON-safe copy of the rules' detail (Dates become ISO strings). */
export function plainDetail(detail: unknown): Record<string, unknown> {
  return JSON.parse(JSON.stringify(detail ?? {})) as Record<string, unknown>;
}

export function nextCheckJson(next: InfantEvaluation['nextCheck']): NextCheck {
  return { status: next.status, dueAt: next.dueAt ? next.dueAt.toISOString() : null, minutesLate: next.minutesLate };
}

/** A flag as the rules just evaluated it (a write's answer); nothing about escalation yet. */
export function openFlagJson(flag: EvaluatedFlag, storedId: string | null, escalated: boolean): OpenFlagSummary {
  return {
    id: storedId,
    key: flag.key,
    kind: flag.kind,
    raisedAt: flag.raisedAt.toISOString(),
    raisedByReadingId: flag.raisedByReadingId,
    detail: plainDetail(flag.detail),
    recheckDueAt: flag.recheckDueAt ? flag.recheckDueAt.toISOString() : null,
    severity: flag.severity,
    escalation: null,
    escalated,
  };
}

const iso = (d: Date | null | undefined): string | null => (d ? d.toISOString() : null);

function clockJson(dueAt: Date | null, now: Date, dueSoonMinutes: number): ClockStatus {
  const s = dueStatus(dueAt, now, dueSoonMinutes);
  return { status: s.status, dueAt: iso(s.dueAt), minutesLate: s.minutesLate };
}

const STATUS_RANK: Record<ClockStatus['status'], number> = { overdue: 0, 'due-soon': 1, ok: 2, never: 3 };

/** Every check clock from the stored next-due instants, as of `now`. */
export function checkClocks(clock: ClockRow | undefined, open: OpenFlagSummary[], now: Date): CheckClocks {
  const dueSoon = clock?.dueSoonMinutes ?? 15;
  const remote = clockJson(clock?.remoteDueAt ?? null, now, dueSoon);
  const manual =
    clock?.manualSince && clock.manualDueAt
      ? {
          ...clockJson(clock.manualDueAt, now, Math.min(dueSoon, Math.max(0, (clock.manualLimitMinutes ?? 15) - 1))),
          since: clock.manualSince.toISOString(),
          outputPct: clock.manualOutputPct,
          limitMinutes: clock.manualLimitMinutes ?? 15,
        }
      : null;
  const rechecks = open.map((f) => f.recheck).filter((r): r is RecheckClock => r !== null && r !== undefined);
  const candidates: Array<CheckClocks['next']> = [{ clock: 'remote', ...remote }];
  if (manual) candidates.push({ clock: 'manual', status: manual.status, dueAt: manual.dueAt, minutesLate: manual.minutesLate });
  for (const r of rechecks) candidates.push({ clock: 'recheck', status: r.status, dueAt: r.dueAt, minutesLate: r.minutesLate });
  const next = candidates.reduce((a, b) => {
    if (b.dueAt === null) return a;
    if (a.dueAt === null) return b;
    return Date.parse(b.dueAt) < Date.parse(a.dueAt) ? b : a;
  });
  return { remote, manual, rechecks, next: STATUS_RANK[next.status] <= STATUS_RANK[remote.status] ? next : { clock: 'remote', ...remote } };
}

interface StoredFlagRow {
  id: string;
  infantId: string;
  key: string;
  kind: FlagKind;
  raisedAt: Date;
  raisedByReadingId: string | null;
  detail: string;
  severity: Severity | null;
}

/** Escalations that actually went out, by flag id. */
export function sentEscalations(sqlite: Database.Database, flagIds: string[]): Map<string, EscalationSent> {
  const out = new Map<string, EscalationSent>();
  if (flagIds.length === 0) return out;
  const rows = dbOf(sqlite)
    .select({
      id: escalations.id,
      flagId: escalations.flagId,
      mailedAt: escalations.mailedAt,
      recipient: escalations.recipient,
      acknowledgedAt: escalations.acknowledgedAt,
      acknowledgedBy: escalations.acknowledgedBy,
      ackName: users.name,
    })
    .from(escalations)
    .leftJoin(users, eq(users.id, escalations.acknowledgedBy))
    .where(and(inArray(escalations.flagId, flagIds), isNotNull(escalations.mailedAt)))
    .all();
  for (const r of rows) {
    out.set(r.flagId, {
      id: r.id,
      sentAt: r.mailedAt!.toISOString(),
      to: r.recipient ? (JSON.parse(r.recipient) as EscalationSent['to']) : [],
      how: 'email',
      acknowledgedAt: iso(r.acknowledgedAt),
      acknowledgedBy: r.acknowledgedBy ? { id: r.acknowledgedBy, name: r.ackName ?? '' } : null,
    });
  }
  return out;
}

/** The stored open flags of these infants (raised, neither closed nor withdrawn). */
function storedOpenFlags(sqlite: Database.Database, infantIds: string[]): StoredFlagRow[] {
  return dbOf(sqlite)
    .select({
      id: flags.id,
      infantId: flags.infantId,
      key: flags.key,
      kind: flags.kind,
      raisedAt: flags.raisedAt,
      raisedByReadingId: flags.raisedByReadingId,
      detail: flags.detail,
      severity: flags.severity,
    })
    .from(flags)
    .leftJoin(flagResolutions, eq(flagResolutions.flagId, flags.id))
    .where(and(inArray(flags.infantId, infantIds), isNull(flagResolutions.flagId)))
    .orderBy(asc(flags.raisedAt), asc(flags.key))
    .all();
}

/**
 * The open flags of one infant as stored: the flag row, what the last evaluation found about it
 * (current severity and detail, the recheck clock) and its escalation if one went out.
 */
export function openFlagsFromStore(
  rows: StoredFlagRow[],
  clock: ClockRow | undefined,
  sent: Map<string, EscalationSent>,
  now: Date,
): OpenFlagSummary[] {
  const current = new Map((clock ? (JSON.parse(clock.openFlags) as StoredOpenFlag[]) : []).map((f) => [f.flagId, f]));
  const dueSoon = clock?.dueSoonMinutes ?? 15;
  return rows.map((row) => {
    const seen = current.get(row.id);
    const severity = seen?.severity ?? row.severity ?? 'urgent';
    const escalation = sent.get(row.id) ?? null;
    const recheckDueAt = seen?.recheckDueAt ?? null;
    const recheck: RecheckClock | null = recheckDueAt
      ? { flagId: row.id, kind: row.kind, countsFrom: seen?.recheckCountsFrom ?? null, ...clockJson(new Date(recheckDueAt), now, dueSoon) }
      : null;
    return {
      id: row.id,
      key: row.key,
      kind: row.kind,
      raisedAt: row.raisedAt.toISOString(),
      raisedByReadingId: row.raisedByReadingId,
      detail: plainDetail(seen ? seen.detail : JSON.parse(row.detail)),
      recheckDueAt,
      severity,
      recheck,
      escalation,
      escalated: escalation !== null,
    };
  });
}

/** The most severe open flag, and whether the bed needs attention (an urgent flag or an overdue clock). */
export function attentionOf(open: OpenFlagSummary[], checks: CheckClocks): { severity: Severity | null; needsAttention: boolean } {
  const severity = open.reduce<Severity | null>((worst, f) => worseSeverity(worst, f.severity ?? null), null);
  const overdue = checks.remote.status === 'overdue' || checks.manual?.status === 'overdue' || checks.rechecks.some((r) => r.status === 'overdue');
  return { severity, needsAttention: needsAttention(severity) || overdue };
}

/** Postmenstrual age and days since birth at `now`. */
export function ages(birthAtMs: number, gestationWeeks: number, gestationDays: number, now: Date) {
  const ageDays = Math.max(0, Math.floor((now.getTime() - birthAtMs) / DAY_MS));
  const total = gestationWeeks * 7 + gestationDays + ageDays;
  return { ageDays, correctedWeeks: Math.floor(total / 7), correctedDays: total % 7 };
}

function groupBy<T>(rows: T[], key: (row: T) => string): Map<string, T[]> {
  const map = new Map<string, T[]>();
  for (const row of rows) {
    const k = key(row);
    const list = map.get(k);
    if (list) list.push(row);
    else map.set(k, [row]);
  }
  return map;
}

/**
 * Summaries of many infants at once, from what is stored: the open flags (flags without a
 * resolution), what the last evaluation found (infant_clocks: severity, detail, the check
 * clocks' next-due instants) and the escalations that went out. Nothing here runs the rules;
 * "due soon" and "overdue" come from the stored instants and `now`. An infant no evaluation has
 * stored clocks for yet (a database from before them) is synced once first.
 * Returned in the order of `infantIds`; unknown ids are skipped.
 */
export function summarizeInfants(sqlite: Database.Database, infantIds: string[], now: Date): InfantSummary[] {
  if (infantIds.length === 0) return [];
  const unique = [...new Set(infantIds)];
  const ids = JSON.stringify(unique);
  const db = dbOf(sqlite);

  const infants = prepared(
    sqlite,
      `SELECT i.id, i.unit_id, i.bed_id, b.label AS bed_label, i.display_name, i.birth_at, i.gestation_weeks, i.gestation_days,
              i.weight_grams, i.heat_source, i.admitted_at
         FROM infants i LEFT JOIN beds b ON b.id = i.bed_id
        WHERE i.id IN (SELECT value FROM json_each(?))`,
    )
    .all(ids) as InfantRow[];
  if (infants.length === 0) return [];

  const loadClocks = () => db.select().from(infantClocks).where(inArray(infantClocks.infantId, unique)).all();
  let clockRows = loadClocks();
  const missing = infants.filter((i) => !clockRows.some((c) => c.infantId === i.id));
  if (missing.length > 0 && !sqlite.inTransaction) {
    writeTx(sqlite, () => {
      for (const i of missing) syncFlags(sqlite, i.id, now, null);
    });
    clockRows = loadClocks();
  }
  const clocks = new Map(clockRows.map((c) => [c.infantId, c]));

  const unitIds = JSON.stringify([...new Set(infants.map((i) => i.unit_id))]);
  const units = prepared(sqlite, 'SELECT * FROM units WHERE id IN (SELECT value FROM json_each(?))').all(unitIds) as UnitRow[];
  const unitById = new Map(units.map((u) => [u.id, u]));

  const openRows = storedOpenFlags(sqlite, unique);
  const sent = sentEscalations(sqlite, openRows.map((r) => r.id));

  const sessions = prepared(
    sqlite,
      `SELECT id, infant_id, started_at, ended_at, reference_centi, limit_centi FROM skin_to_skin_sessions
        WHERE infant_id IN (SELECT value FROM json_each(?)) AND ended_at IS NULL ORDER BY started_at`,
    )
    .all(ids) as Array<{ id: string; infant_id: string; started_at: number; ended_at: number | null; reference_centi: number; limit_centi: number }>;

  const assignments = prepared(
    sqlite,
      `SELECT a.infant_id, a.shift_date, a.shift, a.created_at, u.id AS nurse_id, u.name AS nurse_name
         FROM assignments a JOIN users u ON u.id = a.nurse_id
        WHERE a.infant_id IN (SELECT value FROM json_each(?)) AND a.shift_date >= ?
        ORDER BY a.created_at, a.id`,
    )
    .all(ids, new Date(now.getTime() - 2 * DAY_MS).toISOString().slice(0, 10)) as Array<{
    infant_id: string;
    shift_date: string;
    shift: string;
    created_at: number;
    nurse_id: string;
    nurse_name: string;
  }>;

  const flagsBy = groupBy(openRows, (f) => f.infantId);
  const sessionsBy = groupBy(sessions, (s) => s.infant_id);
  const assignmentsBy = groupBy(assignments, (a) => a.infant_id);
  const slots = new Map(
    units.map((u) => [u.id, shiftAt(now, { dayShiftStart: u.day_shift_start, nightShiftStart: u.night_shift_start, timeZone: u.time_zone })]),
  );

  const byId = new Map<string, InfantSummary>();
  for (const infant of infants) {
    const unit = unitById.get(infant.unit_id)!;
    const clock = clocks.get(infant.id);
    const latest: StoredLatest | null = clock ? (JSON.parse(clock.latest) as StoredLatest) : null;
    const openFlags = openFlagsFromStore(flagsBy.get(infant.id) ?? [], clock, sent, now);
    const checks = checkClocks(clock, openFlags, now);
    const running = (sessionsBy.get(infant.id) ?? []).filter((s) => s.started_at <= now.getTime()).pop();
    const slot = slots.get(infant.unit_id)!;
    const assigned = (assignmentsBy.get(infant.id) ?? []).filter((a) => a.shift_date === slot.shiftDate && a.shift === slot.shift).pop();
    byId.set(infant.id, {
      id: infant.id,
      unitId: infant.unit_id,
      timeZone: unit.time_zone,
      bedId: infant.bed_id,
      bedLabel: infant.bed_label,
      displayName: infant.display_name,
      gestationWeeks: infant.gestation_weeks,
      gestationDays: infant.gestation_days,
      ...ages(infant.birth_at, infant.gestation_weeks, infant.gestation_days, now),
      weightGrams: infant.weight_grams,
      heatSource: infant.heat_source,
      controlMode: latest?.controlMode ?? null,
      setCenti: latest?.setCenti ?? null,
      latest: {
        probe: latest?.probeCenti != null && latest.probeTakenAt ? { centi: latest.probeCenti, takenAt: latest.probeTakenAt } : null,
        remote: latest?.remoteCenti != null && latest.remoteTakenAt ? { centi: latest.remoteCenti, site: latest.remoteSite, takenAt: latest.remoteTakenAt } : null,
      },
      nextCheck: checks.remote,
      checks,
      attention: attentionOf(openFlags, checks),
      openFlags,
      skinToSkin: running
        ? { id: running.id, startedAt: new Date(running.started_at).toISOString(), referenceCenti: running.reference_centi, limitCenti: running.limit_centi }
        : null,
      assignedNurse: assigned ? { id: assigned.nurse_id, name: assigned.nurse_name } : null,
    });
  }
  return unique.map((id) => byId.get(id)).filter((s): s is InfantSummary => s !== undefined);
}

/**
 * The flowsheet's flags, as stored: every flag open now, or raised or resolved since `fromMs`,
 * newest first, with its actions, its current severity, its recheck clock, the escalation that
 * went out (if any) and, for a withdrawn flag, why and by which reading.
 */
const SEVERITY_RANK: Record<string, number> = { critical: 0, urgent: 1, caution: 2 };

export function storedFlowsheetFlags(sqlite: Database.Database, infantId: string, fromMs: number, now: Date): FlowsheetFlag[] {
  const db = dbOf(sqlite);
  const rows = db
    .select({
      id: flags.id,
      infantId: flags.infantId,
      key: flags.key,
      kind: flags.kind,
      raisedAt: flags.raisedAt,
      raisedByReadingId: flags.raisedByReadingId,
      detail: flags.detail,
      severity: flags.severity,
      closedAt: flagResolutions.closedAt,
      closedByReadingId: flagResolutions.closedByReadingId,
      how: flagResolutions.how,
    })
    .from(flags)
    .leftJoin(flagResolutions, eq(flagResolutions.flagId, flags.id))
    .where(and(eq(flags.infantId, infantId), or(isNull(flagResolutions.flagId), gte(flags.raisedAt, new Date(fromMs)), gte(flagResolutions.closedAt, new Date(fromMs)))))
    .orderBy(asc(flags.raisedAt), asc(flags.key))
    .all();
  const clock = db.select().from(infantClocks).where(eq(infantClocks.infantId, infantId)).get();
  const open = rows.filter((r) => r.closedAt === null);
  const sent = sentEscalations(sqlite, rows.map((r) => r.id));
  const openJson = new Map(openFlagsFromStore(open, clock, sent, now).map((f) => [f.id, f]));
  const ids = rows.map((r) => r.id);
  const acts = ids.length
    ? db
        .select({ id: actions.id, flagId: actions.flagId, kind: actions.kind, note: actions.note, at: actions.at, recordedBy: actions.recordedBy, name: users.name })
        .from(actions)
        .innerJoin(users, eq(users.id, actions.recordedBy))
        // An undone action (entered in error) no longer counts; the history still shows it.
        .leftJoin(actionUndos, eq(actionUndos.actionId, actions.id))
        .where(and(inArray(actions.flagId, ids), isNull(actionUndos.id)))
        .orderBy(asc(actions.at), asc(actions.createdAt))
        .all()
    : [];
  const withdrawals = ids.length
    ? db
        .select({ flagId: flagEvents.flagId, at: flagEvents.at, detail: flagEvents.detail })
        .from(flagEvents)
        .where(and(inArray(flagEvents.flagId, ids), eq(flagEvents.event, 'withdrawn')))
        .all()
    : [];
  const withdrawnBy = new Map(withdrawals.map((w) => [w.flagId, w]));
  return rows
    .map((r): FlowsheetFlag => {
      const live = openJson.get(r.id);
      const w = withdrawnBy.get(r.id);
      const why = w ? (JSON.parse(w.detail) as { reason?: string; readingId?: string | null }) : null;
      return {
        id: r.id,
        key: r.key,
        kind: r.kind,
        // A flag closed before its raising reading was corrected away is withdrawn too (an event).
        status: r.closedAt === null ? 'open' : r.how === 'withdrawn' || w ? 'withdrawn' : 'closed',
        raisedAt: r.raisedAt.toISOString(),
        raisedByReadingId: r.raisedByReadingId,
        closedAt: iso(r.closedAt),
        closedByReadingId: r.closedByReadingId,
        recheckDueAt: live?.recheckDueAt ?? null,
        recheck: live?.recheck ?? null,
        severity: live?.severity ?? r.severity ?? 'urgent',
        escalation: sent.get(r.id) ?? null,
        escalated: sent.has(r.id),
        detail: live ? live.detail : plainDetail(JSON.parse(r.detail)),
        how: r.how ?? null,
        withdrawn: w ? { reason: why?.reason ?? 'reading-corrected', readingId: why?.readingId ?? null, at: w.at.toISOString() } : null,
        actions: acts
          .filter((a) => a.flagId === r.id)
          .map((a) => ({ id: a.id, flagId: a.flagId, kind: a.kind, note: a.note, at: a.at.toISOString(), recordedBy: { id: a.recordedBy, name: a.name } })),
      };
    })
    .reverse()
    // Open flags first in severity order, as on the board; then the rest, newest first (stable sort).
    .sort((a, b) => (a.status === 'open' ? 0 : 1) - (b.status === 'open' ? 0 : 1) || (a.status === 'open' ? (SEVERITY_RANK[a.severity ?? 'urgent'] ?? 1) - (SEVERITY_RANK[b.severity ?? 'urgent'] ?? 1) : 0));
}
