import { z } from 'zod';
import { safeNote, safeText } from './safe-text';
import { CONTROL_MODES, DISCHARGE_DESTINATION_ALLOWED, DISCHARGE_DESTINATION_REQUIRED, DISCHARGE_REASONS, HEAT_SOURCES, INFANT_SEXES } from '../vocabulary';
import { infantPositionSchema, placementFields, probeSiteSchema } from './placement';

/**
 * The charge nurse's unit work: admissions, moves, discharges, assignments and escalation
 * acknowledgements. The same schemas check the forms on the client and the bodies on the server.
 */

export { CONTROL_MODES, HEAT_SOURCES, INFANT_SEXES } from '../vocabulary';

const heatSource = z.enum(HEAT_SOURCES, { error: 'Choose a heat source.' });
const controlMode = z.enum(CONTROL_MODES, { error: 'Choose skin servo, air servo or manual.' });
const id = (what: string) =>
  z
    .string({ error: `Choose ${what}.` })
    .trim()
    .min(1, `Choose ${what}.`)
    .max(100);

/** The hospital's number for the infant: letters, digits, '-' and '/', as printed on the wristband. */
const hospitalNumber = z
  .string({ error: 'Enter the hospital number.' })
  .trim()
  .min(3, 'Enter the hospital number (at least 3 characters).')
  .max(30, 'A hospital number has at most 30 characters.')
  .regex(/^[A-Za-z0-9][A-Za-z0-9\-/]*$/, 'Use letters, digits, - and / only.');
const sex = z.enum(INFANT_SEXES, { error: 'Choose female, male, indeterminate or not known.' });

/** Form inputs arrive as text; the API accepts numbers. Both pass through here. */
const wholeNumber = (label: string, min: number, max: number, unit = '') =>
  z.coerce
    .number({ error: `${label} must be a number.` })
    .refine(Number.isFinite, `${label} must be a number.`)
    .refine(Number.isInteger, `${label} must be a whole number.`)
    .refine((v) => v >= min, `${label} must be at least ${min}${unit}.`)
    .refine((v) => v <= max, `${label} must be at most ${max}${unit}.`);

export const admitInfantSchema = z
  .strictObject({
    bedId: id('a bed'),
    displayName: safeText({ error: 'Enter a display name.' }).min(1, 'Enter a display name.').max(60, 'Keep the display name under 60 characters.'),
    birthAt: z.iso.datetime({ offset: true, error: 'Enter the date and time of birth.' }),
    gestationWeeks: wholeNumber('Weeks', 22, 44),
    gestationDays: wholeNumber('Days', 0, 6),
    birthWeightGrams: wholeNumber('Birth weight', 300, 6500, ' g'),
    heatSource,
    controlMode,
    /** The set temperature as typed, in `tempUnit`. */
    setTemperature: z.coerce.number({ error: 'Set temperature must be a number.' }).refine(Number.isFinite, 'Set temperature must be a number.'),
    tempUnit: z.enum(['C', 'F'], { error: 'Choose °C or °F.' }).default('C'),
    hospitalNumber: hospitalNumber.optional(),
    sex: sex.optional(),
    /** Where the probe sits, its cover and the infant's position on admission (charted with the admission's settings). */
    ...placementFields,
  })
  .superRefine((v, ctx) => {
    const celsius = v.tempUnit === 'F' ? ((v.setTemperature - 32) * 5) / 9 : v.setTemperature;
    if (!(celsius >= 25 && celsius <= 39.5)) {
      ctx.addIssue({ code: 'custom', path: ['setTemperature'], message: 'A set temperature is between 25.0 and 39.5 °C (77.0–103.1 °F).' });
    }
  });
export type AdmitInfantInput = z.input<typeof admitInfantSchema>;
export type AdmitInfant = z.output<typeof admitInfantSchema>;

