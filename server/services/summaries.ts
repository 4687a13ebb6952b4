import { writeTx } from '../../db/client';
import type Database from 'better-sqlite3';
import { and, asc, eq, gte, inArray, isNotNull, isNull, or, sql } from 'drizzle-orm';
import { actions, actionUndos, assignments, beds, escalations, flagEvents, flagResolutions, flags, infantClocks, infants, skinToSkinSessions, units, users } from '../../db/schema';
import { dueStatus, needsAttention, worseSeverity, type EvaluatedFlag, type InfantEvaluation, type Severity } from '../../shared/thermal';
import { shiftAt } from '../../shared/shifts';
import type { CheckClocks, ClockStatus, EscalationSent, FlowsheetFlag, InfantSummary, NextCheck, OpenFlagSummary, RecheckClock } from '../../shared/types/bedside';
import type { ClockRow, StoredLatest, StoredOpenFlag } from './flag-lifecycle';
import { syncFlags } from './flags';
import { storedPlacements } from './placement';
import { jsonList, perConnection } from './prepared-queries';

const DAY_MS = 86_400_000;

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
  const candidates: CheckClocks['next'][] = [{ clock: 'remote', ...remote }];
  if (manual) candidates.push({ clock: 'manual', status: manual.status, dueAt: manual.dueAt, minutesLate: manual.minutesLate });
  for (const r of rechecks) candidates.push({ clock: 'recheck', status: r.status, dueAt: r.dueAt, minutesLate: r.minutesLate });
  const next = candidates.reduce((a, b) => {
    if (b.dueAt === null) return a;
    if (a.dueAt === null) return b;
    return Date.parse(b.dueAt) < Date.parse(a.dueAt) ? b : a;
  });
  return { remote, manual, rechecks, next: STATUS_RANK[next.status] <= STATUS_RANK[remote.status] ? next : { clock: 'remote', ...remote } };
}

/** A stored flag as the views read it. */
type StoredFlagRow = Pick<typeof flags.$inferSelect, 'id' | 'infantId' | 'key' | 'kind' | 'raisedAt' | 'raisedByReadingId' | 'detail' | 'severity'>;

const storedFlagColumns = {
  id: flags.id,
  infantId: flags.infantId,
  key: flags.key,
  kind: flags.kind,
  raisedAt: flags.raisedAt,
  raisedByReadingId: flags.raisedByReadingId,
  detail: flags.detail,
  severity: flags.severity,
};

/**
 * The summaries' reads, prepared: the board and the flowsheet run them on every build (bench
 * budget: "unit board" and "72-h flowsheet" req/s at least 50 % of the baseline route's).
 */
const summaryQueries = perConnection((db) => ({
  infants: db
    .select({
      id: infants.id,
      unitId: infants.unitId,
      bedId: infants.bedId,
      bedLabel: beds.label,
      displayName: infants.displayName,
      birthAt: infants.birthAt,
      gestationWeeks: infants.gestationWeeks,
      gestationDays: infants.gestationDays,
      weightGrams: infants.weightGrams,
      heatSource: infants.heatSource,
    })
    .from(infants)
    .leftJoin(beds, eq(beds.id, infants.bedId))
    .where(inArray(infants.id, jsonList('ids')))
    .prepare(),
  clocks: db
    .select()
    .from(infantClocks)
    .where(inArray(infantClocks.infantId, jsonList('ids')))
    .prepare(),
  units: db
    .select()
    .from(units)
    .where(inArray(units.id, jsonList('ids')))
    .prepare(),
  openFlags: db
    .select(storedFlagColumns)
    .from(flags)
    .leftJoin(flagResolutions, eq(flagResolutions.flagId, flags.id))
    .where(and(inArray(flags.infantId, jsonList('ids')), isNull(flagResolutions.flagId)))
    .orderBy(asc(flags.raisedAt), asc(flags.key))
    .prepare(),
  runningSessions: db
    .select({
      id: skinToSkinSessions.id,
      infantId: skinToSkinSessions.infantId,
      startedAt: skinToSkinSessions.startedAt,
      referenceCenti: skinToSkinSessions.referenceCenti,
      limitCenti: skinToSkinSessions.limitCenti,
    })
    .from(skinToSkinSessions)
    .where(and(inArray(skinToSkinSessions.infantId, jsonList('ids')), isNull(skinToSkinSessions.endedAt)))
    .orderBy(asc(skinToSkinSessions.startedAt))
    .prepare(),
  assignments: db
    .select({ infantId: assignments.infantId, shiftDate: assignments.shiftDate, shift: assignments.shift, nurseId: users.id, nurseName: users.name })
    .from(assignments)
    .innerJoin(users, eq(users.id, assignments.nurseId))
    .where(and(inArray(assignments.infantId, jsonList('ids')), gte(assignments.shiftDate, sql.placeholder('since'))))
    .orderBy(asc(assignments.createdAt), asc(assignments.id))
    .prepare(),
  sentEscalations: db
    .select({
      id: escalations.id,
      flagId: escalations.flagId,
      mailedAt: escalations.mailedAt,
      recipient: escalations.recipient,
      acknowledgedAt: escalations.acknowledgedAt,
      acknowledgedBy: escalations.acknowledgedBy,
      ackName: users.name,
      severity: escalations.severity,
    })
    .from(escalations)
    .leftJoin(users, eq(users.id, escalations.acknowledgedBy))
    .where(and(inArray(escalations.flagId, jsonList('ids')), isNotNull(escalations.mailedAt)))
    .orderBy(asc(escalations.escalatedAt), asc(escalations.mailedAt))
    .prepare(),
}));

