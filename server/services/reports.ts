import { TZDate } from '@date-fns/tz';
import type Database from 'better-sqlite3';
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
  const rows = sqlite
    .prepare(
      `SELECT r.infant_id, r.taken_at, i.admitted_at FROM readings r JOIN infants i ON i.id = r.infant_id
        WHERE r.unit_id = ? AND r.remote_centi IS NOT NULL AND r.entered_in_error = 0 AND r.taken_at < ?
          AND NOT EXISTS (SELECT 1 FROM readings c WHERE c.replaces_id = r.id)
        ORDER BY r.infant_id, r.taken_at`,
    )
    .all(w.unit.id, w.toMs) as Array<{ infant_id: string; taken_at: number; admitted_at: number }>;
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
    if (r.infant_id !== infant) {
      infant = r.infant_id;
      previous = r.admitted_at;
    }
    if (r.taken_at >= w.fromMs) {
      const then = at(r.taken_at);
      checks.push({
        takenAt: new Date(r.taken_at),
        dueAt: new Date(previous + at(previous).checkIntervalMinutes * MINUTE),
        times: { dayShiftStart: then.dayShiftStart, nightShiftStart: then.nightShiftStart, timeZone: then.timeZone },
      });
    }
    previous = r.taken_at;
  }
  return checks;
}

export function flagTimes(sqlite: Database.Database, w: UnitWindow): FlagTimes[] {
  const rows = sqlite
    .prepare(
      `SELECT f.kind, f.raised_at, (SELECT MIN(a.at) FROM actions a WHERE a.flag_id = f.id) AS first_action_at, fr.closed_at
         FROM flags f LEFT JOIN flag_resolutions fr ON fr.flag_id = f.id
        WHERE f.unit_id = ? AND f.raised_at >= ? AND f.raised_at < ? AND f.kind IN (${REPORT_KINDS.map((k) => `'${k}'`).join(', ')})
          AND (fr.how IS NULL OR fr.how <> 'withdrawn')
          AND NOT EXISTS (SELECT 1 FROM flag_events e WHERE e.flag_id = f.id AND e.event = 'withdrawn')
          -- a flag reopened later is counted once, as its continuing row
          AND NOT EXISTS (SELECT 1 FROM flag_events e WHERE e.infant_id = f.infant_id AND e.event = 'reopened' AND json_extract(e.detail, '$.previousFlagId') = f.id)`,
    )
    .all(w.unit.id, w.fromMs, w.toMs) as Array<{ kind: string; raised_at: number; first_action_at: number | null; closed_at: number | null }>;
  return rows.map((r) => ({
    kind: r.kind,
    raisedAt: new Date(r.raised_at),
    firstActionAt: r.first_action_at === null ? null : new Date(r.first_action_at),
    closedAt: r.closed_at === null ? null : new Date(r.closed_at),
  }));
}

function skinToSkinSessions(sqlite: Database.Database, w: UnitWindow): SkinToSkinSession[] {
  const sessions = sqlite
    .prepare('SELECT id, started_at, ended_at FROM skin_to_skin_sessions WHERE unit_id = ? AND started_at < ? AND (ended_at IS NULL OR ended_at > ?)')
    .all(w.unit.id, w.toMs, w.fromMs) as Array<{ id: string; started_at: number; ended_at: number | null }>;
  const deviations = sqlite
    .prepare(
      `SELECT f.detail, f.raised_at, fr.closed_at FROM flags f LEFT JOIN flag_resolutions fr ON fr.flag_id = f.id
        WHERE f.unit_id = ? AND f.kind = 'skin-to-skin-deviation' AND f.raised_at < ?`,
    )
    .all(w.unit.id, w.toMs) as Array<{ detail: string; raised_at: number; closed_at: number | null }>;
  return sessions.map((s) => ({
    id: s.id,
    start: new Date(s.started_at),
    end: s.ended_at === null ? null : new Date(s.ended_at),
    deviations: deviations
      .filter((d) => (JSON.parse(d.detail) as { sessionId?: string }).sessionId === s.id)
      .map((d) => ({ start: new Date(d.raised_at), end: d.closed_at === null ? null : new Date(d.closed_at) })),
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
