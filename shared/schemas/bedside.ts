import { z } from 'zod';
import { safeNote, safeText } from './safe-text';
import { hasOneDecimalAtMost, oneDecimalMessage } from '../chart-time';
import { HARD_LIMITS } from '../thermal/limits';
import { ACTION_KINDS, CONTROL_MODES, HEAT_SIGNS, REMOTE_SITES } from '../vocabulary';
import { probeSiteSchema, readingExtraFields, refineRemoteSite } from './placement';

export { ACTION_KINDS } from '../vocabulary';

/** Values arrive as the nurse typed them, in her unit; the server converts to hundredths of °C. */
export const tempUnitSchema = z.enum(['C', 'F'], { error: 'Choose °C or °F.' });
export const remoteSiteSchema = z.enum(REMOTE_SITES, { error: 'Choose axilla, rectal or other.' });
export const controlModeSchema = z.enum(CONTROL_MODES, { error: 'Choose skin servo, air servo or manual.' });
export const heatSignSchema = z.enum(HEAT_SIGNS);

const temperature = (label: string) =>
  z
    .number({ error: `${label} must be a number.` })
    .refine(Number.isFinite, `${label} must be a number.`)
    .nullable()
    .optional();

const uuid = z.string().uuid({ error: 'Must be an id made by the app (a UUID).' });
const isoInstant = z.iso.datetime({ offset: true, error: 'Must be a date and time (ISO 8601).' });

/**
 * Temperatures as typed, to one decimal place in the unit the nurse used (thermometers show
 * one): more is refused, field by field. The readings import keeps its own rule (two decimals,
 * shared/uploads/csv-formats.ts): it reads other devices' exports.
 */
function oneDecimalTemperatures(
  v: { unit?: string; probe?: number | null; remote?: number | null; air?: number | null; set?: number | null },
  ctx: z.RefinementCtx,
  prefix: string[] = [],
): void {
  if (v.unit !== 'C' && v.unit !== 'F') return;
  for (const [field, label] of [
    ['probe', 'Probe temperature'],
    ['remote', 'Remote-site temperature'],
    ['air', 'Air temperature'],
    ['set', 'Set temperature'],
  ] as const) {
    const value = v[field];
    if (typeof value === 'number' && Number.isFinite(value) && !hasOneDecimalAtMost(value)) {
      ctx.addIssue({ code: 'custom', path: [...prefix, field], message: oneDecimalMessage(label, v.unit) });
    }
  }
}

/** What a reading holds, as typed: shared by a new reading and a correction's new version. */
const readingValueFields = {
  unit: tempUnitSchema,
  takenAt: isoInstant.optional(),
  probe: temperature('Probe temperature'),
  remote: temperature('Remote-site temperature'),
  remoteSite: remoteSiteSchema.nullable().optional(),
  air: temperature('Air temperature'),
  set: temperature('Set temperature'),
  controlMode: controlModeSchema.nullable().optional(),
  heaterOutputPct: z
    .number({ error: 'Heater output must be a number.' })
    .int('Use a whole percentage.')
    .min(HARD_LIMITS.heaterOutputPct.min, `At least ${HARD_LIMITS.heaterOutputPct.min} %.`)
    .max(HARD_LIMITS.heaterOutputPct.max, `At most ${HARD_LIMITS.heaterOutputPct.max} %.`)
    .nullable()
    .optional(),
  heartRate: z
    .number({ error: 'Heart rate must be a number.' })
    .int('Use whole beats per minute.')
    .min(HARD_LIMITS.heartRate.min, `Below ${HARD_LIMITS.heartRate.min}/min is not a plausible heart rate.`)
    .max(HARD_LIMITS.heartRate.max, `Above ${HARD_LIMITS.heartRate.max}/min is not a plausible heart rate.`)
    .nullable()
    .optional(),
  heatSigns: z.array(heatSignSchema).max(5).default([]),
  note: safeNote().max(1000, 'Keep the note under 1,000 characters.').nullable().optional(),
  /** The nurse confirmed a value outside the plausible range. */
  confirmedImplausible: z.boolean().default(false),
  /** The probe's site, cover and the infant's position (settings); current weight and incubator humidity. */
  ...readingExtraFields,
};

