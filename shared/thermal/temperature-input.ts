/**
 * Reading a typed temperature (internal; not re-exported from index.ts): checks the number and
 * the unit and returns the exact value in °C, so no rounding happens before a comparison.
 */

import { ThermalInputError } from './errors';
import { compare, decimalOf, fahrenheitRationalToCelsius, formatTenths, tenthsOf, type Rational } from './exact';
import { HARD_LIMITS } from './limits';

export type TempUnitCode = 'C' | 'F';

export function requireUnit(unit: unknown, field: string): TempUnitCode {
  if (unit !== 'C' && unit !== 'F') {
    throw new ThermalInputError(field, 'invalid-unit', `${field} unit must be °C ('C') or °F ('F')`);
  }
  return unit;
}

const MIN_CELSIUS: Rational = { num: BigInt(HARD_LIMITS.temperatureCenti.min), den: 100n };
const MAX_CELSIUS: Rational = { num: BigInt(HARD_LIMITS.temperatureCenti.max), den: 100n };

/** Range text in the unit the person typed, so the message reads in their own terms. */
function rangeText(unit: TempUnitCode): string {
  const { min, max } = HARD_LIMITS.temperatureCenti;
  const text = (centi: number): string => formatTenths(tenthsOf(centi, unit, 'temperature'));
  return `${text(min)} and ${text(max)} °${unit}`;
}

/**
 * A typed temperature as an exact number of °C, checked against the hard limits.
 * Throws ThermalInputError naming `field` for a bad number, a bad unit or an impossible value.
 */
export function exactCelsius(value: unknown, unit: unknown, field: string): Rational {
  const checkedUnit = requireUnit(unit, field);
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new ThermalInputError(field, 'invalid-temperature', `${field} must be a number`);
  }
  const typed = decimalOf(value);
  const celsius = checkedUnit === 'C' ? typed : fahrenheitRationalToCelsius(typed);
  if (compare(celsius, MIN_CELSIUS) < 0 || compare(celsius, MAX_CELSIUS) > 0) {
    throw new ThermalInputError(field, 'out-of-range', `${field} must be between ${rangeText(checkedUnit)}`);
  }
  return celsius;
}
