import { TZDate } from '@date-fns/tz';
import type { CreateReadingInput } from '@/shared/schemas/bedside';
import { isFutureTime, isLateEntry } from '@/shared/chart-time';
import { unusualReason } from '@/shared/plausibility';
import { toCentiCelsius, type TempUnit } from '@/shared/thermal/units';
import type { ControlMode, HeatSign, RemoteSite } from '@/shared/vocabulary';
import { localDayKey } from '@/components/ui/format-time';
import { placementBody, type PlacementFormValues } from './placement-values';

/**
 * The reading form's values and the arithmetic on them. No zod here: the form's checks live in
 * reading-form-schema.ts, which the web build loads only when the form first validates.
 */

/** What the keypad gives: strings. Converted to the API's numbers on submit. The probe's place, weight and humidity: placement-values.ts. */
export interface ReadingFormValues extends PlacementFormValues {
  probe: string;
  remote: string;
  remoteSite: RemoteSite | null;
  air: string;
  set: string;
  controlMode: ControlMode | null;
  heaterOutputPct: string;
  heartRate: string;
  heatSigns: HeatSign[];
  note: string;
  /** Local time "HH:MM" in the unit's zone, on `day`; empty means now. */
  time: string;
  /**
   * The day the time is on, named by the nurse, never guessed: "" for today (whatever today is
   * when she saves), or a calendar day in the unit's zone, "2026-11-15".
   */
  day: string;
  lateReason: string;
}

const NUMBER = /^\d{1,3}([.,]\d{1,2})?$/;
export const TEMPS = [
  ['probe', 'Probe temperature'],
  ['remote', 'Remote-site temperature'],
  ['air', 'Air temperature'],
  ['set', 'Set temperature'],
] as const;

export function parseNumber(text: string): number | null | 'invalid' {
  const t = text.trim();
  if (t === '') return null;
  if (!NUMBER.test(t)) return 'invalid';
  return Number(t.replace(',', '.'));
}

/** The typed temperature in hundredths of °C, or null when blank or not usable. */
export function centiOf(text: string, unit: TempUnit): number | null {
  const n = parseNumber(text);
  if (n === null || n === 'invalid') return null;
  try {
    return toCentiCelsius(n, unit);
  } catch {
    return null;
  }
}

const CLOCK = /^([01]?\d|2[0-3])[:.]?([0-5]\d)$/;
const DAY = /^(\d{4})-(\d{2})-(\d{2})$/;

/** "21:18", "2118" or "21.18" as hours and minutes; null if it is not a time of day. */
export function parseClock(hhmm: string): { hour: number; minute: number } | null {
  const m = CLOCK.exec(hhmm.trim());
  return m ? { hour: Number(m[1]), minute: Number(m[2]) } : null;
}

/** The calendar day the form means: its own choice, or today in the unit's zone. */
export function dayOf(values: Pick<ReadingFormValues, 'day'>, now: Date, timeZone: string): string {
  return values.day?.trim() || localDayKey(now, timeZone);
}

/**
 * "HH:MM" on a named calendar day ("2026-11-15"), in the unit's zone. Nothing is guessed: a time
 * later than now stays later than now (and is refused), whatever the hour.
 */
export function instantOfDayTime(day: string, hhmm: string, timeZone: string): Date | null {
  const clock = parseClock(hhmm);
  const d = DAY.exec(day);
  if (!clock || !d) return null;
  return new Date(new TZDate(Number(d[1]), Number(d[2]) - 1, Number(d[3]), clock.hour, clock.minute, 0, timeZone).getTime());
}

/** When the reading was taken, as the form says it: now when no time is entered. */
export type TakenAt = { kind: 'now' } | { kind: 'at'; at: Date } | { kind: 'no-time' } | { kind: 'bad-time' };

export function takenAtOf(values: Pick<ReadingFormValues, 'time' | 'day'>, now: Date, timeZone: string): TakenAt {
  const time = values.time?.trim() ?? '';
  // No time: now, unless she named another day (then the time is missing, not now).
  if (!time) return dayOf(values, now, timeZone) === localDayKey(now, timeZone) ? { kind: 'now' } : { kind: 'no-time' };
  const at = instantOfDayTime(dayOf(values, now, timeZone), time, timeZone);
  return at ? { kind: 'at', at } : { kind: 'bad-time' };
}

/** Later than now: refused by the form as by the server (shared/chart-time.ts, one rule). */
export function isFuture(values: Pick<ReadingFormValues, 'time' | 'day'>, now: Date, timeZone: string): boolean {
  const t = takenAtOf(values, now, timeZone);
  return t.kind === 'at' && isFutureTime(t.at.getTime(), now.getTime());
}

/** Charted late (more than LATE_ENTRY_MINUTES ago): a reason is asked for. */
export function isLate(values: Pick<ReadingFormValues, 'time' | 'day'>, now: Date, timeZone: string): boolean {
  const t = takenAtOf(values, now, timeZone);
  return t.kind === 'at' && isLateEntry(t.at.getTime(), now.getTime());
}

/** Values outside the usual range, with the reason in the nurse's unit. */
export function implausibleReasons(v: ReadingFormValues, unit: TempUnit): string[] {
  const reasons: string[] = [];
  for (const [field] of TEMPS) {
    const centi = centiOf(v[field], unit);
    if (centi === null) continue;
    // One table of usual ranges (shared/plausibility.ts); the set point by the control mode.
    const reason = unusualReason(field, centi, { unit, controlMode: v.controlMode });
    if (reason) reasons.push(reason);
  }
  const hr = parseNumber(v.heartRate);
  if (typeof hr === 'number') {
    const reason = unusualReason('heartRate', hr, { unit });
    if (reason) reasons.push(reason);
  }
  return reasons;
}

/** The API body for the form's values. */
export function toCreateReading(
  v: ReadingFormValues,
  opts: { id: string; unit: TempUnit; now: Date; timeZone: string; confirmed: boolean },
): CreateReadingInput & { takenAt: string } {
  const num = (s: string) => {
    const n = parseNumber(s);
    return typeof n === 'number' ? n : null;
  };
  const when = takenAtOf(v, opts.now, opts.timeZone);
  const takenAt = when.kind === 'at' ? when.at : opts.now;
  const late = isLate(v, opts.now, opts.timeZone);
  return {
    id: opts.id,
    unit: opts.unit,
    takenAt: takenAt.toISOString(),
    probe: num(v.probe),
    remote: num(v.remote),
    remoteSite: num(v.remote) === null ? null : v.remoteSite,
    air: num(v.air),
    set: num(v.set),
    controlMode: v.controlMode,
    heaterOutputPct: num(v.heaterOutputPct),
    heartRate: num(v.heartRate),
    heatSigns: v.heatSigns,
    note: v.note.trim() || null,
    lateReason: late ? v.lateReason.trim() : null,
    confirmedImplausible: opts.confirmed,
    ...placementBody(v),
  };
}
