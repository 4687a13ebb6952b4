/**
 * A unit's thermal-care settings, with defaults.
 *
 * Each default names where it comes from: a published source (see README.md), "common
 * practice" (a fact of the trade with no single citation) or "from memory" (not yet read in a
 * source; review before relying on it). A unit changes these to match its own written policy.
 */

import { TZDate } from '@date-fns/tz';
import { requireTime, ThermalInputError } from './errors';
import { SEVERITY_CLASSES, type SeverityClass } from './severity';

export interface UnitPolicy {
  /** Minutes from one remote-site check to the next. */
  readonly checkIntervalMinutes: number;
  /** Minutes before a check is due when it shows as "due soon". */
  readonly dueSoonMinutes: number;
  /** Probe vs remote-site gap above which a gap flag is raised, hundredths of °C. */
  readonly gapLimitCenti: number;
  /** Heater output (%) at or above which manual mode counts as high output. */
  readonly highOutputPct: number;
  /** Minutes of high output in manual mode after which the manual-mode warning is raised. */
  readonly highOutputMinutes: number;
  /** In manual mode, minutes allowed between remote-site checks. */
  readonly manualCheckMinutes: number;
  /** Minutes an open flag may wait for a first action before it is escalated. */
  readonly escalationDelayMinutes: number;
  /** Minutes after an action by which a recheck is due. */
  readonly recheckMinutes: number;
  /**
   * Minutes after the first action on a flag before a reading counts as its recheck (the reading
   * must have settled after a change to the set temperature or the probe).
   */
  readonly recheckSettleMinutes: number;
  /**
   * Per-class escalation delays in minutes (null: never escalates). A class left out takes the
   * default of SEVERITY_TABLE (0 for the most severe, escalationDelayMinutes for the urgent ones,
   * never for mild cold stress).
   */
  readonly escalationDelays: Readonly<Partial<Record<SeverityClass, number | null>>>;
  /** Local start of the day shift, "HH:MM". */
  readonly dayShiftStart: string;
  /** Local start of the night shift, "HH:MM". */
  readonly nightShiftStart: string;
  /** IANA time zone of the unit, for shifts and local times (never for intervals). */
  readonly timeZone: string;
}

export const DEFAULT_POLICY: Readonly<UnitPolicy> = Object.freeze({
  // Common practice: at least every 2 hours on a servo-controlled heater (published ranges are
  // 1–3 h; hourly until stable per the Bedside Clinical Guidelines Partnership).
  checkIntervalMinutes: 120,
  // Common practice (a product choice, not a clinical rule).
  dueSoonMinutes: 15,
  // Common practice: more than 0.5 °C (0.9 °F) between probe and remote site.
  gapLimitCenti: 50,
  // From memory.
  highOutputPct: 80,
  // From memory (the device standards' manual-mode reminder every 15 min is also from memory).
  highOutputMinutes: 15,
  // ECRI, Infant Radiant Warmers Can Burn: Use with Care: check at least every 15 min in manual.
  manualCheckMinutes: 15,
  // From memory.
  escalationDelayMinutes: 30,
  // Common practice: recheck 15–30 minutes after an action; the later end by default.
  recheckMinutes: 30,
  // Common practice: a reading settles about 15–30 minutes after a change; the earlier end.
  recheckSettleMinutes: 15,
  // The defaults of SEVERITY_TABLE.
  escalationDelays: Object.freeze({}),
  // Common practice: two 12-hour shifts.
  dayShiftStart: '07:00',
  nightShiftStart: '19:00',
  // A default only; each unit sets its own.
  timeZone: 'Europe/London',
});

/**
 * Every clinical prompt carries this (or words to the same effect): the product does the
 * arithmetic and the clock-watching, the nurse decides.
 */
export const CLINICAL_PROMPT_CAVEAT = 'This prompt supports your judgment. ' + "It does not replace your unit's policy, the device's instructions or licensed practice.";

const TIME_OF_DAY = /^([01]\d|2[0-3]):([0-5]\d)$/;

function invalid(field: keyof UnitPolicy, message: string): ThermalInputError {
  return new ThermalInputError(field, 'invalid-policy', message);
}

function checkMinutes(policy: UnitPolicy, field: keyof UnitPolicy, allowZero: boolean): void {
  const value = policy[field];
  if (typeof value !== 'number' || !Number.isFinite(value) || value < 0 || (!allowZero && value === 0)) {
    throw invalid(field, `${field} must be a ${allowZero ? 'non-negative' : 'positive'} number of minutes`);
  }
}

/** Minutes after local midnight for "HH:MM". */
export function parseTimeOfDay(value: string, field = 'time'): number {
  const match = typeof value === 'string' ? TIME_OF_DAY.exec(value) : null;
  if (match === null) {
    throw new ThermalInputError(field, 'invalid-policy', `${field} must be a time of day as HH:MM`);
  }
  return Number(match[1]) * 60 + Number(match[2]);
}

