import { z } from 'zod';
import { safeText } from './safe-text';
import { ROLES } from '../roles';
import { emailSchema } from './auth';
import { SEVERITY_CLASSES, type SeverityClass } from '../thermal/severity';

const name = safeText({ error: 'Enter a name.' }).min(2, 'Enter the full name.').max(120, 'That name is too long.');
const unitIds = z.array(z.string().min(1).max(100)).max(20);

export const createUserSchema = z.strictObject({
  name,
  email: emailSchema,
  role: z.enum(ROLES, { error: 'Choose a role.' }),
  unitIds: unitIds.min(1, 'Choose at least one unit.'),
});
export type CreateUserInput = z.infer<typeof createUserSchema>;

export const updateUserSchema = z
  .strictObject({
    name: name.optional(),
    role: z.enum(ROLES, { error: 'Choose a role.' }).optional(),
    unitIds: unitIds.min(1, 'Choose at least one unit.').optional(),
  })
  .refine((v) => v.name !== undefined || v.role !== undefined || v.unitIds !== undefined, { message: 'Change at least one thing.', path: ['_'] });
export type UpdateUserInput = z.infer<typeof updateUserSchema>;

const timeOfDay = z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'Use a time as HH:MM (24-hour).');

export const unitSettingsSchema = z
  .strictObject({
    name: safeText().min(2, 'Use at least 2 characters.').max(120, 'That name is too long.').optional(),
    checkIntervalMinutes: z.number({ error: 'Enter minutes.' }).int('Whole minutes.').min(15, 'At least 15 minutes.').max(480, 'At most 8 hours.').optional(),
    dueSoonMinutes: z.number({ error: 'Enter minutes.' }).int('Whole minutes.').min(0).max(120, 'At most 120 minutes.').optional(),
    gapLimitCenti: z.number({ error: 'Enter a limit.' }).int('Whole hundredths of a degree.').min(10, 'At least 0.10 °C.').max(200, 'At most 2.00 °C.').optional(),
    escalationDelayMinutes: z.number({ error: 'Enter minutes.' }).int('Whole minutes.').min(1).max(240, 'At most 4 hours.').optional(),
    dayShiftStart: timeOfDay.optional(),
    nightShiftStart: timeOfDay.optional(),
    /**
     * Minutes each class of flag may stay open before it escalates (null: never), and the minutes
     * after a first action before a recheck counts. Kept in the unit's settings versions.
     */
    escalationDelays: z
      .partialRecord(z.enum(SEVERITY_CLASSES as [SeverityClass, ...SeverityClass[]], { error: 'Unknown kind of flag.' }), z.number({ error: 'Enter minutes.' }).int('Whole minutes.').min(0).max(240, 'At most 4 hours.').nullable())
      .optional(),
    recheckSettleMinutes: z.number({ error: 'Enter minutes.' }).int('Whole minutes.').min(0).max(30, 'At most the 30-minute recheck time.').optional(),
    /** Where escalations go when no charge nurse is assigned on the shift; null removes it. */
    escalationFallbackEmail: z.email({ error: 'Enter an e-mail address.' }).max(254, 'That address is too long.').nullable().optional(),
    timeZone: z
      .string()
      .min(1)
      .max(64)
      .refine((tz) => {
        try {
          new Intl.DateTimeFormat('en-GB', { timeZone: tz });
          return true;
        } catch {
          return false;
        }
      }, 'Unknown time zone; use a name such as Europe/London.')
      .optional(),
  })
  .refine((v) => Object.keys(v).length > 0, { message: 'Change at least one setting.', path: ['_'] });
export type UnitSettingsInput = z.infer<typeof unitSettingsSchema>;

export const createBedSchema = z.strictObject({
  label: safeText({ error: 'Enter a bed label.' }).min(1, 'Enter a bed label.').max(20, 'At most 20 characters.').regex(/^[\w -]+$/, 'Letters, digits, spaces and dashes only.'),
});
export type CreateBedInput = z.infer<typeof createBedSchema>;

export const bedActiveSchema = z.strictObject({ active: z.boolean({ error: 'Say whether the bed is in use.' }) });

export const readingsImportQuerySchema = z.strictObject({ unitId: z.string().min(1, 'Choose a unit.').max(100) });
