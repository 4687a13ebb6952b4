import { TZDate } from '@date-fns/tz';
import type Database from 'better-sqlite3';
import { and, asc, eq, gt, gte, inArray, isNotNull, isNull, lt, min, ne, notExists, or, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/sqlite-core';
import { drizzleOf } from '../../db/client';
import { actions, flagEvents, flagResolutions, flags as flagsTable, infants, readings, skinToSkinSessions as sessionsTable } from '../../db/schema';
import {
  gapFlagsPer100,
  onTimeReport,
  periodsOf,
  responseTimes,
  responseTimesByKind,
  type DatePeriod,
  skinToSkinDeviationShare,
  type FlagTimes,
  type RemoteCheck,
  type SkinToSkinSession,
  type UnitReport,
} from '../../shared/reports';
import { REVIEW_KINDS, type CompareQuery, type TrendQuery, type UnitRangeQuery } from '../../shared/schemas/review';
import type { CompareResponse, PeriodFigures, TrendResponse } from '../../shared/types/review';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { notFound } from '../errors';
import { resolvePolicy } from '../../shared/thermal';
import { dbOf, loadPolicyVersions, policyChangesBetween, versionAt } from './flag-lifecycle';
import { loadUnitRow, policyForUnit, type UnitRow } from './flags';

const MINUTE = 60_000;

/** The flag kinds a report counts: the review queue's, plus cold stress and fever. */
export const REPORT_KINDS: readonly string[] = [...new Set<string>([...REVIEW_KINDS, 'cold-stress', 'fever'])];

/** The stored flag kinds a report counts. */
const COUNTED_KINDS = flagsTable.kind.enumValues.filter((k) => REPORT_KINDS.includes(k));

export interface UnitWindow {
  unit: UnitRow;
  fromMs: number;
  toMs: number;
}

/** Local midnight at the start of `date` in the zone. */
export function localMidnight(date: string, timeZone: string): number {
  const [y, m, d] = date.split('-').map(Number);
  return new TZDate(y!, m! - 1, d!, 0, 0, 0, timeZone).getTime();
}

/** [from 00:00, the day after `to` 00:00) in the unit's zone. */
export function unitWindow(sqlite: Database.Database, query: UnitRangeQuery): UnitWindow {
  const unit = loadUnitRow(sqlite, query.unitId);
  if (!unit) throw notFound('That unit');
  const [y, m, d] = query.to.split('-').map(Number);
  const next = new Date(Date.UTC(y!, m! - 1, d! + 1)).toISOString().slice(0, 10);
  // A local date means midnight in the zone in force on that date: a later change of the unit's
  // zone never moves the range of an earlier report.
  const versions = loadPolicyVersions(dbOf(sqlite), unit.id);
  const midnight = (date: string) => {
    const guess = localMidnight(date, unit.timeZone);
    const v = versionAt(versions, guess);
    const zone = v ? resolvePolicy(v.policy).timeZone : unit.timeZone;
    return zone === unit.timeZone ? guess : localMidnight(date, zone);
  };
  return { unit, fromMs: midnight(query.from), toMs: midnight(next) };
}

/**
 * Every current remote-site check in the window with the instant it would have become overdue:
 * the infant's previous current check (or admission) plus the unit's check interval.
 */
export function remoteChecks(sqlite: Database.Database, w: UnitWindow): RemoteCheck[] {
  const correction = alias(readings, 'correction');
  const rows = drizzleOf(sqlite)
    .select({ infantId: readings.infantId, takenAt: readings.takenAt, admittedAt: infants.admittedAt })
    .from(readings)
    .innerJoin(infants, eq(infants.id, readings.infantId))
    // Current versions only: a reading no later row corrects.
    .leftJoin(correction, eq(correction.replacesId, readings.id))
    .where(and(eq(readings.unitId, w.unit.id), isNotNull(readings.remoteCenti), eq(readings.enteredInError, false), lt(readings.takenAt, new Date(w.toMs)), isNull(correction.id)))
    .orderBy(asc(readings.infantId), asc(readings.takenAt))
    .all();
  // Each check is judged by the settings in force at the check before it (its due time) and
  // counted in the shift of the settings in force when it was taken: a change never rewrites
  // an earlier judgement.
  const versions = loadPolicyVersions(dbOf(sqlite), w.unit.id);
  const base = policyForUnit(w.unit);
  const at = (ms: number) => {
    const v = versionAt(versions, ms);
    return v ? resolvePolicy(v.policy) : base;
  };
  const checks: RemoteCheck[] = [];
  let infant = '';
  let previous = 0;
  for (const r of rows) {
    const takenMs = r.takenAt.getTime();
    if (r.infantId !== infant) {
      infant = r.infantId;
      previous = r.admittedAt.getTime();
    }
    if (takenMs >= w.fromMs) {
      const then = at(takenMs);
      checks.push({
        takenAt: r.takenAt,
        dueAt: new Date(previous + at(previous).checkIntervalMinutes * MINUTE),
        times: { dayShiftStart: then.dayShiftStart, nightShiftStart: then.nightShiftStart, timeZone: then.timeZone },
      });
    }
    previous = takenMs;
  }
  return checks;
}

export function flagTimes(sqlite: Database.Database, w: UnitWindow): FlagTimes[] {
  const db = drizzleOf(sqlite);
  const firstActions = db
    .select({ flagId: actions.flagId, at: min(actions.at).as('first_action_at') })
    .from(actions)
    .groupBy(actions.flagId)
    .as('first_actions');
  const withdrawn = db
    .select({ id: flagEvents.id })
    .from(flagEvents)
    .where(and(eq(flagEvents.flagId, flagsTable.id), eq(flagEvents.event, 'withdrawn')));
  // A flag reopened later is counted once, as its continuing row.
  const reopened = db
    .select({ id: flagEvents.id })
    .from(flagEvents)
    // sql fragment: the reopened event names the row before it inside its JSON detail, and Drizzle has no JSON path operator for SQLite.
    .where(and(eq(flagEvents.infantId, flagsTable.infantId), eq(flagEvents.event, 'reopened'), eq(sql`json_extract(${flagEvents.detail}, '$.previousFlagId')`, flagsTable.id)));
  return db
    .select({ kind: flagsTable.kind, raisedAt: flagsTable.raisedAt, firstActionAt: firstActions.at, closedAt: flagResolutions.closedAt })
    .from(flagsTable)
    .leftJoin(flagResolutions, eq(flagResolutions.flagId, flagsTable.id))
    .leftJoin(firstActions, eq(firstActions.flagId, flagsTable.id))
    .where(
      and(
        eq(flagsTable.unitId, w.unit.id),
        gte(flagsTable.raisedAt, new Date(w.fromMs)),
        lt(flagsTable.raisedAt, new Date(w.toMs)),
        inArray(flagsTable.kind, COUNTED_KINDS),
        or(isNull(flagResolutions.how), ne(flagResolutions.how, 'withdrawn')),
        notExists(withdrawn),
        notExists(reopened),
      ),
    )
    .all();
}

function skinToSkinSessions(sqlite: Database.Database, w: UnitWindow): SkinToSkinSession[] {
  const db = drizzleOf(sqlite);
  const sessions = db
    .select({ id: sessionsTable.id, start: sessionsTable.startedAt, end: sessionsTable.endedAt })
    .from(sessionsTable)
    .where(
      and(eq(sessionsTable.unitId, w.unit.id), lt(sessionsTable.startedAt, new Date(w.toMs)), or(isNull(sessionsTable.endedAt), gt(sessionsTable.endedAt, new Date(w.fromMs)))),
    )
    .all();
  const deviations = db
    .select({ detail: flagsTable.detail, start: flagsTable.raisedAt, end: flagResolutions.closedAt })
    .from(flagsTable)
    .leftJoin(flagResolutions, eq(flagResolutions.flagId, flagsTable.id))
    .where(and(eq(flagsTable.unitId, w.unit.id), eq(flagsTable.kind, 'skin-to-skin-deviation'), lt(flagsTable.raisedAt, new Date(w.toMs))))
    .all();
  return sessions.map((s) => ({
    ...s,
    deviations: deviations.filter((d) => (JSON.parse(d.detail) as { sessionId?: string }).sessionId === s.id).map((d) => ({ start: d.start, end: d.end })),
  }));
}

/** The unit's report for a range of local dates. A running session is counted up to now. */
export function unitReport(ctx: AppContext, query: UnitRangeQuery, actorId: string | null): UnitReport {
  const { sqlite } = ctx.database;
  const w = unitWindow(sqlite, query);
  const checks = remoteChecks(sqlite, w);
  const flags = flagTimes(sqlite, w);
  const end = Math.min(w.toMs, ctx.clock.now().getTime());
  const report: UnitReport = {
    unitId: w.unit.id,
    from: query.from,
    to: query.to,
    onTime: onTimeReport(checks, { dayShiftStart: w.unit.dayShiftStart, nightShiftStart: w.unit.nightShiftStart, timeZone: w.unit.timeZone }),
    gapRate: gapFlagsPer100(flags.filter((f) => f.kind === 'gap').length, checks.length),
    responseTimes: responseTimesByKind(flags, REPORT_KINDS),
    skinToSkin: skinToSkinDeviationShare(skinToSkinSessions(sqlite, w), new Date(w.fromMs), new Date(Math.max(end, w.fromMs))),
    settingsChanges: policyChangesBetween(dbOf(sqlite), w.unit.id, new Date(w.fromMs), new Date(w.toMs)).map((c) => ({
      effectiveFrom: c.effectiveFrom,
      checkIntervalMinutes: c.settings.checkIntervalMinutes,
      timeZone: c.settings.timeZone,
      dayShiftStart: c.settings.dayShiftStart,
      nightShiftStart: c.settings.nightShiftStart,
    })),
  };
  sqlite
    .transaction(() => appendAudit(sqlite, { at: ctx.clock.now(), actorId, action: 'report-read', entityType: 'unit', entityId: w.unit.id, unitId: w.unit.id, after: query }))
    .immediate();
  return report;
}

/** A unit's headline figures for one range of local dates (no audit: the caller audits the read once). */
export function periodFigures(ctx: AppContext, unitId: string, period: DatePeriod): PeriodFigures {
  const { sqlite } = ctx.database;
  const w = unitWindow(sqlite, { unitId, from: period.from, to: period.to });
  const checks = remoteChecks(sqlite, w);
  const flags = flagTimes(sqlite, w);
  const on = onTimeReport(checks, { dayShiftStart: w.unit.dayShiftStart, nightShiftStart: w.unit.nightShiftStart, timeZone: w.unit.timeZone }).overall;
  const gap = gapFlagsPer100(flags.filter((f) => f.kind === 'gap').length, checks.length);
  const all = responseTimes(flags);
  return {
    label: period.label,
    from: period.from,
    to: period.to,
    checks: on.checks,
    onTime: on.onTime,
    onTimeRate: on.rate,
    flags: flags.length,
    gapFlags: gap.gapFlags,
    gapPer100: gap.per100,
    medianMinutesToAction: all.toFirstAction.medianMinutes,
    medianMinutesToResolution: all.toResolution.medianMinutes,
  };
}

function auditReportRead(ctx: AppContext, actorId: string, unitId: string, after: Record<string, unknown>) {
  const { sqlite } = ctx.database;
  sqlite.transaction(() => appendAudit(sqlite, { at: ctx.clock.now(), actorId, action: 'report-read', entityType: 'unit', entityId: unitId, unitId, after })).immediate();
}

/** The unit's figures week by week or month by month over the range. */
export function unitTrends(ctx: AppContext, query: TrendQuery, actorId: string): TrendResponse {
  const periods = periodsOf(query.from, query.to, query.by).map((p) => periodFigures(ctx, query.unitId, p));
  auditReportRead(ctx, actorId, query.unitId, { ...query, view: 'trends' });
  return { unitId: query.unitId, by: query.by, periods };
}

/** Two periods of the unit side by side. */
export function comparePeriods(ctx: AppContext, query: CompareQuery, actorId: string): CompareResponse {
  const a = periodFigures(ctx, query.unitId, { label: `${query.aFrom} to ${query.aTo}`, from: query.aFrom, to: query.aTo });
  const b = periodFigures(ctx, query.unitId, { label: `${query.bFrom} to ${query.bTo}`, from: query.bFrom, to: query.bTo });
  auditReportRead(ctx, actorId, query.unitId, { ...query, view: 'compare' });
  return { unitId: query.unitId, a, b };
}
