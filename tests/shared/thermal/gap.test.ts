import fc from 'fast-check';
import { assessGap, assessGapCenti, ThermalInputError, toCentiCelsius } from '../../../shared/thermal';

const C = (value: number) => ({ value, unit: 'C' as const });
const F = (value: number) => ({ value, unit: 'F' as const });

describe('probe vs remote-site gap: more than 0.5 °C (0.9 °F) flags, exactly 0.5 does not (common practice)', () => {
  it('exactly 0.5 °C does not exceed', () => {
    expect(assessGap(C(37.0), C(36.5))).toEqual({ gapCenti: 50, direction: 'probe-higher', exceeds: false });
    expect(assessGap(C(36.0), C(36.5))).toEqual({ gapCenti: 50, direction: 'probe-lower', exceeds: false });
  });

  it('0.51 °C exceeds', () => {
    expect(assessGap(C(37.01), C(36.5))).toEqual({ gapCenti: 51, direction: 'probe-higher', exceeds: true });
  });

  it('exactly 0.9 °F does not exceed (0.9 °F = 0.5 °C, NIST SP 811)', () => {
    expect(assessGap(F(98.6), F(97.7))).toEqual({ gapCenti: 50, direction: 'probe-higher', exceeds: false });
  });

  it('1.0 °F exceeds (1.0 °F = 0.556 °C, NIST SP 811)', () => {
    expect(assessGap(F(98.6), F(97.6))).toEqual({ gapCenti: 56, direction: 'probe-higher', exceeds: true });
  });

  it('0.91 °F exceeds even though it shows as 0.5 °C to one decimal (NIST SP 811)', () => {
    expect(assessGap(F(98.61), F(97.7))).toMatchObject({ gapCenti: 51, exceeds: true });
  });

  it('a naive float difference would flag 95.9 vs 95.0 °F; the exact rule does not (common practice)', () => {
    expect(95.9 - 95.0 > 0.9).toBe(true); // the float trap this module exists to avoid
    expect(assessGap(F(95.9), F(95.0)).exceeds).toBe(false);
  });

  it('mixed units: probe in °C, remote in °F (NIST SP 811)', () => {
    // 97.7 °F = 36.5 °C exactly.
    expect(assessGap(C(37.0), F(97.7))).toEqual({ gapCenti: 50, direction: 'probe-higher', exceeds: false });
    expect(assessGap(C(37.01), F(97.7))).toEqual({ gapCenti: 51, direction: 'probe-higher', exceeds: true });
    // 97.6 °F = 36.444… °C: the gap from 36.95 °C is 0.5055… °C, over the limit although it
    // rounds to 51 hundredths only just.
    expect(assessGap(C(36.95), F(97.6))).toEqual({ gapCenti: 51, direction: 'probe-higher', exceeds: true });
    // 98.5 °F = 36.944… °C: 0.4944… °C from 36.45 °C rounds to 49 and does not exceed.
    expect(assessGap(C(36.45), F(98.5))).toEqual({ gapCenti: 49, direction: 'probe-lower', exceeds: false });
    // 97.59 °F = 36.43888… °C: the gap from 36.94 °C is 0.50111… °C. It rounds to 50
    // hundredths, yet it is more than 0.5 °C and must flag.
    const over = assessGap(C(36.94), F(97.59));
    expect(over.gapCenti).toBe(50);
    expect(over.exceeds).toBe(true);
  });

  it('equal values have direction equal and gap 0 (common practice)', () => {
    expect(assessGap(C(37), F(98.6))).toEqual({ gapCenti: 0, direction: 'equal', exceeds: false });
  });

  it('takes another limit, e.g. 1.0 °C (common practice)', () => {
    expect(assessGap(C(37.5), C(36.5), 100).exceeds).toBe(false);
    expect(assessGap(C(37.51), C(36.5), 100).exceeds).toBe(true);
  });
});

describe('every tenth-degree °F pair from 95.0 to 101.0 °F (NIST SP 811: 0.9 °F = 0.5 °C)', () => {
  // Integer tenths so the test itself has no float drift.
  const starts = Array.from({ length: 61 }, (_, i) => 950 + i);

  it('0.9 °F apart: none exceeds, either way round, entered or stored', () => {
    for (const t of starts) {
      const low = F(t / 10);
      const high = F((t + 9) / 10);
      expect(assessGap(high, low)).toMatchObject({ gapCenti: 50, exceeds: false });
      expect(assessGap(low, high)).toMatchObject({ gapCenti: 50, exceeds: false });
      // Stored as hundredths of °C, each rounded: still exactly 50 apart (same ninths fraction).
      expect(assessGapCenti(toCentiCelsius(high.value, 'F'), toCentiCelsius(low.value, 'F')).exceeds).toBe(false);
    }
  });

  it('1.0 °F apart: all exceed, either way round, entered or stored', () => {
    for (const t of starts) {
      const low = F(t / 10);
      const high = F((t + 10) / 10);
      expect(assessGap(high, low).exceeds).toBe(true);
      expect(assessGap(low, high).exceeds).toBe(true);
      expect(assessGapCenti(toCentiCelsius(high.value, 'F'), toCentiCelsius(low.value, 'F')).exceeds).toBe(true);
    }
  });
});

