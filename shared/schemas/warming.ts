import { z } from 'zod';
import { safeText } from './safe-text';
import { CONTROL_MODES, HEAT_SOURCES } from '../vocabulary';

/**
 * Warming an empty bed for an expected admission: the charge nurse's entry. The set temperature
 * is checked against the same range as on admission (25.0–39.5 °C).
 */
export const startWarmingSchema = z
  .strictObject({
    heatSource: z.enum(HEAT_SOURCES, { error: 'Choose a heat source.' }),
    controlMode: z.enum(CONTROL_MODES, { error: 'Choose skin servo, air servo or manual.' }),
    setTemperature: z.coerce.number({ error: 'Set temperature must be a number.' }).refine(Number.isFinite, 'Set temperature must be a number.'),
    tempUnit: z.enum(['C', 'F'], { error: 'Choose °C or °F.' }).default('C'),
    /** When the heat source was switched on; now when left out. */
    since: z.iso.datetime({ offset: true, error: 'Enter when the warming started.' }).optional(),
    expectedInfant: safeText().max(80, 'Keep it under 80 characters (a name or a short note).').optional(),
  })
  .superRefine((v, ctx) => {
    const celsius = v.tempUnit === 'F' ? ((v.setTemperature - 32) * 5) / 9 : v.setTemperature;
    if (!(celsius >= 25 && celsius <= 39.5)) {
      ctx.addIssue({ code: 'custom', path: ['setTemperature'], message: 'A set temperature is between 25.0 and 39.5 °C (77.0–103.1 °F).' });
    }
  });
export type StartWarmingInput = z.input<typeof startWarmingSchema>;
export type StartWarming = z.output<typeof startWarmingSchema>;

export const endWarmingSchema = z.strictObject({});

/** A bed being warmed, as the board and the admit form read it. */
export interface BedWarming {
  id: string;
  bedId: string;
  heatSource: (typeof HEAT_SOURCES)[number];
  controlMode: (typeof CONTROL_MODES)[number];
  /** The set temperature in hundredths of a °C. */
  setCenti: number;
  since: string;
  expectedInfant: string | null;
  startedBy: string | null;
}
