import { z } from 'zod';
import { controlModeSchema, correctionReasonSchema, heatSignSchema, remoteSiteSchema } from '@/shared/schemas/bedside';
import { isThermalInputError } from '@/shared/thermal/errors';
import { checkPlausibility, HARD_LIMITS, type PlausibilityField } from '@/shared/thermal/limits';
import { toCentiCelsius, type TempUnit } from '@/shared/thermal/units';
import { FUTURE_TIME_MESSAGE, isFutureTime, isLateEntry, LATE_ENTRY_MINUTES, oneDecimalMessage } from '@/shared/chart-time';
import { parseNumber, takenAtOf, TEMPS, type ReadingFormValues } from './reading-form-values';
import { placementFormShape, refinePlacementForm } from './placement-form-schema';

/**
 * The reading and correction forms' checks: the same rules as the server's, with messages for
 * the keypad's strings. Loaded lazily (components/forms/lazy-resolver.ts), so zod stays out of
 * the first page.
 */

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
  time: z.string(),
  day: z.string(),
  lateReason: z.string().max(300),
  ...placementFormShape,
}) satisfies z.ZodType<ReadingFormValues>;

/** The new-reading form's schema. */
export function readingFormResolverSchema(unit: TempUnit, timeZone: string, now: () => Date) {
  return readingFormSchema.superRefine((v, ctx) => {
    refinePlacementForm(v, ctx);
    for (const [field, label] of TEMPS) {
      // One decimal place, as thermometers show it, judged on what she typed in her unit (the server's rule too).
      if (/^\d{1,3}[.,]\d{2,}$/.test(v[field].trim())) {
        ctx.addIssue({ code: 'custom', path: [field], message: oneDecimalMessage(label, unit) });
        continue;
      }
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
    for (const [field, label, { min, max }] of [
      ['heartRate', 'Heart rate', HARD_LIMITS.heartRate],
      ['heaterOutputPct', 'Heater output', HARD_LIMITS.heaterOutputPct],
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
    // The day is named, never guessed; a time ahead of the clock is refused as the server refuses it.
    const at = now();
    const taken = takenAtOf(v, at, timeZone);
    if (taken.kind === 'bad-time') ctx.addIssue({ code: 'custom', path: ['time'], message: 'Enter the time as HH:MM, like 14:30.' });
    else if (taken.kind === 'no-time') ctx.addIssue({ code: 'custom', path: ['time'], message: 'Enter the time it was taken on that day.' });
    else if (taken.kind === 'at') {
      if (isFutureTime(taken.at.getTime(), at.getTime())) ctx.addIssue({ code: 'custom', path: ['time'], message: FUTURE_TIME_MESSAGE });
      else if (isLateEntry(taken.at.getTime(), at.getTime()) && blank(v.lateReason)) {
        ctx.addIssue({ code: 'custom', path: ['lateReason'], message: `This time is more than ${LATE_ENTRY_MINUTES} minutes ago: say why it is charted late.` });
      }
    }
  });
}

/** A correction: the reason and a note, and (unless it was entered in error) a new version passing the same checks. */
export function correctReadingFormSchema(unit: TempUnit, timeZone: string, now: () => Date) {
  const values = readingFormResolverSchema(unit, timeZone, now);
  return readingFormSchema
    .extend({ reason: correctionReasonSchema, why: z.string().trim().min(1, 'Say briefly what was wrong.').max(500, 'Keep it under 500 characters.') })
    .superRefine((v, ctx) => {
      if (v.reason === 'entered-in-error') return;
      // The new version must pass the same checks as a new reading; the late-entry reason is the note.
      const parsed = values.safeParse({ ...v, lateReason: v.why || v.lateReason });
      if (!parsed.success) for (const issue of parsed.error.issues) ctx.addIssue({ code: 'custom', path: issue.path as string[], message: issue.message });
    });
}