/**
 * Escalations that actually went out, by flag id: the latest, with the ones before it (a flag
 * escalates again when it worsens) in `earlier`, oldest first.
 */
export function sentEscalations(sqlite: Database.Database, flagIds: string[]): Map<string, EscalationSent> {
  const out = new Map<string, EscalationSent>();
  if (flagIds.length === 0) return out;
  const rows = summaryQueries(sqlite).sentEscalations.all({ ids: JSON.stringify(flagIds) });
  for (const r of rows) {
    const { earlier: prior = [], ...before } = out.get(r.flagId) ?? {};
    out.set(r.flagId, {
      id: r.id,
      sentAt: r.mailedAt!.toISOString(),
      to: r.recipient ? (JSON.parse(r.recipient) as EscalationSent['to']) : [],
      how: 'email',
      acknowledgedAt: iso(r.acknowledgedAt),
      acknowledgedBy: r.acknowledgedBy ? { id: r.acknowledgedBy, name: r.ackName ?? '' } : null,
      ...(r.severity ? { severity: r.severity } : {}),
      ...('id' in before ? { earlier: [...prior, before] } : {}),
    });
  }
  return out;
}

/** The stored open flags of these infants (raised, neither closed nor withdrawn). */
function storedOpenFlags(sqlite: Database.Database, infantIds: string[]): StoredFlagRow[] {
  return summaryQueries(sqlite).openFlags.all({ ids: JSON.stringify(infantIds) });
}

/**
 * The open flags of one infant as stored: the flag row, what the last evaluation found about it
 * (current severity and detail, the recheck clock) and its escalation if one went out.
 */
