import { CLINICAL_PROMPT_CAVEAT, DEFAULT_POLICY, resolvePolicy, ThermalInputError } from '../../../shared/thermal';

describe('unit policy defaults (sources per line: published, common practice or from memory)', () => {
  it('each default, with its source beside it', () => {
    expect(DEFAULT_POLICY).toEqual({
      checkIntervalMinutes: 120, // common practice (published ranges 1–3 h)
      dueSoonMinutes: 15, // common practice (a product choice)
      gapLimitCenti: 50, // common practice: more than 0.5 °C
      highOutputPct: 80, // from memory
      highOutputMinutes: 15, // from memory
      manualCheckMinutes: 15, // ECRI hazard report
      escalationDelayMinutes: 30, // from memory
      recheckMinutes: 30, // common practice: recheck in 15–30 minutes
      recheckSettleMinutes: 15, // common practice: a reading settles 15–30 minutes after a change
      escalationDelays: {}, // the severity table's defaults
      dayShiftStart: '07:00', // common practice
      nightShiftStart: '19:00', // common practice
      timeZone: 'Europe/London', // a default
    });
    expect(Object.isFrozen(DEFAULT_POLICY)).toBe(true);
  });

  it('resolvePolicy overlays a unit setting and keeps the rest (common practice)', () => {
    const policy = resolvePolicy({ checkIntervalMinutes: 60, timeZone: 'America/Chicago', dueSoonMinutes: undefined });
    expect(policy.checkIntervalMinutes).toBe(60);
    expect(policy.timeZone).toBe('America/Chicago');
    expect(policy.dueSoonMinutes).toBe(15);
    expect(resolvePolicy()).toEqual(DEFAULT_POLICY);
  });

  it.each([
    [{ checkIntervalMinutes: 0 }, 'checkIntervalMinutes'],
    [{ dueSoonMinutes: -1 }, 'dueSoonMinutes'],
    [{ gapLimitCenti: 0.5 }, 'gapLimitCenti'],
    [{ highOutputPct: 120 }, 'highOutputPct'],
    [{ dayShiftStart: '7am' }, 'dayShiftStart'],
    [{ dayShiftStart: '20:00' }, 'nightShiftStart'],
    [{ timeZone: 'Mars/Olympus' }, 'timeZone'],
  ])('refuses %j naming %s', (partial, field) => {
    expect(() => resolvePolicy(partial)).toThrow(ThermalInputError);
    try {
      resolvePolicy(partial);
    } catch (error) {
      expect(error).toMatchObject({ field, code: 'invalid-policy' });
    }
  });

  it('every prompt defers to unit policy, the device and licensed practice (common practice)', () => {
    expect(CLINICAL_PROMPT_CAVEAT).toMatch(/supports your judgment/);
    expect(CLINICAL_PROMPT_CAVEAT).toMatch(/unit's policy/);
    expect(CLINICAL_PROMPT_CAVEAT).toMatch(/device's instructions/);
    expect(CLINICAL_PROMPT_CAVEAT).toMatch(/licensed practice/);
  });
});