/** The admit form: birth date and time typed separately, read in the device's local time. */
export const admitFormSchema = z.object({
  displayName: safeText().min(1, 'Enter a display name.').max(60, 'Keep the display name under 60 characters.'),
  birthDate: z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'Use YYYY-MM-DD.'),
  birthTime: z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'Use HH:MM (24-hour).'),
  gestationWeeks: z
    .string()
    .regex(/^\d{2}$/, 'Weeks: 22 to 44.')
    .refine((v) => Number(v) >= 22 && Number(v) <= 44, 'Weeks: 22 to 44.'),
  gestationDays: z.string().regex(/^[0-6]$/, 'Days: 0 to 6.'),
  birthWeightGrams: z
    .string()
    .regex(/^\d{3,4}$/, 'Weight in grams, 300 to 6500.')
    .refine((v) => Number(v) >= 300 && Number(v) <= 6500, 'Weight in grams, 300 to 6500.'),
  heatSource,
  controlMode,
  setTemperature: z.string().regex(/^\d{2,3}([.,]\d{1,2})?$/, 'Enter a temperature such as 36.5.'),
  hospitalNumber,
  sex,
  probeSite: probeSiteSchema.nullable(),
  probeCovered: z.enum(['yes', 'no']).nullable(),
  position: infantPositionSchema.nullable(),
});
export type AdmitForm = z.infer<typeof admitFormSchema>;

export function admitFormToInput(form: AdmitForm, bedId: string, tempUnit: 'C' | 'F'): AdmitInfantInput {
  const birth = new Date(`${form.birthDate}T${form.birthTime}:00`);
  return {
    bedId,
    displayName: form.displayName,
    birthAt: Number.isNaN(birth.getTime()) ? form.birthDate : birth.toISOString(),
    gestationWeeks: Number(form.gestationWeeks),
    gestationDays: Number(form.gestationDays),
    birthWeightGrams: Number(form.birthWeightGrams),
    heatSource: form.heatSource,
    controlMode: form.controlMode,
    setTemperature: Number(form.setTemperature.replace(',', '.')),
    tempUnit,
    hospitalNumber: form.hospitalNumber,
    sex: form.sex,
    probeSite: form.probeSite ?? null,
    probeCovered: form.probeCovered === null || form.probeCovered === undefined ? null : form.probeCovered === 'yes',
    position: form.position ?? null,
  };
}

export const moveInfantSchema = z.strictObject({ bedId: id('a bed') });
export type MoveInfantInput = z.infer<typeof moveInfantSchema>;

export const updateInfantSchema = z
  .strictObject({
    heatSource: heatSource.optional(),
    weightGrams: wholeNumber('Weight', 300, 8000, ' g').optional(),
  })
  .refine((v) => v.heatSource !== undefined || v.weightGrams !== undefined, { path: ['heatSource'], message: 'Change the heat source or the weight.' });
export type UpdateInfantInput = z.input<typeof updateInfantSchema>;

/**
 * A discharge says why the infant left (home, a transfer, a ward, death) and, for a transfer,
 * where to; a ward may be named. The open flags close with the discharge as the reason.
 */
export const dischargeInfantSchema = z
  .strictObject({
    reason: z.enum(DISCHARGE_REASONS, { error: 'Choose why the infant is leaving: home, a transfer, a ward or died.' }),
    destination: safeText().max(120, 'Keep the destination under 120 characters.').nullable().optional(),
    note: safeNote().max(300, 'Keep the note under 300 characters.').optional(),
  })
  .superRefine((v, ctx) => {
    const destination = v.destination?.trim() ?? '';
    if (DISCHARGE_DESTINATION_REQUIRED.includes(v.reason) && destination === '') {
      ctx.addIssue({ code: 'custom', path: ['destination'], message: 'Name the unit or hospital the infant is transferred to.' });
    }
    if (!DISCHARGE_DESTINATION_ALLOWED.includes(v.reason) && destination !== '') {
      ctx.addIssue({ code: 'custom', path: ['destination'], message: 'A destination goes only with a transfer or a ward.' });
    }
  });
export type DischargeInfantInput = z.input<typeof dischargeInfantSchema>;
export type DischargeInfant = z.output<typeof dischargeInfantSchema>;

export const assignNurseSchema = z.strictObject({
  infantId: id('an infant'),
  nurseId: id('a nurse'),
  shift: z.enum(['current', 'next'], { error: 'Choose this shift or the next.' }).default('current'),
});
export type AssignNurseInput = z.input<typeof assignNurseSchema>;

export const acknowledgeEscalationSchema = z.strictObject({
  note: safeNote().max(300, 'Keep the note under 300 characters.').optional(),
});
export type AcknowledgeEscalationInput = z.infer<typeof acknowledgeEscalationSchema>;
