/**
 * Input errors raised by the thermal rules.
 *
 * The rules never guess at bad input: a NaN, an infinite value, an unknown unit or a
 * temperature no thermometer in the unit could read is thrown as a `ThermalInputError`
 * carrying the field it came from, so the API can answer 400 and name that field.
 */

export type ThermalInputErrorCode =
  /** Not a finite number where a temperature was expected (NaN, Infinity, a string). */
  | 'invalid-temperature'
  /** A finite number outside the accepted limits for its field. */
  | 'out-of-range'
  /** A temperature unit other than 'C' or 'F'. */
  | 'invalid-unit'
  /** Not a finite number, or not a whole number where one is required. */
  | 'invalid-number'
  /** Not a valid Date. */
  | 'invalid-date'
  /** A heat-stress sign or control mode this module does not know. */
  | 'invalid-value'
  /** A unit policy setting that cannot be used. */
  | 'invalid-policy';

export class ThermalInputError extends Error {
  readonly field: string;
  readonly code: ThermalInputErrorCode;

  constructor(field: string, code: ThermalInputErrorCode, message: string) {
    super(message);
    this.name = 'ThermalInputError';
    this.field = field;
    this.code = code;
    // Keeps `instanceof` working when the code is compiled down to ES5-style classes.
    Object.setPrototypeOf(this, ThermalInputError.prototype);
  }
}

export function isThermalInputError(error: unknown): error is ThermalInputError {
  return error instanceof ThermalInputError;
}

/** Throws unless `value` is a valid Date; returns its epoch milliseconds. */
export function requireTime(value: unknown, field: string): number {
  if (!(value instanceof Date) || Number.isNaN(value.getTime())) {
    throw new ThermalInputError(field, 'invalid-date', `${field} must be a valid date and time`);
  }
  return value.getTime();
}

/** Throws unless `value` is a safe integer; used for stored hundredths of a degree. */
export function requireInteger(value: unknown, field: string): number {
  if (typeof value !== 'number' || !Number.isSafeInteger(value)) {
    throw new ThermalInputError(field, 'invalid-number', `${field} must be a whole number`);
  }
  return value;
}

/** Throws unless `value` is a finite number. */
export function requireFinite(value: unknown, field: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new ThermalInputError(field, 'invalid-number', `${field} must be a finite number`);
  }
  return value;
}
