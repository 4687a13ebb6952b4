import { z } from 'zod';
import { infantPositionSchema, probeSiteSchema } from '@/shared/schemas/placement';
import { remoteSiteConflict } from '@/shared/thermal/placement';
import { HUMIDITY_PCT_MAX, HUMIDITY_PCT_MIN, WEIGHT_GRAMS_MAX, WEIGHT_GRAMS_MIN, type RemoteSite } from '@/shared/vocabulary';
import { parseWhole, type PlacementFormValues } from './placement-values';

/**
 * The reading form's checks of the placement, the weight and the humidity: the same bounds and
 * rules as the server's (shared/schemas/placement.ts, shared/thermal/placement.ts), with messages
 * for the keypad's strings. Loaded with the form's other checks (reading-form-schema.ts).
 */
export const placementFormShape = {
  probeSite: probeSiteSchema.nullable().optional(),
  probeCovered: z.enum(['yes', 'no']).nullable().optional(),
  position: infantPositionSchema.nullable().optional(),
  weight: z.string().optional(),
  humidity: z.string().optional(),
};

export function refinePlacementForm(v: PlacementFormValues & { remote: string; remoteSite: RemoteSite | null }, ctx: z.RefinementCtx): void {
  const weight = parseWhole(v.weight);
  if (weight === 'invalid' || (weight !== null && (weight < WEIGHT_GRAMS_MIN || weight > WEIGHT_GRAMS_MAX))) {
    ctx.addIssue({ code: 'custom', path: ['weight'], message: `Weight in whole grams, ${WEIGHT_GRAMS_MIN} to ${WEIGHT_GRAMS_MAX}.` });
  }
  const humidity = parseWhole(v.humidity);
  if (humidity === 'invalid' || (humidity !== null && (humidity < HUMIDITY_PCT_MIN || humidity > HUMIDITY_PCT_MAX))) {
    ctx.addIssue({ code: 'custom', path: ['humidity'], message: `Humidity in whole percent, ${HUMIDITY_PCT_MIN} to ${HUMIDITY_PCT_MAX}.` });
  }
  const taken = remoteSiteConflict(v.probeSite, v.remoteSite, v.remote.trim() !== '');
  if (taken) ctx.addIssue({ code: 'custom', path: ['remoteSite'], message: taken });
}
