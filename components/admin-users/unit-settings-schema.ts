import { z } from 'zod';

/** The unit settings form's checks, loaded when the form first validates (components/forms/lazy-resolver.ts). */
const wholeText = z.string().regex(/^\d{1,3}$/, 'Whole minutes.');
export const unitSettingsFormSchema = z.object({
  checkIntervalMinutes: wholeText,
  dueSoonMinutes: wholeText,
  gapLimit: z.string().regex(/^\d(\.\d{1,2})?$/, 'Degrees °C, e.g. 0.5.'),
  escalationDelayMinutes: wholeText,
  dayShiftStart: z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'HH:MM'),
  nightShiftStart: z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'HH:MM'),
  timeZone: z.string().min(1, 'Enter a time zone.'),
  newBed: z.string(),
});
