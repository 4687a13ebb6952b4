/**
 * The educator's report arithmetic: pure functions over plain values, shared by the server
 * (which loads the rows) and the client (which only draws the answer).
 *
 * Percentiles use the nearest-rank method: the P-th percentile of n sorted values is the value
 * at rank ceil(P / 100 × n) (1-based). It always returns a value that was observed, so a
 * 90th-percentile response time is one a nurse actually took. The median is the conventional
 * one (a spreadsheet's MEDIAN): the middle value, or for an even count the mean of the two
 * middle values (7.5 for 6, 7, 8, 9). Screens and CSV headers say so.
 */
import { shiftAt, type ShiftName, type ShiftTimes } from '../shifts';

export const MINUTE_MS = 60_000;

/** The P-th percentile (0 < P ≤ 100) by nearest rank; null for no values. */
export function percentileNearestRank(values: readonly number[], p: number): number | null {
  if (!(p > 0 && p <= 100)) throw new RangeError('The percentile must be above 0 and at most 100.');
  if (values.length === 0) return null;
  const sorted = [...values].sort((a, b) => a - b);
  const rank = Math.ceil((p / 100) * sorted.length);
  return sorted[Math.min(sorted.length, Math.max(1, rank)) - 1]!;
}

export function medianNearestRank(values: readonly number[]): number | null {
  return percentileNearestRank(values, 50);
}

/** The conventional median: the middle value, or the mean of the two middle values; null for none. */
export function median(values: readonly number[]): number | null {
  if (values.length === 0) return null;
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 === 1 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
}

/** How the screens name the median, so nobody takes it for the lower middle value. */
export const MEDIAN_WORDS = 'median (middle value; for an even count the mean of the two middle values)';

/** A share as a fraction 0–1, or null when there is nothing to divide by. */
export function rate(part: number, whole: number): number | null {
  return whole > 0 ? part / whole : null;
}

// ---------------------------------------------------------------------------------------------
// On-time remote-site checks
// ---------------------------------------------------------------------------------------------

export interface RemoteCheck {
  takenAt: Date;
  /**
   * When this check became overdue: the previous check (or admission) plus the interval.
   * A check taken at or before this instant was on time; a check after it was late.
   */
  dueAt: Date;
  /**
   * The shift times and zone in force when the check was taken (a settings version); the
   * report's own times when absent. A later change of zone or shifts never moves this check.
   */
  times?: ShiftTimes;
}

export interface OnTimeRow {
  checks: number;
  onTime: number;
  /** onTime / checks, or null with no checks. */
  rate: number | null;
}

export interface OnTimeReport {
  overall: OnTimeRow;
  byShift: (OnTimeRow & { shift: ShiftName })[];
  /** By the unit's local calendar date of the check, oldest first. */
  byDay: (OnTimeRow & { date: string })[];
}

export function isOnTime(check: RemoteCheck): boolean {
  return check.takenAt.getTime() <= check.dueAt.getTime();
}

function localDate(instant: Date, timeZone: string): string {
  // en-CA formats as YYYY-MM-DD.
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(instant);
}

function row(checks: number, onTime: number): OnTimeRow {
  return { checks, onTime, rate: rate(onTime, checks) };
}

export function onTimeReport(checks: readonly RemoteCheck[], times: ShiftTimes): OnTimeReport {
  const shift = { day: [0, 0], night: [0, 0] } as Record<ShiftName, [number, number]>;
  const days = new Map<string, [number, number]>();
  let total = 0;
  let onTime = 0;
  for (const check of checks) {
    const ok = isOnTime(check) ? 1 : 0;
    total += 1;
    onTime += ok;
    const own = check.times ?? times;
    const s = shiftAt(check.takenAt, own).shift;
    shift[s][0] += 1;
    shift[s][1] += ok;
    const date = localDate(check.takenAt, own.timeZone);
    const d = days.get(date) ?? [0, 0];
    d[0] += 1;
    d[1] += ok;
    days.set(date, d);
  }
  return {
    overall: row(total, onTime),
    byShift: (['day', 'night'] as const).map((s) => ({ shift: s, ...row(shift[s][0], shift[s][1]) })),
    byDay: [...days.entries()].sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)).map(([date, [c, o]]) => ({ date, ...row(c, o) })),
  };
}

// ---------------------------------------------------------------------------------------------
// Gap flags per 100 remote checks
// ---------------------------------------------------------------------------------------------

export interface GapRateReport {
  gapFlags: number;
  remoteChecks: number;
  /** Gap flags per 100 remote-site checks, or null with no checks. */
  per100: number | null;
}

export function gapFlagsPer100(gapFlags: number, remoteChecks: number): GapRateReport {
  return { gapFlags, remoteChecks, per100: remoteChecks > 0 ? (gapFlags * 100) / remoteChecks : null };
}

