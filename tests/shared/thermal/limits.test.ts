import { checkPlausibility, HARD_LIMITS, isThermalInputError, PLAUSIBLE, ThermalInputError, toCentiCelsius } from '../../../shared/thermal';

describe('hard limits: refuse what cannot be a reading (common practice)', () => {
  it('temperatures 20.00–45.00 °C, heart rate 30–300, heater output 0–100 %', () => {
    expect(HARD_LIMITS.temperatureCenti).toEqual({ min: 2000, max: 4500 });
    expect(HARD_LIMITS.heartRate).toEqual({ min: 30, max: 300 });
    expect(HARD_LIMITS.heaterOutputPct).toEqual({ min: 0, max: 100 });
  });

  it.each([
    ['probe', 1999],
    ['remote', 4501],
    ['air', 1500],
    ['set', 5000],
    ['heartRate', 29],
    ['heartRate', 301],
    ['heaterOutputPct', -1],
    ['heaterOutputPct', 101],
    ['remote', NaN],
    ['heartRate', Infinity],
    ['heartRate', 120.5],
    ['probe', 3650.5],
  ] as const)('%s %s is refused', (field, value) => {
    const check = checkPlausibility(field, value);
    expect(check.result).toBe('refuse');
    expect(check.reason).not.toBe('');
  });
});

describe('plausible ranges: confirm the unusual (from memory)', () => {
  it('probe 34.0–38.0 °C (Gomella 2013, widened), remote 34.0–39.5 °C, air 25–40 °C, set 34.0–38.0 °C, heart rate 80–220', () => {
    expect(PLAUSIBLE.probe).toEqual({ min: 3400, max: 3800 });
    expect(PLAUSIBLE.remote).toEqual({ min: 3400, max: 3950 });
    expect(PLAUSIBLE.air).toEqual({ min: 2500, max: 4000 });
    expect(PLAUSIBLE.set).toEqual({ min: 3400, max: 3800 });
    expect(PLAUSIBLE.heartRate).toEqual({ min: 80, max: 220 });
  });

  it.each([
    ['remote', 3399, 'confirm'],
    ['remote', 3400, 'ok'],
    ['remote', 3950, 'ok'],
    ['remote', 3951, 'confirm'],
    ['probe', 3300, 'confirm'],
    // Gomella 2013: normal abdominal skin 36.0–36.5 °C; a 39.4 °C probe is confirmed before it is charted.
    ['probe', 3940, 'confirm'],
    ['probe', 3800, 'ok'],
    ['air', 2499, 'confirm'],
    ['air', 4001, 'confirm'],
    ['set', 3801, 'confirm'],
    ['set', 3650, 'ok'],
    ['heartRate', 79, 'confirm'],
    ['heartRate', 80, 'ok'],
    ['heartRate', 221, 'confirm'],
    ['heaterOutputPct', 100, 'ok'],
  ] as const)('%s %s → %s', (field, value, result) => {
    expect(checkPlausibility(field, value).result).toBe(result);
  });

  it('says why, in the unit the nurse uses', () => {
    expect(checkPlausibility('remote', 3390).reason).toBe('Remote-site temperature 33.9 °C is outside the usual 34.0–39.5 °C: confirm it is correct');
    expect(checkPlausibility('remote', 3390, 'F').reason).toBe('Remote-site temperature 93.0 °F is outside the usual 93.2–103.1 °F: confirm it is correct');
    expect(checkPlausibility('remote', 3650)).toEqual({ result: 'ok', reason: '' });
  });
});

describe('ThermalInputError (common practice: a 400 that names the field)', () => {
  it('is an Error with field and code', () => {
    try {
      toCentiCelsius(Number('abc'), 'C', 'probe');
      throw new Error('expected a throw');
    } catch (error) {
      expect(error).toBeInstanceOf(Error);
      expect(error).toBeInstanceOf(ThermalInputError);
      expect(isThermalInputError(error)).toBe(true);
      expect(error).toMatchObject({ name: 'ThermalInputError', field: 'probe', code: 'invalid-temperature' });
    }
  });
});
