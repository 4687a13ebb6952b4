/**
 * Hard limits and plausibility ranges for charted values.
 *
 * Two levels: a value outside the hard limits cannot be a reading of a living infant or of the
 * equipment (a typo, a wrong unit) and is refused; a value inside the hard limits but outside
 * the plausible range can be real and must be confirmed by the nurse before it is saved.
 * Temperatures are in hundredths of a degree Celsius (the stored form).
 */

import { USUAL_RANGES } from '../plausibility';
import { formatTenths, tenthsOf } from './exact';

export interface Range {
  readonly min: number;
  readonly max: number;
}

export const HARD_LIMITS = {
  /** 20.00–45.00 °C (68.0–113.0 °F): any thermometer reading outside this is an entry error. */
  temperatureCenti: { min: 2000, max: 4500 },
  /** Beats per minute. */
  heartRate: { min: 30, max: 300 },
  /** Heater output as a percentage of full power. */
  heaterOutputPct: { min: 0, max: 100 },
} as const satisfies Record<string, Range>;

/**
 * Values inside these ranges are saved without a question; outside them (but inside the hard
 * limits) the form asks the nurse to confirm. The numbers and their sources live in
 * shared/plausibility.ts, the one table the bedside form, the server and the import share.
 */
const usual = (r: Range): Range => ({ min: r.min, max: r.max });
export const PLAUSIBLE = {
  probe: usual(USUAL_RANGES.skin),
  remote: usual(USUAL_RANGES.remote),
  air: usual(USUAL_RANGES.air),
  /** The skin servo set point; an air set point is judged by `usualRangeOf('set', mode)`. */
  set: usual(USUAL_RANGES.skinSet),
  heartRate: usual(USUAL_RANGES.heartRate),
  /** Heater output: every value inside the hard limits is plausible. */
  heaterOutputPct: { min: 0, max: 100 },
} as const satisfies Record<string, Range>;

export type PlausibilityField = keyof typeof PLAUSIBLE;
export type PlausibilityResult = 'ok' | 'confirm' | 'refuse';

export interface PlausibilityCheck {
  readonly result: PlausibilityResult;
  /** Why, in words a nurse can read; empty when the result is 'ok'. */
  readonly reason: string;
}

const FIELD_LABELS: Record<PlausibilityField, string> = {
  probe: 'Probe temperature',
  remote: 'Remote-site temperature',
  air: 'Air temperature',
  set: 'Set temperature',
  heartRate: 'Heart rate',
  heaterOutputPct: 'Heater output',
};

const TEMPERATURE_FIELDS: ReadonlySet<PlausibilityField> = new Set(['probe', 'remote', 'air', 'set']);

function hardLimitsOf(field: PlausibilityField): Range {
  if (TEMPERATURE_FIELDS.has(field)) return HARD_LIMITS.temperatureCenti;
  return field === 'heartRate' ? HARD_LIMITS.heartRate : HARD_LIMITS.heaterOutputPct;
}

function describe(field: PlausibilityField, value: number, unit: 'C' | 'F'): string {
  if (TEMPERATURE_FIELDS.has(field)) {
    return `${formatTenths(tenthsOf(value, unit, 'temperature'))} °${unit}`;
  }
  return field === 'heartRate' ? `${value}/min` : `${value} %`;
}

function describeRange(field: PlausibilityField, range: Range, unit: 'C' | 'F'): string {
  if (TEMPERATURE_FIELDS.has(field)) {
    const text = (centi: number): string => formatTenths(tenthsOf(centi, unit, 'temperature'));
    return `${text(range.min)}–${text(range.max)} °${unit}`;
  }
  return field === 'heartRate' ? `${range.min}–${range.max}/min` : `${range.min}–${range.max} %`;
}

/**
 * 'ok', 'confirm' (possible but unusual: ask the nurse) or 'refuse' (impossible: an entry
 * error). Temperatures are hundredths of °C; `unit` only chooses the unit of the message.
 */
export function checkPlausibility(field: PlausibilityField, value: number, unit: 'C' | 'F' = 'C'): PlausibilityCheck {
  const label = FIELD_LABELS[field];
  if (label === undefined) {
    return { result: 'refuse', reason: `Unknown field: ${String(field)}` };
  }
  const isTemperature = TEMPERATURE_FIELDS.has(field);
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    return { result: 'refuse', reason: `${label} must be a number` };
  }
  // Stored temperatures are whole hundredths; heart rate is counted in whole beats.
  if ((isTemperature || field === 'heartRate') && !Number.isInteger(value)) {
    return {
      result: 'refuse',
      reason: isTemperature ? `${label} must be whole hundredths of a degree` : `${label} must be a whole number`,
    };
  }
  const shown = `${label} ${describe(field, value, unit)}`;
  const hard = hardLimitsOf(field);
  if (value < hard.min || value > hard.max) {
    const range = describeRange(field, hard, unit);
    return { result: 'refuse', reason: `${shown} is outside ${range}: check the entry` };
  }
  const plausible = PLAUSIBLE[field];
  if (value < plausible.min || value > plausible.max) {
    const range = describeRange(field, plausible, unit);
    return { result: 'confirm', reason: `${shown} is outside the usual ${range}: confirm it is correct` };
  }
  return { result: 'ok', reason: '' };
}