// ---------------------------------------------------------------------------------------------
// Response times
// ---------------------------------------------------------------------------------------------

export interface FlagTimes {
  kind: string;
  raisedAt: Date;
  firstActionAt: Date | null;
  closedAt: Date | null;
}

export interface DurationSummary {
  /** How many flags had the event (an action, a resolution). */
  count: number;
  medianMinutes: number | null;
  p90Minutes: number | null;
}

export interface ResponseTimesRow {
  kind: string;
  flags: number;
  toFirstAction: DurationSummary;
  toResolution: DurationSummary;
}

/** Whole-and-fractional minutes between two instants, never below zero (a back-dated action counts as 0). */
export function minutesBetween(from: Date, to: Date): number {
  return Math.max(0, (to.getTime() - from.getTime()) / MINUTE_MS);
}

export function summarise(minutes: readonly number[]): DurationSummary {
  return { count: minutes.length, medianMinutes: median(minutes), p90Minutes: percentileNearestRank(minutes, 90) };
}

export function responseTimes(flags: readonly FlagTimes[], kind = 'all'): ResponseTimesRow {
  const toAction: number[] = [];
  const toClose: number[] = [];
  for (const f of flags) {
    if (f.firstActionAt) toAction.push(minutesBetween(f.raisedAt, f.firstActionAt));
    if (f.closedAt) toClose.push(minutesBetween(f.raisedAt, f.closedAt));
  }
  return { kind, flags: flags.length, toFirstAction: summarise(toAction), toResolution: summarise(toClose) };
}

/** One row for all flags, then one per kind present (in the order given). */
export function responseTimesByKind(flags: readonly FlagTimes[], kinds: readonly string[]): ResponseTimesRow[] {
  return [
    responseTimes(flags, 'all'),
    ...kinds.map((k) =>
      responseTimes(
        flags.filter((f) => f.kind === k),
        k,
      ),
    ),
  ];
}

// ---------------------------------------------------------------------------------------------
// Skin-to-skin time with a deviation
// ---------------------------------------------------------------------------------------------

export interface Interval {
  start: Date;
  /** Null: still running; it is cut at the end of the report's range. */
  end: Date | null;
}

export interface SkinToSkinSession extends Interval {
  id: string;
  /** Deviation flags raised in this session: from raised to closed. */
  deviations: Interval[];
}

export interface SkinToSkinReport {
  sessions: number;
  sessionMinutes: number;
  deviationMinutes: number;
  /** deviationMinutes / sessionMinutes, or null with no session time. */
  share: number | null;
}

function clip(i: Interval, from: number, to: number): [number, number] | null {
  const s = Math.max(i.start.getTime(), from);
  const e = Math.min(i.end ? i.end.getTime() : to, to);
  return e > s ? [s, e] : null;
}

/** Length of the union of intervals (so two overlapping deviations are not counted twice). */
function unionLength(parts: [number, number][]): number {
  const sorted = [...parts].sort((a, b) => a[0] - b[0]);
  let total = 0;
  let cur: [number, number] | null = null;
  for (const p of sorted) {
    if (!cur || p[0] > cur[1]) {
      if (cur) total += cur[1] - cur[0];
      cur = [p[0], p[1]];
    } else cur[1] = Math.max(cur[1], p[1]);
  }
  if (cur) total += cur[1] - cur[0];
  return total;
}

/**
 * Share of skin-to-skin time spent with a deviation flag open, within [from, to). A deviation
 * counts only while its session runs.
 */
export function skinToSkinDeviationShare(sessions: readonly SkinToSkinSession[], from: Date, to: Date): SkinToSkinReport {
  const lo = from.getTime();
  const hi = to.getTime();
  let sessionMs = 0;
  let deviationMs = 0;
  let counted = 0;
  for (const s of sessions) {
    const span = clip(s, lo, hi);
    if (!span) continue;
    counted += 1;
    sessionMs += span[1] - span[0];
    const parts = s.deviations.map((d) => clip(d, span[0], span[1])).filter((p): p is [number, number] => p !== null);
    deviationMs += unionLength(parts);
  }
  const sessionMinutes = sessionMs / MINUTE_MS;
  const deviationMinutes = deviationMs / MINUTE_MS;
  return { sessions: counted, sessionMinutes, deviationMinutes, share: rate(deviationMinutes, sessionMinutes) };
}

// ---------------------------------------------------------------------------------------------
// The whole report and its tables
// ---------------------------------------------------------------------------------------------

export interface UnitReport {
  unitId: string;
  from: string;
  to: string;
  onTime: OnTimeReport;
  gapRate: GapRateReport;
  responseTimes: ResponseTimesRow[];
  skinToSkin: SkinToSkinReport;
  /** Changes of the unit's settings inside the range: each judgement before one kept the settings then. */
  settingsChanges?: { effectiveFrom: string; checkIntervalMinutes: number; timeZone: string; dayShiftStart: string; nightShiftStart: string }[];
}

