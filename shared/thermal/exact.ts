/**
 * Exact decimal arithmetic for temperatures (internal; not re-exported from index.ts).
 *
 * Binary floating point cannot hold most decimals: (98.6 − 32) / 1.8 is 36.99999999999999,
 * 95.9 − 95.0 is 0.9000000000000057 (a naive "more than 0.9 °F" check flags it), and 32.035 × 100
 * is 3203.4999999999995, so Math.round gives 3203 where a person rounds to 3204. So a typed number
 * is read back as the decimal it was typed as (the shortest decimal string that round-trips to
 * the same double) and all further arithmetic is on integers (BigInt), rounding once at the end.
 */

/** An exact rational number num / den with den > 0. */
export interface Rational {
  readonly num: bigint;
  readonly den: bigint;
}

const DECIMAL_STRING = /^(-?)(\d+)(?:\.(\d+))?(?:e([+-]\d+))?$/;

/** The exact value of the decimal a finite number prints as. */
export function decimalOf(value: number): Rational {
  // String(x) is the shortest decimal that reads back as x: for typed input, what was typed.
  const match = DECIMAL_STRING.exec(String(value));
  if (match === null) {
    throw new RangeError(`not a finite number: ${String(value)}`);
  }
  const [, sign, whole, fraction = '', exponent = '0'] = match;
  let num = BigInt(whole + fraction);
  let scale = fraction.length - Number(exponent);
  if (scale < 0) {
    num *= 10n ** BigInt(-scale);
    scale = 0;
  }
  return { num: sign === '-' ? -num : num, den: 10n ** BigInt(scale) };
}

/** °F as typed to exact °C: (F − 32) × 5 / 9, with no rounding. */
export function fahrenheitRationalToCelsius(f: Rational): Rational {
  return { num: (f.num - 32n * f.den) * 5n, den: f.den * 9n };
}

/** °C to exact °F: C × 9 / 5 + 32, with no rounding. */
export function celsiusRationalToFahrenheit(c: Rational): Rational {
  return { num: c.num * 9n + 160n * c.den, den: c.den * 5n };
}

export function subtract(a: Rational, b: Rational): Rational {
  return { num: a.num * b.den - b.num * a.den, den: a.den * b.den };
}

/** −1, 0 or 1 as a < b, a = b, a > b. */
export function compare(a: Rational, b: Rational): -1 | 0 | 1 {
  const d = a.num * b.den - b.num * a.den;
  return d < 0n ? -1 : d > 0n ? 1 : 0;
}

/**
 * num / den rounded to an integer, halves away from zero (36.445 → 36.45, −0.5 → −1), the
 * rule people use by hand and the one a thermometer's display follows.
 */
export function roundHalfAwayBig(num: bigint, den: bigint): number {
  const negative = num < 0n;
  const magnitude = negative ? -num : num;
  let quotient = magnitude / den;
  if (2n * (magnitude - quotient * den) >= den) quotient += 1n;
  const result = Number(quotient);
  return negative && result !== 0 ? -result : result;
}

/** The same rounding for safe integers, used on stored hundredths (no BigInt needed). */
export function roundHalfAway(num: number, den: number): number {
  const magnitude = Math.abs(num);
  let quotient = Math.floor(magnitude / den);
  if (2 * (magnitude - quotient * den) >= den) quotient += 1;
  return num < 0 && quotient !== 0 ? -quotient : quotient;
}

/** Hundredths of °C as tenths of the display unit, rounded once (no offset for 'delta'). */
export function tenthsOf(centi: number, unit: 'C' | 'F', kind: 'temperature' | 'delta'): number {
  if (unit === 'C') return roundHalfAway(centi, 10);
  // °F tenths = (centi × 9/5 + 3200 [for a temperature]) / 10 = (9 × centi + 16000) / 50.
  return roundHalfAway(centi * 9 + (kind === 'temperature' ? 16000 : 0), 50);
}

/** Tenths as a one-decimal string: 368 → "36.8", −5 → "-0.5". */
export function formatTenths(tenths: number): string {
  const magnitude = Math.abs(tenths);
  const sign = tenths < 0 ? '-' : '';
  return `${sign}${Math.floor(magnitude / 10)}.${magnitude % 10}`;
}