describe('assessGapCenti on stored values (common practice)', () => {
  it('50 does not exceed, 51 does', () => {
    expect(assessGapCenti(3700, 3650)).toEqual({ gapCenti: 50, direction: 'probe-higher', exceeds: false });
    expect(assessGapCenti(3599, 3650)).toEqual({ gapCenti: 51, direction: 'probe-lower', exceeds: true });
  });

  it('refuses non-integer stored values', () => {
    expect(() => assessGapCenti(36.5, 3650)).toThrow(ThermalInputError);
  });
});

describe('assessGap input errors name the field (common practice)', () => {
  it.each([
    [{ value: NaN, unit: 'C' }, C(36.5), 'probe', 'invalid-temperature'],
    [C(36.5), { value: Infinity, unit: 'C' }, 'remote', 'invalid-temperature'],
    [C(19.99), C(36.5), 'probe', 'out-of-range'],
    [C(36.5), C(45.01), 'remote', 'out-of-range'],
    [C(36.5), { value: 310, unit: 'K' }, 'remote', 'invalid-unit'],
  ])('%j vs %j → field %s, code %s', (probe, remote, field, code) => {
    expect(() => assessGap(probe as never, remote as never)).toThrow(ThermalInputError);
    try {
      assessGap(probe as never, remote as never);
    } catch (error) {
      expect(error).toMatchObject({ field, code });
    }
  });
});

describe('gap properties (fast-check; NIST SP 811 arithmetic)', () => {
  const hundredthsC = fc.integer({ min: 2000, max: 4500 });
  const hundredthsF = fc.integer({ min: 6800, max: 11300 });
  const limit = fc.integer({ min: 0, max: 200 });
  const unitValue = fc.oneof(
    hundredthsC.map((h) => C(h / 100)),
    hundredthsF.map((h) => F(h / 100)),
  );

  it('is symmetric: same gap and verdict, opposite direction', () => {
    fc.assert(
      fc.property(unitValue, unitValue, limit, (a, b, l) => {
        const ab = assessGap(a, b, l);
        const ba = assessGap(b, a, l);
        expect(ba.gapCenti).toBe(ab.gapCenti);
        expect(ba.exceeds).toBe(ab.exceeds);
        const flipped = { 'probe-higher': 'probe-lower', 'probe-lower': 'probe-higher', equal: 'equal' };
        expect(ba.direction).toBe(flipped[ab.direction]);
      }),
      { numRuns: 2000 },
    );
  });

  it('is the same whether both are entered in °C or both in the exact °F equivalent (multiples of 0.05 °C)', () => {
    // A multiple of 0.05 °C is an exact multiple of 0.09 °F, so both entries are the same temperature.
    const twentieths = fc.integer({ min: 400, max: 900 });
    fc.assert(
      fc.property(twentieths, twentieths, limit, (a, b, l) => {
        const [ca, cb] = [a * 5, b * 5];
        // Integer hundredths of °F first, then one division: (centi × 9/5 + 3200) / 100.
        const toF = (centi: number) => F(((centi * 9) / 5 + 3200) / 100);
        const inC = assessGap(C(ca / 100), C(cb / 100), l);
        expect(assessGap(toF(ca), toF(cb), l)).toEqual(inC);
        expect(inC).toEqual(assessGapCenti(ca, cb, l));
      }),
      { numRuns: 2000 },
    );
  });

  it('both in °F: exceeds ⇔ |ΔhundredthsF| × 5 > limit × 9, exactly', () => {
    fc.assert(
      fc.property(hundredthsF, hundredthsF, limit, (a, b, l) => {
        const exact = Math.abs(a - b) * 5 > l * 9;
        expect(assessGap(F(a / 100), F(b / 100), l).exceeds).toBe(exact);
      }),
      { numRuns: 5000 },
    );
  });

  it('mixed units: exceeds ⇔ exact rational gap > limit, and gapCenti is that gap rounded half away from zero', () => {
    fc.assert(
      fc.property(hundredthsC, hundredthsF, limit, (p, r, l) => {
        // probe − remote in ninths of a hundredth of °C: 9p − 5(r − 3200).
        const ninths = 9 * p - 5 * (r - 3200);
        const result = assessGap(C(p / 100), F(r / 100), l);
        expect(result.exceeds).toBe(Math.abs(ninths) > 9 * l);
        expect(result.gapCenti).toBe(Math.floor((2 * Math.abs(ninths) + 9) / 18));
        expect(result.direction).toBe(ninths > 0 ? 'probe-higher' : ninths < 0 ? 'probe-lower' : 'equal');
      }),
      { numRuns: 5000 },
    );
  });
});