/** A percentage for a table cell, one decimal; a dash for "no data". */
export function formatPercent(value: number | null): string {
  return value === null ? '—' : `${(Math.round(value * 1000) / 10).toFixed(1)} %`;
}

export function formatMinutes(value: number | null): string {
  return value === null ? '—' : `${Math.round(value)} min`;
}

export interface ReportTable {
  name: 'on-time-by-shift' | 'on-time-by-day' | 'gap-rate' | 'response-times' | 'skin-to-skin';
  title: string;
  header: string[];
  rows: (string | number | null)[][];
}

const pct = (v: number | null) => (v === null ? null : Math.round(v * 1000) / 10);
const round1 = (v: number | null) => (v === null ? null : Math.round(v * 10) / 10);

/** The report as the tables the screen shows and the CSV files hold (percentages 0–100, one decimal). */
export function reportTables(report: UnitReport): ReportTable[] {
  return [
    {
      name: 'on-time-by-shift',
      title: 'On-time remote-site checks by shift',
      header: ['shift', 'checks', 'on_time', 'on_time_pct'],
      rows: [
        ...report.onTime.byShift.map((r) => [r.shift, r.checks, r.onTime, pct(r.rate)]),
        ['all', report.onTime.overall.checks, report.onTime.overall.onTime, pct(report.onTime.overall.rate)],
      ],
    },
    {
      name: 'on-time-by-day',
      title: 'On-time remote-site checks by day',
      header: ['date', 'checks', 'on_time', 'on_time_pct'],
      rows: report.onTime.byDay.map((r) => [r.date, r.checks, r.onTime, pct(r.rate)]),
    },
    {
      name: 'gap-rate',
      title: 'Gap flags per 100 remote-site checks',
      header: ['gap_flags', 'remote_checks', 'per_100_checks'],
      rows: [[report.gapRate.gapFlags, report.gapRate.remoteChecks, round1(report.gapRate.per100)]],
    },
    {
      name: 'response-times',
      title: 'Minutes from flag to first action and to resolution (median: mean of the two middle values for an even count; 90th: nearest rank)',
      header: ['kind', 'flags', 'with_action', 'median_to_action_min', 'p90_to_action_min', 'resolved', 'median_to_resolution_min', 'p90_to_resolution_min'],
      rows: report.responseTimes.map((r) => [
        r.kind,
        r.flags,
        r.toFirstAction.count,
        round1(r.toFirstAction.medianMinutes),
        round1(r.toFirstAction.p90Minutes),
        r.toResolution.count,
        round1(r.toResolution.medianMinutes),
        round1(r.toResolution.p90Minutes),
      ]),
    },
    {
      name: 'skin-to-skin',
      title: 'Skin-to-skin time with a deviation',
      header: ['sessions', 'session_min', 'deviation_min', 'deviation_pct'],
      rows: [[report.skinToSkin.sessions, round1(report.skinToSkin.sessionMinutes), round1(report.skinToSkin.deviationMinutes), pct(report.skinToSkin.share)]],
    },
  ];
}

export const REPORT_TABLE_NAMES: readonly ReportTable['name'][] = ['on-time-by-shift', 'on-time-by-day', 'gap-rate', 'response-times', 'skin-to-skin'];

// ---------------------------------------------------------------------------------------------
// Trends: a range of local dates cut into weeks (Monday to Sunday) or calendar months
// ---------------------------------------------------------------------------------------------

export interface DatePeriod {
  /** "2026-11" for a month; "week of 2026-11-16" (its Monday) for a week. */
  label: string;
  from: string;
  to: string;
}

const dayMs = 86_400_000;
const ymd = (ms: number) => new Date(ms).toISOString().slice(0, 10);

/** The weeks or months that meet [from, to] (local dates, inclusive), each cut to the range, oldest first. */
export function periodsOf(from: string, to: string, by: 'week' | 'month'): DatePeriod[] {
  const end = Date.parse(`${to}T00:00:00Z`);
  let cursor = Date.parse(`${from}T00:00:00Z`);
  const out: DatePeriod[] = [];
  while (cursor <= end) {
    const d = new Date(cursor);
    let start: number;
    let next: number;
    let label: string;
    if (by === 'month') {
      start = Date.UTC(d.getUTCFullYear(), d.getUTCMonth(), 1);
      next = Date.UTC(d.getUTCFullYear(), d.getUTCMonth() + 1, 1);
      label = ymd(start).slice(0, 7);
    } else {
      start = cursor - ((d.getUTCDay() + 6) % 7) * dayMs; // back to Monday
      next = start + 7 * dayMs;
      label = `week of ${ymd(start)}`;
    }
    out.push({ label, from: ymd(Math.max(start, cursor)), to: ymd(Math.min(next - dayMs, end)) });
    cursor = next;
  }
  return out;
}
