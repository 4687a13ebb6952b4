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

/** The people list's search: part of a name or an e-mail address, any case. */
export const userSearchSchema = z.strictObject({ q: z.string().max(120, 'At most 120 characters.').optional() });
export type UserSearch = z.infer<typeof userSearchSchema>;

export const updateUserSchema = z
  .strictObject({
    name: name.optional(),
    role: z.enum(ROLES, { error: 'Choose a role.' }).optional(),
    unitIds: unitIds.min(1, 'Choose at least one unit.').optional(),
  })
  .refine((v) => v.name !== undefined || v.role !== undefined || v.unitIds !== undefined, { message: 'Change at least one thing.', path: ['_'] });
export type UpdateUserInput = z.infer<typeof updateUserSchema>;

/**
 * The canonical IANA zones this runtime knows (`Intl.supportedValuesOf('timeZone')`), plus UTC.
 * A link or a differently cased name ("utc", "GB") is refused, so every unit stores one spelling.
 */
export const TIME_ZONES: readonly string[] = [...new Set([...Intl.supportedValuesOf('timeZone'), 'UTC'])].sort();
const zoneSet = new Set(TIME_ZONES);
export const timeZoneSchema = z
  .string({ error: 'Choose a time zone.' })
  .min(1, 'Choose a time zone.')
  .max(64)
  .refine((tz) => zoneSet.has(tz), { error: (issue) => `"${String(issue.input)}" is not a canonical time zone; choose one from the list, such as Europe/London.` });

/**
 * Settings that only make sense together, checked on the settings as they would be after the
 * change: every field at fault is named, each with its reason.
 */
export function unitSettingsConflicts(v: { checkIntervalMinutes: number; dueSoonMinutes: number; dayShiftStart: string; nightShiftStart: string }): Record<string, string> {
  const fields: Record<string, string> = {};
  if (v.dueSoonMinutes >= v.checkIntervalMinutes)
    fields.dueSoonMinutes = `The due-soon window (${v.dueSoonMinutes} min) must be shorter than the check interval (${v.checkIntervalMinutes} min).`;
  if (v.dayShiftStart >= v.nightShiftStart) fields.nightShiftStart = `The night shift (${v.nightShiftStart}) must start later in the day than the day shift (${v.dayShiftStart}).`;
  return fields;
}

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
      .partialRecord(
        z.enum(SEVERITY_CLASSES as [SeverityClass, ...SeverityClass[]], { error: 'Unknown kind of flag.' }),
        z.number({ error: 'Enter minutes.' }).int('Whole minutes.').min(0).max(240, 'At most 4 hours.').nullable(),
      )
      .optional(),
    recheckSettleMinutes: z.number({ error: 'Enter minutes.' }).int('Whole minutes.').min(0).max(30, 'At most the 30-minute recheck time.').optional(),
    /** Where escalations go when no charge nurse is assigned on the shift; null removes it. */
    escalationFallbackEmail: z.email({ error: 'Enter an e-mail address.' }).max(254, 'That address is too long.').nullable().optional(),
    timeZone: timeZoneSchema.optional(),
  })
  .refine((v) => Object.keys(v).length > 0, { message: 'Change at least one setting.', path: ['_'] });
export type UnitSettingsInput = z.infer<typeof unitSettingsSchema>;

const bedLabel = safeText({ error: 'Enter a bed label.' })
  .min(1, 'Enter a bed label.')
  .max(20, 'At most 20 characters.')
  .regex(/^[\w -]+$/, 'Letters, digits, spaces and dashes only.');

export const createBedSchema = z.strictObject({ label: bedLabel });
export type CreateBedInput = z.infer<typeof createBedSchema>;

export const updateBedSchema = z
  .strictObject({
    label: bedLabel.optional(),
    active: z.boolean({ error: 'Say whether the bed is in use.' }).optional(),
    move: z.enum(['up', 'down'], { error: 'Move the bed up or down.' }).optional(),
  })
  .refine((v) => v.label !== undefined || v.active !== undefined || v.move !== undefined, { message: 'Change at least one thing.', path: ['_'] });
export type UpdateBedInput = z.infer<typeof updateBedSchema>;

export const membershipSchema = z.strictObject({ unitId: z.string({ error: 'Choose a unit.' }).min(1, 'Choose a unit.').max(100) });
export type MembershipInput = z.infer<typeof membershipSchema>;

export const createUnitSchema = z.strictObject({
  name: safeText({ error: 'Enter the unit name.' }).min(2, 'Use at least 2 characters.').max(120, 'That name is too long.'),
  hospitalName: safeText({ error: 'Enter the hospital name.' }).min(2, 'Use at least 2 characters.').max(120, 'That name is too long.'),
  timeZone: timeZoneSchema,
});
export type CreateUnitInput = z.infer<typeof createUnitSchema>;

const instantText = z.iso.datetime({ offset: true, error: 'Use a date and time such as 2026-12-01T00:00:00Z.' });
export const auditQuerySchema = z
  .strictObject({
    actorId: z.string().min(1).max(100).optional(),
    from: instantText.optional(),
    to: instantText.optional(),
    cursor: z.coerce.number({ error: 'Not a page cursor.' }).int('Not a page cursor.').positive('Not a page cursor.').optional(),
    limit: z.coerce.number({ error: 'Enter a number.' }).int('Whole number.').min(1, 'At least 1.').max(200, 'At most 200.').optional(),
  })
  .refine((v) => !v.from || !v.to || Date.parse(v.from) <= Date.parse(v.to), { message: 'The end of the range is before its start.', path: ['to'] });
export type AuditQuery = z.infer<typeof auditQuerySchema>;

export const readingsImportQuerySchema = z.strictObject({ unitId: z.string().min(1, 'Choose a unit.').max(100) });
