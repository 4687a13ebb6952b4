import { z } from 'zod';
import { remoteSiteConflict } from '../thermal/placement';
import { HUMIDITY_PCT_MAX, HUMIDITY_PCT_MIN, INFANT_POSITIONS, PROBE_SITES, WEIGHT_GRAMS_MAX, WEIGHT_GRAMS_MIN, type ProbeSite, type RemoteSite } from '../vocabulary';

/**
 * The probe's place (site, heat-reflecting cover, the infant's position), the current weight and
 * the incubator humidity: the fields a reading carries beside its temperatures, the admission's
 * placement, and a placement change charted on its own. One set of checks for the forms and the
 * server.
 */

export const probeSiteSchema = z.enum(PROBE_SITES, { error: 'Choose abdomen, back or flank, axilla or other site.' });
export const infantPositionSchema = z.enum(INFANT_POSITIONS, { error: 'Choose on the back, on the front or on the side.' });
const covered = z.boolean({ error: 'Say whether the probe is under a heat-reflecting cover.' });

/** The placement as settings: each may be left out (not charted). */
export const placementFields = {
  probeSite: probeSiteSchema.nullable().optional(),
  probeCovered: covered.nullable().optional(),
  position: infantPositionSchema.nullable().optional(),
};

/** Current weight: 300–8000 g, the same bounds as a weight change on the board (common practice). */
export const weightGramsSchema = z
  .number({ error: 'Weight must be a number of grams.' })
  .int('Weigh in whole grams.')
  .min(WEIGHT_GRAMS_MIN, `A weight is at least ${WEIGHT_GRAMS_MIN} g.`)
  .max(WEIGHT_GRAMS_MAX, `A weight is at most ${WEIGHT_GRAMS_MAX} g.`);

/** Incubator humidity: relative humidity in whole percent, 0–100 by definition. */
export const humidityPctSchema = z
  .number({ error: 'Humidity must be a number.' })
  .int('Use a whole percentage.')
  .min(HUMIDITY_PCT_MIN, `At least ${HUMIDITY_PCT_MIN} %.`)
  .max(HUMIDITY_PCT_MAX, `At most ${HUMIDITY_PCT_MAX} %.`);

/** What a reading carries beside its temperatures (all optional). */
export const readingExtraFields = {
  ...placementFields,
  weightGrams: weightGramsSchema.nullable().optional(),
  humidityPct: humidityPctSchema.nullable().optional(),
};

/** The remote site cannot be the axilla the probe is on (shared/thermal/placement.ts). */
export function refineRemoteSite(
  v: { probeSite?: ProbeSite | null; remoteSite?: RemoteSite | null; remote?: number | null },
  ctx: z.RefinementCtx,
  prefix: (string | number)[] = [],
): void {
  const conflict = remoteSiteConflict(v.probeSite, v.remoteSite, v.remote != null);
  if (conflict) ctx.addIssue({ code: 'custom', path: [...prefix, 'remoteSite'], message: conflict });
}

const uuid = z.string().uuid({ error: 'Must be an id made by the app (a UUID).' });

/** A placement change charted on its own (the probe moved, the infant turned). Idempotent by the client's id. */
export const placementChangeSchema = z
  .strictObject({
    id: uuid,
    at: z.iso.datetime({ offset: true, error: 'Must be a date and time (ISO 8601).' }).optional(),
    ...placementFields,
  })
  .superRefine((v, ctx) => {
    if (v.probeSite == null && v.probeCovered == null && v.position == null) {
      ctx.addIssue({ code: 'custom', path: ['probeSite'], message: 'Choose where the probe is now, its cover or the position.' });
    }
  });
export type PlacementChangeInput = z.input<typeof placementChangeSchema>;
export type PlacementChange = z.output<typeof placementChangeSchema>;
