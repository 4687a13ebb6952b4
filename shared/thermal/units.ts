/**
 * Temperature units and conversions.
 *
 * Temperatures are stored as integer hundredths of a degree Celsius ("centi"); °F exists only
 * at the edges (entry and display). t(°F) = 1.8 × t(°C) + 32 (NIST SP 811, App. B.8).
 * Conversions read a typed number as the decimal it was typed as and round once, half away
 * from zero, so 98.6 °F is exactly 37.00 °C and never 36.99.
 */

import { ThermalInputError } from './errors';
import { celsiusRationalToFahrenheit, decimalOf, fahrenheitRationalToCelsius, formatTenths, roundHalfAway, roundHalfAwayBig, tenthsOf, type Rational } from './exact';
import { exactCelsius, requireUnit } from './temperature-input';

export type TempUnit = 'C' | 'F';

/** UCUM codes for FHIR output (UCUM 2.2: offset units 'Cel' and '[degF]'). */
export const UCUM_UNIT_CODES: Readonly<Record<TempUnit, string>> = { C: 'Cel', F: '[degF]' };

/**
 * A typed temperature as integer hundredths of °C, rounded half away from zero.
 * Throws ThermalInputError (with `field`) for NaN, Infinity, an unknown unit, or a value
 * outside 20.00–45.00 °C (68.0–113.0 °F).
 */
export function toCentiCelsius(value: number, unit: TempUnit, field = 'temperature'): number {
  const celsius = exactCelsius(value, unit, field);
  return roundHalfAwayBig(celsius.num * 100n, celsius.den);
}

function requireCenti(centi: unknown, field: string): number {
  if (typeof centi !== 'number' || !Number.isSafeInteger(centi)) {
    throw new ThermalInputError(field, 'invalid-temperature', `${field} must be whole hundredths of a degree Celsius`);
  }
  return centi;
}

/**
 * Stored hundredths of °C as a number in `unit`: °C to 2 decimals (exact), °F to 2 decimals
 * rounded half away from zero (3651 → 97.72). No range limits: this is for display.
 */
export function fromCentiCelsius(centi: number, unit: TempUnit): number {
  requireCenti(centi, 'centi');
  if (requireUnit(unit, 'unit') === 'C') return centi / 100;
  // Hundredths of °F = centi × 9/5 + 3200, rounded once.
  return roundHalfAway(centi * 9 + 16000, 5) / 100;
}

/** "36.8 °C", "98.2 °F": one decimal, rounded half away from zero, a space before the unit. */
export function formatTemperature(centi: number, unit: TempUnit): string {
  requireCenti(centi, 'centi');
  const checked = requireUnit(unit, 'unit');
  return `${formatTenths(tenthsOf(centi, checked, 'temperature'))} °${checked}`;
}

/**
 * A temperature difference (a gap, a deviation) in hundredths of °C, shown in `unit` with no
 * +32 offset: 50 → "0.5 °C" or "0.9 °F" (NIST SP 811: 0.5 °C = 0.9 °F). The sign is kept.
 */
export function formatTemperatureDifference(centiDelta: number, unit: TempUnit): string {
  requireCenti(centiDelta, 'centiDelta');
  const checked = requireUnit(unit, 'unit');
  return `${formatTenths(tenthsOf(centiDelta, checked, 'delta'))} °${checked}`;
}

const MAX_DECIMALS = 6;

function roundTo(value: Rational, decimals: number): number {
  // A quotient of an integer by a power of ten is the double nearest the decimal.
  return roundHalfAwayBig(value.num * 10n ** BigInt(decimals), value.den) / 10 ** decimals;
}

function requireRawInput(value: unknown, decimals: number, field: string): void {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new ThermalInputError(field, 'invalid-temperature', `${field} must be a number`);
  }
  if (!Number.isInteger(decimals) || decimals < 0 || decimals > MAX_DECIMALS) {
    throw new ThermalInputError('decimals', 'invalid-number', `decimals must be 0–${MAX_DECIMALS}`);
  }
}

/**
 * °C → °F with no clinical limits (for reference tables and tests), rounded half away from
 * zero to `decimals` places: −1 → 30.2, 36.5 → 97.7.
 */
export function celsiusToFahrenheit(celsius: number, decimals = 2): number {
  requireRawInput(celsius, decimals, 'celsius');
  return roundTo(celsiusRationalToFahrenheit(decimalOf(celsius)), decimals);
}

/**
 * °F → °C with no clinical limits (for reference tables and tests), rounded half away from
 * zero to `decimals` places: 0 → −17.78, 98.6 → 37.
 */
export function fahrenheitToCelsius(fahrenheit: number, decimals = 2): number {
  requireRawInput(fahrenheit, decimals, 'fahrenheit');
  return roundTo(fahrenheitRationalToCelsius(decimalOf(fahrenheit)), decimals);
}
