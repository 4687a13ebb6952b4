import { TZDate } from '@date-fns/tz';
import { z } from 'zod';
import { controlModeSchema, heatSignSchema, LATE_ENTRY_MINUTES, remoteSiteSchema, type CreateReadingInput } from '@/shared/schemas/bedside';
import { checkPlausibility, isThermalInputError, toCentiCelsius, type PlausibilityField, type TempUnit } from '@/shared/thermal';

/** What the keypad gives: strings. Converted to the API's numbers on submit. */
export const readingFormSchema = z.object({
  probe: z.string(),
  remote: z.string(),
  remoteSite: remoteSiteSchema.nullable(),
  air: z.string(),
  set: z.string(),
  controlMode: controlModeSchema.nullable(),
  heaterOutputPct: z.string(),
  heartRate: z.string(),
  heatSigns: z.array(heatSignSchema),
  note: z.string().max(1000, 'Keep the note under 1,000 characters.'),
  /** Local time "HH:MM" in the unit's zone; empty means now. */
  time: z.string(),
  lateReason: z.string().max(300),
});
export type ReadingFormValues = z.infer<typeof readingFormSchema>;

const NUMBER = /^\d{1,3}([.,]\d{1,2})?$/;
const TEMPS = [
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

/** The client schema: the same rules as the server's, with messages for the keypad's strings. */
export function readingFormResolverSchema(unit: TempUnit, timeZone: string, now: () => Date) {
  return readingFormSchema.superRefine((v, ctx) => {
    for (const [field, label] of TEMPS) {
      const n = parseNumber(v[field]);
      if (n === 'invalid') {
        ctx.addIssue({ code: 'custom', path: [field], message: `${label} must be a number, like ${unit === 'C' ? '36.8' : '98.2'}.` });
        continue;
      }
      if (n === null) continue;
      try {
        const centi = toCentiCelsius(n, unit, field);
        const check = checkPlausibility(field as PlausibilityField, centi, unit);
        if (check.result === 'refuse') ctx.addIssue({ code: 'custom', path: [field], message: check.reason });
      } catch (err) {
        ctx.addIssue({ code: 'custom', path: [field], message: isThermalInputError(err) ? `${label} ${err.message.replace(/^\S+ /, '')}.` : `${label} is not usable.` });
      }
    }
    for (const [field, label, min, max] of [
      ['heartRate', 'Heart rate', 30, 300],
      ['heaterOutputPct', 'Heater output', 0, 100],
    ] as const) {
      const n = parseNumber(v[field]);
      if (n === 'invalid' || (n !== null && (!Number.isInteger(n) || n < min || n > max))) {
        ctx.addIssue({ code: 'custom', path: [field], message: `${label} must be a whole number from ${min} to ${max}.` });
      }
    }
    const blank = (s: string) => s.trim() === '';
    if (blank(v.probe) && blank(v.remote) && blank(v.air) && blank(v.heartRate)) {
      ctx.addIssue({ code: 'custom', path: ['probe'], message: 'Enter at least one temperature or the heart rate.' });
    }
    if (!blank(v.remote) && !v.remoteSite) {
      ctx.addIssue({ code: 'custom', path: ['remoteSite'], message: 'Choose where the remote-site temperature was taken.' });
    }
    if (!blank(v.time)) {
      const at = instantOfLocalTime(v.time, now(), timeZone);
      if (!at) ctx.addIssue({ code: 'custom', path: ['time'], message: 'Enter the time as HH:MM, like 14:30.' });
      else if (isLate(v, now(), timeZone) && blank(v.lateReason)) {
        ctx.addIssue({ code: 'custom', path: ['lateReason'], message: `This time is more than ${LATE_ENTRY_MINUTES} minutes ago: say why it is charted late.` });
      }
    }
  });
}

/** Values outside the usual range, with the reason in the nurse's unit. */
export function implausibleReasons(v: ReadingFormValues, unit: TempUnit): string[] {
  const reasons: string[] = [];
  for (const [field] of TEMPS) {
    const centi = centiOf(v[field], unit);
    if (centi === null) continue;
    const check = checkPlausibility(field as PlausibilityField, centi, unit);
    if (check.result === 'confirm') reasons.push(check.reason);
  }
  const hr = parseNumber(v.heartRate);
  if (typeof hr === 'number') {
    const check = checkPlausibility('heartRate', hr, unit);
    if (check.result === 'confirm') reasons.push(check.reason);
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