// Building a DateTimeFormat costs about a millisecond; a board resolves the policy per infant.
const timeZoneValidity = new Map<string, boolean>();

export function isValidTimeZone(timeZone: unknown): boolean {
  if (typeof timeZone !== 'string' || timeZone === '') return false;
  let valid = timeZoneValidity.get(timeZone);
  if (valid === undefined) {
    try {
      new Intl.DateTimeFormat('en-GB', { timeZone });
      valid = true;
    } catch {
      valid = false;
    }
    timeZoneValidity.set(timeZone, valid);
  }
  return valid;
}

/** The defaults overlaid with a unit's settings, checked. Undefined settings keep the default. */
export function resolvePolicy(partial: Partial<UnitPolicy> = {}): UnitPolicy {
  const overrides = Object.fromEntries(Object.entries(partial ?? {}).filter(([key, value]) => value !== undefined && key in DEFAULT_POLICY)) as Partial<UnitPolicy>;
  const policy: UnitPolicy = { ...DEFAULT_POLICY, ...overrides };
  checkMinutes(policy, 'checkIntervalMinutes', false);
  checkMinutes(policy, 'dueSoonMinutes', true);
  checkMinutes(policy, 'highOutputMinutes', false);
  checkMinutes(policy, 'manualCheckMinutes', false);
  checkMinutes(policy, 'escalationDelayMinutes', false);
  checkMinutes(policy, 'recheckMinutes', false);
  checkMinutes(policy, 'recheckSettleMinutes', true);
  if (policy.recheckSettleMinutes > policy.recheckMinutes) {
    throw invalid('recheckSettleMinutes', 'recheckSettleMinutes must not be longer than recheckMinutes');
  }
  const delays = policy.escalationDelays;
  if (typeof delays !== 'object' || delays === null) throw invalid('escalationDelays', 'escalationDelays must be an object');
  for (const [cls, minutes] of Object.entries(delays)) {
    if (!(SEVERITY_CLASSES as string[]).includes(cls)) throw invalid('escalationDelays', `Unknown flag class: ${cls}`);
    if (minutes !== null && (typeof minutes !== 'number' || !Number.isFinite(minutes) || minutes < 0)) {
      throw invalid('escalationDelays', `escalationDelays.${cls} must be a non-negative number of minutes or null`);
    }
  }
  if (!Number.isSafeInteger(policy.gapLimitCenti) || policy.gapLimitCenti < 0) {
    throw invalid('gapLimitCenti', 'gapLimitCenti must be a non-negative whole number of hundredths of °C');
  }
  const pct = policy.highOutputPct;
  if (typeof pct !== 'number' || !(pct >= 0 && pct <= 100)) {
    throw invalid('highOutputPct', 'highOutputPct must be 0–100');
  }
  const day = parseTimeOfDay(policy.dayShiftStart, 'dayShiftStart');
  const night = parseTimeOfDay(policy.nightShiftStart, 'nightShiftStart');
  if (day >= night) {
    throw invalid('nightShiftStart', 'The night shift must start later in the day than the day shift');
  }
  if (!isValidTimeZone(policy.timeZone)) {
    throw invalid('timeZone', `Unknown time zone: ${String(policy.timeZone)}`);
  }
  return policy;
}

export type Shift = 'day' | 'night';

export interface ShiftWindow {
  readonly shift: Shift;
  readonly startsAt: Date;
  readonly endsAt: Date;
}

function localTime(year: number, month: number, day: number, minutes: number, timeZone: string): number {
  // TZDate normalises day overflow (day 0, day 32) the way Date does, in the unit's zone.
  return new TZDate(year, month, day, Math.floor(minutes / 60), minutes % 60, timeZone).getTime();
}

/**
 * The shift an instant falls in, by the unit's local clock: [day start, night start) is the day
 * shift, the rest the night shift. A shift that spans a change to or from summer time is an hour
 * shorter or longer in real time; its bounds stay at the local clock times.
 */
export function shiftAt(instant: Date, policy: Partial<UnitPolicy> = {}): ShiftWindow {
  const ms = requireTime(instant, 'instant');
  const { dayShiftStart, nightShiftStart, timeZone } = resolvePolicy(policy);
  const day = parseTimeOfDay(dayShiftStart);
  const night = parseTimeOfDay(nightShiftStart);
  const local = new TZDate(ms, timeZone);
  const [y, m, d] = [local.getFullYear(), local.getMonth(), local.getDate()];
  const dayStart = localTime(y, m, d, day, timeZone);
  const nightStart = localTime(y, m, d, night, timeZone);
  const window = (shift: Shift, startMs: number, endMs: number): ShiftWindow => ({
    shift,
    startsAt: new Date(startMs),
    endsAt: new Date(endMs),
  });
  if (ms >= nightStart) return window('night', nightStart, localTime(y, m, d + 1, day, timeZone));
  if (ms >= dayStart) return window('day', dayStart, nightStart);
  return window('night', localTime(y, m, d - 1, night, timeZone), dayStart);
}
