import fc from 'fast-check';
import {
  celsiusToFahrenheit,
  fahrenheitToCelsius,
  formatTemperature,
  formatTemperatureDifference,
  fromCentiCelsius,
  ThermalInputError,
  toCentiCelsius,
  UCUM_UNIT_CODES,
} from '../../../shared/thermal';

// eslint-disable-next-line @typescript-eslint/no-require-imports
const { UcumLhcUtils } = require('@lhncbc/ucum-lhc');
const ucum = UcumLhcUtils.getInstance();

function ucumConvert(from: string, value: number, to: string): number {
  const result = ucum.convertUnitTo(from, value, to);
  expect(result.status).toBe('succeeded');
  return result.toVal as number;
}

/** Half-away-from-zero n / d for non-negative integers, done by hand for the checks. */
const roundHalfUp = (n: number, d: number): number => Math.floor((2 * n + d) / (2 * d));

describe('°C ↔ °F vectors (NIST SP 811, App. B.8: t(°F) = 1.8 × t(°C) + 32)', () => {
  it.each([
    [32.0, 89.6],
    [36.0, 96.8],
    [36.5, 97.7],
    [37.5, 99.5],
    [38.0, 100.4],
    [39.0, 102.2],
  ])('%s °C is %s °F (NIST SP 811)', (celsius, fahrenheit) => {
    expect(celsiusToFahrenheit(celsius)).toBe(fahrenheit);
    expect(fahrenheitToCelsius(fahrenheit)).toBe(celsius);
    expect(toCentiCelsius(fahrenheit, 'F')).toBe(Math.round(celsius * 100));
    expect(fromCentiCelsius(Math.round(celsius * 100), 'F')).toBe(fahrenheit);
  });

  it('0 °F is −17.78 °C (NIST SP 811 formula; asserted in @lhncbc/ucum-lhc tests)', () => {
    expect(fahrenheitToCelsius(0)).toBe(-17.78);
    expect(ucumConvert('[degF]', 0, 'Cel')).toBeCloseTo(-17.78, 2);
  });

  it('−1 °C is 30.2 °F (NIST SP 811 formula; asserted in @lhncbc/ucum-lhc tests)', () => {
    expect(celsiusToFahrenheit(-1)).toBe(30.2);
    expect(ucumConvert('Cel', -1, '[degF]')).toBeCloseTo(30.2, 9);
  });

  it('0 °F and −1 °C are outside the clinical input limits, so toCentiCelsius refuses them (common practice)', () => {
    expect(() => toCentiCelsius(0, 'F')).toThrow(ThermalInputError);
    expect(() => toCentiCelsius(-1, 'C')).toThrow(ThermalInputError);
  });

  it('98.6 °F is exactly 37.00 °C (NIST SP 811)', () => {
    expect(toCentiCelsius(98.6, 'F')).toBe(3700);
    expect(fahrenheitToCelsius(98.6)).toBe(37);
  });

  it('uses the UCUM codes Cel and [degF] (UCUM 2.2)', () => {
    expect(UCUM_UNIT_CODES).toEqual({ C: 'Cel', F: '[degF]' });
  });
});

describe('cross-check against @lhncbc/ucum-lhc over 30.0–42.0 °C in 0.1 steps (NIST SP 811 via UCUM)', () => {
  const tenths = Array.from({ length: 121 }, (_, i) => 300 + i);

  it('°C → °F matches the reference library', () => {
    for (const t of tenths) {
      const celsius = t / 10;
      const reference = ucumConvert('Cel', celsius, '[degF]');
      expect(celsiusToFahrenheit(celsius)).toBeCloseTo(reference, 9);
      expect(fromCentiCelsius(t * 10, 'F')).toBeCloseTo(reference, 9);
    }
  });

  it('°F → °C matches the reference library, and toCentiCelsius is its correctly rounded value', () => {
    for (const t of tenths) {
      const fahrenheit = celsiusToFahrenheit(t / 10);
      const reference = ucumConvert('[degF]', fahrenheit, 'Cel');
      expect(fahrenheitToCelsius(fahrenheit, 6)).toBeCloseTo(reference, 5);
      expect(toCentiCelsius(fahrenheit, 'F')).toBe(t * 10);
    }
  });

  it('every tenth of °F from 86.0 to 107.6 converts to the reference rounded to hundredths', () => {
    // (F − 32) × 5/9 in hundredths has ninths as its fraction, never a half: no tie to argue about.
    for (let t = 860; t <= 1076; t += 1) {
      const fahrenheit = t / 10;
      const reference = ucumConvert('[degF]', fahrenheit, 'Cel');
      expect(toCentiCelsius(fahrenheit, 'F')).toBe(Math.round(reference * 100));
    }
  });
});

