import { HEAT_STRESS_CHECKLIST, HEAT_STRESS_SIGNS, heatStressPrompt, ThermalInputError, type HeatStressSign } from '../../../shared/thermal';

describe('heat-stress prompt', () => {
  it.each(HEAT_STRESS_SIGNS.map((info) => [info.sign, info.label]))('the sign %s (%s) raises it on its own (NHS GG&C, Thermal care of the neonate; common practice)', (sign) => {
    expect(heatStressPrompt({ signs: [sign as HeatStressSign] })).toEqual({
      raised: true,
      reasons: [{ kind: 'sign', sign }],
    });
  });

  it('lists five signs with plain-English labels (NHS GG&C; common practice)', () => {
    expect(HEAT_STRESS_SIGNS.map((info) => info.sign)).toEqual(['red-skin', 'warm-to-touch', 'sweating', 'irritability', 'fast-breathing']);
    expect(HEAT_STRESS_SIGNS[0].label).toBe('Red or flushed skin');
  });

  it('remote 37.50 °C does not raise it; 37.51 °C does (WHO 1997 via Miller 2011: normal up to 37.5)', () => {
    expect(heatStressPrompt({ remoteCenti: 3750, signs: [] })).toEqual({ raised: false, reasons: [] });
    expect(heatStressPrompt({ remoteCenti: 3751, signs: [] })).toEqual({
      raised: true,
      reasons: [{ kind: 'remote-above-normal' }],
    });
  });

  it('heart rate 160 does not raise it; 161 does (Duquesne newborn assessment; Fleming 2011)', () => {
    expect(heatStressPrompt({ heartRate: 160, signs: [] }).raised).toBe(false);
    expect(heatStressPrompt({ heartRate: 161, signs: [] })).toEqual({
      raised: true,
      reasons: [{ kind: 'heart-rate-high' }],
    });
  });

  it('a normal heart rate does not lower a sign (Harpin 1983 via NHS GG&C: heart rate may not rise)', () => {
    expect(heatStressPrompt({ heartRate: 130, remoteCenti: 3700, signs: ['sweating'] }).raised).toBe(true);
  });

  it('gives every reason once, signs first in list order (common practice)', () => {
    expect(heatStressPrompt({ remoteCenti: 3800, heartRate: 175, signs: ['sweating', 'red-skin', 'sweating'] }).reasons).toEqual([
      { kind: 'sign', sign: 'red-skin' },
      { kind: 'sign', sign: 'sweating' },
      { kind: 'remote-above-normal' },
      { kind: 'heart-rate-high' },
    ]);
  });

  it('nothing charted raises nothing (common practice)', () => {
    expect(heatStressPrompt({ signs: [] })).toEqual({ raised: false, reasons: [] });
    expect(heatStressPrompt({ remoteCenti: null, heartRate: null, signs: [] }).raised).toBe(false);
  });

  it('refuses an unknown sign (common practice: a 400 naming the field)', () => {
    expect(() => heatStressPrompt({ signs: ['blue' as HeatStressSign] })).toThrow(ThermalInputError);
  });

  it('has a short checklist under unit policy (common practice)', () => {
    const text = HEAT_STRESS_CHECKLIST.join('\n');
    expect(HEAT_STRESS_CHECKLIST.length).toBeGreaterThanOrEqual(5);
    expect(text).toMatch(/set temperature/);
    expect(text).toMatch(/coverings/);
    expect(text).toMatch(/15–30 minutes/);
    expect(text).toMatch(/nurse in charge/);
    expect(text).toMatch(/unit policy/);
  });
});
