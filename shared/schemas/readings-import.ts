import { z } from 'zod';

/**
 * Importing a previewed readings file: the lines whose unusual values the charge nurse
 * confirmed, each one named (there is no way to confirm them all at once).
 */
export const readingsImportBodySchema = z.strictObject({
  confirmedLines: z
    .array(z.number({ error: 'A line number.' }).int('A line number.').min(2, 'Line 1 is the header.').max(1_000_000), { error: 'List the confirmed lines.' })
    .max(5000, 'At most 5000 lines.')
    .default([]),
});
export type ReadingsImportBody = z.infer<typeof readingsImportBodySchema>;