describe('toCentiCelsius: exact hundredths, rounded half away from zero (common practice)', () => {
  it('keeps typed hundredths of °C exact over the whole input range', () => {
    for (let c = 2000; c <= 4500; c += 1) expect(toCentiCelsius(c / 100, 'C')).toBe(c);
  });

  it('rounds typed thousandths half away from zero where value × 100 would not (36.445 → 36.45)', () => {
    expect(toCentiCelsius(36.445, 'C')).toBe(3645);
    expect(toCentiCelsius(36.444, 'C')).toBe(3644);
    // Every thousandth from 20.000 to 45.000: includes the 151 values where Math.round(v * 100)
    // rounds the wrong way (20.025, 32.035…).
    for (let m = 20000; m <= 45000; m += 1) {
      expect(toCentiCelsius(m / 1000, 'C')).toBe(roundHalfUp(m, 10));
    }
  });

  it('°F typed to hundredths: (F − 32) × 5/9 rounded once (property, NIST SP 811)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 6800, max: 11300 }), (hundredthsF) => {
        expect(toCentiCelsius(hundredthsF / 100, 'F')).toBe(roundHalfUp((hundredthsF - 3200) * 5, 9));
      }),
      { numRuns: 2000 },
    );
  });

  it('°C → stored → °F → stored is the identity for multiples of 0.05 °C (property, NIST SP 811)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 400, max: 900 }), (k) => {
        const centi = k * 5;
        expect(toCentiCelsius(fromCentiCelsius(centi, 'F'), 'F')).toBe(centi);
      }),
    );
  });

  it('every stored hundredth survives the round trip through 2-decimal °F (NIST SP 811)', () => {
    for (let centi = 2000; centi <= 4500; centi += 1) {
      expect(toCentiCelsius(fromCentiCelsius(centi, 'F'), 'F')).toBe(centi);
    }
  });
});

describe('input limits: 20.0–45.0 °C / 68.0–113.0 °F (common practice)', () => {
  it.each([
    [NaN, 'C', 'invalid-temperature'],
    [Infinity, 'C', 'invalid-temperature'],
    [-Infinity, 'F', 'invalid-temperature'],
    [19.99, 'C', 'out-of-range'],
    [45.01, 'C', 'out-of-range'],
    [67.9, 'F', 'out-of-range'],
    [113.1, 'F', 'out-of-range'],
    [310, 'K', 'invalid-unit'],
  ])('%s %s throws ThermalInputError %s with the field', (value, unit, code) => {
    let thrown: unknown;
    try {
      toCentiCelsius(value as number, unit as 'C', 'remote');
    } catch (error) {
      thrown = error;
    }
    expect(thrown).toBeInstanceOf(ThermalInputError);
    expect(thrown).toMatchObject({ field: 'remote', code });
  });

  it('accepts the limits themselves', () => {
    expect(toCentiCelsius(20, 'C')).toBe(2000);
    expect(toCentiCelsius(45, 'C')).toBe(4500);
    expect(toCentiCelsius(68, 'F')).toBe(2000);
    expect(toCentiCelsius(113, 'F')).toBe(4500);
  });

  it('names the range in the unit the nurse typed', () => {
    expect(() => toCentiCelsius(120, 'F')).toThrow('68.0 and 113.0 °F');
    expect(() => toCentiCelsius(50, 'C')).toThrow('20.0 and 45.0 °C');
  });
});

describe('display (common practice)', () => {
  it('formats one decimal with a space before the unit', () => {
    expect(formatTemperature(3680, 'C')).toBe('36.8 °C');
    expect(formatTemperature(3680, 'F')).toBe('98.2 °F');
    expect(formatTemperature(3700, 'F')).toBe('98.6 °F');
    expect(formatTemperature(3645, 'C')).toBe('36.5 °C');
    expect(formatTemperature(3644, 'C')).toBe('36.4 °C');
  });

  it('formats a difference with no +32 offset: 0.5 °C = 0.9 °F (NIST SP 811)', () => {
    expect(formatTemperatureDifference(50, 'C')).toBe('0.5 °C');
    expect(formatTemperatureDifference(50, 'F')).toBe('0.9 °F');
    expect(formatTemperatureDifference(100, 'F')).toBe('1.8 °F');
    expect(formatTemperatureDifference(-60, 'C')).toBe('-0.6 °C');
  });

  it('fromCentiCelsius gives °C exactly and °F to two decimals', () => {
    expect(fromCentiCelsius(3651, 'C')).toBe(36.51);
    expect(fromCentiCelsius(3651, 'F')).toBe(97.72);
    expect(() => fromCentiCelsius(36.5, 'C')).toThrow(ThermalInputError);
  });
});