export const createReadingSchema = z
  .strictObject({
    id: uuid,
    ...readingValueFields,
    lateReason: safeNote().max(300, 'Keep the reason under 300 characters.').nullable().optional(),
  })
  .superRefine((v, ctx) => {
    oneDecimalTemperatures(v, ctx);
    if (v.probe == null && v.remote == null && v.air == null && v.heartRate == null) {
      ctx.addIssue({ code: 'custom', path: ['probe'], message: 'Enter at least one temperature or the heart rate.' });
    }
    if (v.remote != null && !v.remoteSite) {
      ctx.addIssue({ code: 'custom', path: ['remoteSite'], message: 'Choose where the remote-site temperature was taken.' });
    }
    refineRemoteSite(v, ctx);
  });
export type CreateReadingInput = z.input<typeof createReadingSchema>;
export type CreateReading = z.output<typeof createReadingSchema>;

export const correctionReasonSchema = z.enum(['corrected-value', 'entered-in-error', 'late-entry'], { error: 'Choose why it is being corrected.' });

/** A correction is a whole new version of the reading plus why. */
export const correctReadingSchema = z.strictObject({
  id: uuid,
  reason: correctionReasonSchema,
  note: safeNote().min(1, 'Say briefly what was wrong.').max(500, 'Keep the note under 500 characters.'),
  values: z
    .strictObject(readingValueFields)
    .superRefine((v, ctx) => oneDecimalTemperatures(v, ctx))
    .optional(),
});
export type CorrectReadingInput = z.input<typeof correctReadingSchema>;

export const createActionSchema = z
  .strictObject({
    id: uuid,
    kind: z.enum(ACTION_KINDS, { error: 'Choose what was done.' }),
    note: safeNote().max(500, 'Keep the note under 500 characters.').nullable().optional(),
    at: isoInstant.optional(),
    /** Where the probe went: required when it was moved, refused otherwise. */
    probeSite: probeSiteSchema.nullable().optional(),
  })
  .superRefine((v, ctx) => {
    if (v.kind === 'moved-probe' && v.probeSite == null) ctx.addIssue({ code: 'custom', path: ['probeSite'], message: 'Choose where the probe was moved to.' });
    if (v.kind !== 'moved-probe' && v.probeSite != null) ctx.addIssue({ code: 'custom', path: ['probeSite'], message: 'A probe site goes only with moving the probe.' });
    // "Something else (see note)": the note is what was done.
    if (v.kind === 'other' && !v.note?.trim()) ctx.addIssue({ code: 'custom', path: ['note'], message: 'Say what was done.' });
  });
export type CreateActionInput = z.input<typeof createActionSchema>;

/** Undo a mistaken action: it stays on record, marked entered in error. Idempotent by the client's id. */
export const undoActionSchema = z.strictObject({
  id: uuid,
  note: safeNote().max(300, 'Keep the note under 300 characters.').nullable().optional(),
});
export type UndoActionInput = z.input<typeof undoActionSchema>;

export const startSessionSchema = z.strictObject({
  id: uuid,
  unit: tempUnitSchema,
  reference: z.number({ error: 'Enter the reference temperature.' }).refine(Number.isFinite, 'Enter the reference temperature.'),
  limitCenti: z.union([z.literal(50), z.literal(100)], { error: 'Choose 0.5 °C or 1.0 °C.' }),
  carer: safeText().max(80, 'Keep the name under 80 characters.').nullable().optional(),
  startedAt: isoInstant.optional(),
});
export type StartSessionInput = z.input<typeof startSessionSchema>;

export const endSessionSchema = z.strictObject({ endedAt: isoInstant.optional() });

export const flowsheetQuerySchema = z.strictObject({
  hours: z.coerce
    .number()
    .int()
    .refine((h) => [12, 24, 72].includes(h), 'Choose 12, 24 or 72 hours.')
    .default(24),
});

export const infantListQuerySchema = z.strictObject({
  unitId: z.string().trim().min(1, 'Choose a unit.').max(100).optional(),
});
export type InfantListQuery = z.output<typeof infantListQuerySchema>;
export type FlowsheetQuery = z.output<typeof flowsheetQuerySchema>;
export type CorrectReading = z.output<typeof correctReadingSchema>;
export type CreateAction = z.output<typeof createActionSchema>;
export type StartSession = z.output<typeof startSessionSchema>;
export type EndSession = z.output<typeof endSessionSchema>;