export function openFlagsFromStore(rows: StoredFlagRow[], clock: ClockRow | undefined, sent: Map<string, EscalationSent>, now: Date): OpenFlagSummary[] {
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
  const q = summaryQueries(sqlite);

  const infantRows = q.infants.all({ ids });
  if (infantRows.length === 0) return [];

  const loadClocks = () => q.clocks.all({ ids });
  let clockRows = loadClocks();
  const missing = infantRows.filter((i) => !clockRows.some((c) => c.infantId === i.id));
  if (missing.length > 0 && !sqlite.inTransaction) {
    writeTx(sqlite, () => {
      for (const i of missing) syncFlags(sqlite, i.id, now, null);
    });
    clockRows = loadClocks();
  }
  const clocks = new Map(clockRows.map((c) => [c.infantId, c]));

  const unitRows = q.units.all({ ids: JSON.stringify([...new Set(infantRows.map((i) => i.unitId))]) });
  const unitById = new Map(unitRows.map((u) => [u.id, u]));

  const openRows = storedOpenFlags(sqlite, unique);
  const sent = sentEscalations(
    sqlite,
    openRows.map((r) => r.id),
  );
  const sessions = q.runningSessions.all({ ids });
  const assigned = q.assignments.all({ ids, since: new Date(now.getTime() - 2 * DAY_MS).toISOString().slice(0, 10) });

  const flagsBy = groupBy(openRows, (f) => f.infantId);
  const sessionsBy = groupBy(sessions, (s) => s.infantId);
  const assignmentsBy = groupBy(assigned, (a) => a.infantId);
  const slots = new Map(unitRows.map((u) => [u.id, shiftAt(now, { dayShiftStart: u.dayShiftStart, nightShiftStart: u.nightShiftStart, timeZone: u.timeZone })]));

  // The current placement and its prompt, as stored at write time (services/placement.ts).
  const placements = storedPlacements(sqlite, unique);
  const byId = new Map<string, InfantSummary>();
  for (const infant of infantRows) {
    const unit = unitById.get(infant.unitId)!;
    const clock = clocks.get(infant.id);
    const latest: StoredLatest | null = clock ? (JSON.parse(clock.latest) as StoredLatest) : null;
    const openFlags = openFlagsFromStore(flagsBy.get(infant.id) ?? [], clock, sent, now);
    const checks = checkClocks(clock, openFlags, now);
    const running = (sessionsBy.get(infant.id) ?? []).filter((s) => s.startedAt.getTime() <= now.getTime()).pop();
    const slot = slots.get(infant.unitId)!;
    const nurse = (assignmentsBy.get(infant.id) ?? []).filter((a) => a.shiftDate === slot.shiftDate && a.shift === slot.shift).pop();
    byId.set(infant.id, {
      id: infant.id,
      unitId: infant.unitId,
      timeZone: unit.timeZone,
      bedId: infant.bedId,
      bedLabel: infant.bedLabel,
      displayName: infant.displayName,
      gestationWeeks: infant.gestationWeeks,
      gestationDays: infant.gestationDays,
      ...ages(infant.birthAt.getTime(), infant.gestationWeeks, infant.gestationDays, now),
      weightGrams: infant.weightGrams,
      heatSource: infant.heatSource,
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
      skinToSkin: running ? { id: running.id, startedAt: running.startedAt.toISOString(), referenceCenti: running.referenceCenti, limitCenti: running.limitCenti } : null,
      assignedNurse: nurse ? { id: nurse.nurseId, name: nurse.nurseName } : null,
      placement: placements.get(infant.id) ?? null,
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

/** The flowsheet's reads, prepared: it is read on every poll (bench budget: "72-h flowsheet" req/s at least 50 % of the baseline's). */
const flowsheetQueries = perConnection((db) => ({
  flags: db
    .select({ ...storedFlagColumns, closedAt: flagResolutions.closedAt, closedByReadingId: flagResolutions.closedByReadingId, how: flagResolutions.how })
    .from(flags)
    .leftJoin(flagResolutions, eq(flagResolutions.flagId, flags.id))
    .where(
      and(
        eq(flags.infantId, sql.placeholder('infantId')),
        or(isNull(flagResolutions.flagId), gte(flags.raisedAt, sql.placeholder('fromMs')), gte(flagResolutions.closedAt, sql.placeholder('fromMs'))),
      ),
    )
    .orderBy(asc(flags.raisedAt), asc(flags.key))
    .prepare(),
  clock: db
    .select()
    .from(infantClocks)
    .where(eq(infantClocks.infantId, sql.placeholder('infantId')))
    .prepare(),
  actions: db
    .select({ id: actions.id, flagId: actions.flagId, kind: actions.kind, note: actions.note, at: actions.at, recordedBy: actions.recordedBy, name: users.name })
    .from(actions)
    .innerJoin(users, eq(users.id, actions.recordedBy))
    // An undone action (entered in error) no longer counts; the history still shows it.
    .leftJoin(actionUndos, eq(actionUndos.actionId, actions.id))
    .where(and(inArray(actions.flagId, jsonList('ids')), isNull(actionUndos.id)))
    .orderBy(asc(actions.at), asc(actions.createdAt))
    .prepare(),
  withdrawals: db
    .select({ flagId: flagEvents.flagId, at: flagEvents.at, detail: flagEvents.detail })
    .from(flagEvents)
    .where(and(inArray(flagEvents.flagId, jsonList('ids')), eq(flagEvents.event, 'withdrawn')))
    .prepare(),
}));

export function storedFlowsheetFlags(sqlite: Database.Database, infantId: string, fromMs: number, now: Date): FlowsheetFlag[] {
  const q = flowsheetQueries(sqlite);
  const rows = q.flags.all({ infantId, fromMs });
  const clock = q.clock.get({ infantId });
  const open = rows.filter((r) => r.closedAt === null);
  const sent = sentEscalations(
    sqlite,
    rows.map((r) => r.id),
  );
  const openJson = new Map(openFlagsFromStore(open, clock, sent, now).map((f) => [f.id, f]));
  const ids = JSON.stringify(rows.map((r) => r.id));
  const acts = rows.length ? q.actions.all({ ids }) : [];
  const withdrawals = rows.length ? q.withdrawals.all({ ids }) : [];
  const withdrawnBy = new Map(withdrawals.map((w) => [w.flagId, w]));
  return (
    rows
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
      .sort(
        (a, b) =>
          (a.status === 'open' ? 0 : 1) - (b.status === 'open' ? 0 : 1) ||
          (a.status === 'open' ? (SEVERITY_RANK[a.severity ?? 'urgent'] ?? 1) - (SEVERITY_RANK[b.severity ?? 'urgent'] ?? 1) : 0),
      )
  );
}
