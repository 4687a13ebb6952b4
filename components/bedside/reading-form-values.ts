import { TZDate } from '@date-fns/tz';
import type { CreateReadingInput } from '@/shared/schemas/bedside';
import { unusualReason } from '@/shared/plausibility';
import { toCentiCelsius, type TempUnit } from '@/shared/thermal/units';
import { LATE_ENTRY_MINUTES, type ControlMode, type HeatSign, type RemoteSite } from '@/shared/vocabulary';

/**
 * The reading form's values and the arithmetic on them. No zod here: the form's checks live in
 * reading-form-schema.ts, which the web build loads only when the form first validates.
 */

/** What the keypad gives: strings. Converted to the API's numbers on submit. */
export interface ReadingFormValues {
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
  /** Local time "HH:MM" in the unit's zone; empty means now. */
  time: string;
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

/** "HH:MM" today in the unit's zone (yesterday if that is still ahead of now). */
export function instantOfLocalTime(hhmm: string, now: Date, timeZone: string): Date | null {
  const m = /^([01]?\d|2[0-3])[:.]?([0-5]\d)$/.exec(hhmm.trim());
  if (!m) return null;
  const local = new TZDate(now.getTime(), timeZone);
  let at = new TZDate(local.getFullYear(), local.getMonth(), local.getDate(), Number(m[1]), Number(m[2]), 0, timeZone).getTime();
  if (at > now.getTime() + 2 * 60_000) at -= 86_400_000;
  return new Date(at);
}

export function isLate(values: Pick<ReadingFormValues, 'time'>, now: Date, timeZone: string): boolean {
  if (!values.time.trim()) return false;
  const at = instantOfLocalTime(values.time, now, timeZone);
  return at !== null && now.getTime() - at.getTime() > LATE_ENTRY_MINUTES * 60_000;
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
export function toCreateReading(v: ReadingFormValues, opts: { id: string; unit: TempUnit; now: Date; timeZone: string; confirmed: boolean }): CreateReadingInput & { takenAt: string } {
  const num = (s: string) => {
    const n = parseNumber(s);
    return typeof n === 'number' ? n : null;
  };
  const takenAt = v.time.trim() ? (instantOfLocalTime(v.time, opts.now, opts.timeZone) ?? opts.now) : opts.now;
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
  };
}
