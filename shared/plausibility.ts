/**
 * The usual ranges of charted values: one table for the bedside form, the server's check of a
 * new reading and the readings import. A value outside its range can be real, so it is never
 * refused for that alone: the nurse (or, for an import, the charge nurse, row by row) confirms
 * it first. Values outside the hard limits (thermal/limits.ts) are refused as entry errors.
 *
 * Skin values (the servo probe, a skin set point) and air values (the air temperature, an air
 * set point) have separate ranges: an incubator's air set point of 32 °C is usual, a skin set
 * point of 32 °C is not. Temperatures are hundredths of °C. Each range says where it comes from;
 * none replaces unit policy or the device's instructions.
 */
import { formatTenths, tenthsOf } from './thermal/exact';
import type { ControlMode } from './vocabulary';

export interface UsualRange {
  readonly min: number;
  readonly max: number;
  /** Where the range comes from. */
  readonly source: string;
}

export const USUAL_RANGES = {
  /** Skin probe (servo sensor on the skin). */
  skin: {
    min: 3400,
    max: 3800,
    source:
      'common practice: around the normal abdominal skin 36.0–36.5 °C of Gomella, Neonatology 7th ed. 2013, widened by 2 °C below and 1.5 °C above: skin reads below core, so a probe above 38.0 °C is confirmed first',
  },
  /** Remote site (axillary or rectal): a body temperature. */
  remote: { min: 3400, max: 3950, source: 'from memory: around the WHO 1997 normal range of 36.5–37.5 °C, widened for illness' },
  /** Air temperature in the incubator or under the warmer. */
  air: { min: 2500, max: 4000, source: 'common practice: incubator air set from about 25 °C for a term infant to the high 30s for the smallest' },
  /** Set point when the heater follows the skin probe (skin servo). */
  skinSet: { min: 3400, max: 3800, source: 'common practice: skin servo set points of 36.0–37.0 °C, widened by 2 °C below and 1 °C above' },
  /** Set point when the heater follows the air (air servo) or runs by hand: an air temperature. */
  airSet: { min: 2500, max: 4000, source: 'common practice: the same as the air range' },
  /** Heart rate per minute. */
  heartRate: { min: 80, max: 220, source: "from memory: a newborn's usual 100–180/min widened for crying and sleep" },
} as const satisfies Record<string, UsualRange>;

export type UsualField = 'probe' | 'remote' | 'air' | 'set' | 'heartRate';

/** The range a value is judged by: the set point by the control mode (skin servo: skin; air servo or manual: air). */
export function usualRangeOf(field: UsualField, controlMode: ControlMode | null | undefined): UsualRange {
  switch (field) {
    case 'probe':
      return USUAL_RANGES.skin;
    case 'remote':
      return USUAL_RANGES.remote;
    case 'air':
      return USUAL_RANGES.air;
    case 'set':
      return controlMode === 'air-servo' || controlMode === 'manual' ? USUAL_RANGES.airSet : USUAL_RANGES.skinSet;
    case 'heartRate':
      return USUAL_RANGES.heartRate;
  }
}

const LABELS: Record<UsualField, string> = {
  probe: 'Probe temperature',
  remote: 'Remote-site temperature',
  air: 'Air temperature',
  set: 'Set temperature',
  heartRate: 'Heart rate',
};

function shown(field: UsualField, value: number, unit: 'C' | 'F', withUnit = true): string {
  if (field === 'heartRate') return withUnit ? `${value}/min` : String(value);
  const text = formatTenths(tenthsOf(value, unit, 'temperature'));
  return withUnit ? `${text} °${unit}` : text;
}

/** Why a value is outside its usual range, in words a nurse reads; null when it is inside. */
export function unusualReason(field: UsualField, value: number | null | undefined, opts: { unit?: 'C' | 'F'; controlMode?: ControlMode | null } = {}): string | null {
  if (value === null || value === undefined || !Number.isFinite(value)) return null;
  const range = usualRangeOf(field, opts.controlMode);
  if (value >= range.min && value <= range.max) return null;
  const unit = opts.unit ?? 'C';
  const which = field === 'set' ? (range === USUAL_RANGES.skinSet ? ' for skin servo' : ' for an air set point') : '';
  return `${LABELS[field]} ${shown(field, value, unit)} is outside the usual ${shown(field, range.min, unit, false)}–${shown(field, range.max, unit)}${which}: confirm it is correct`;
}

/** Every unusual value of a reading (temperatures in hundredths of °C). */
export function unusualValues(
  r: { probeCenti?: number | null; remoteCenti?: number | null; airCenti?: number | null; setCenti?: number | null; heartRate?: number | null; controlMode?: ControlMode | null },
  unit: 'C' | 'F' = 'C',
): { field: UsualField; reason: string }[] {
  const out: { field: UsualField; reason: string }[] = [];
  const values: [UsualField, number | null | undefined][] = [
    ['probe', r.probeCenti],
    ['remote', r.remoteCenti],
    ['air', r.airCenti],
    ['set', r.setCenti],
    ['heartRate', r.heartRate],
  ];
  for (const [field, value] of values) {
    const reason = unusualReason(field, value, { unit, controlMode: r.controlMode });
    if (reason) out.push({ field, reason });
  }
  return out;
}
