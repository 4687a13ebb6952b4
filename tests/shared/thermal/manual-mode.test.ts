import { manualModeWarning, ThermalInputError, type ManualModeReading } from '../../../shared/thermal';

const t0 = new Date('2026-05-01T10:00:00Z');
const at = (minutes: number, seconds = 0) => new Date(t0.getTime() + minutes * 60_000 + seconds * 1000);

function manual(minutes: number, heaterOutputPct: number | null, remoteCenti: number | null = null): ManualModeReading {
  return { takenAt: at(minutes), controlMode: 'manual', heaterOutputPct, remoteCenti };
}

// ECRI, Infant Radiant Warmers Can Burn: Use with Care: manual mode is short-term and the infant
// is checked at least every 15 minutes. The 80 % / 15 min high-output rule is from memory.
describe('manual-mode warning', () => {
  it('high output for exactly 15 minutes does not warn; just over does (from memory)', () => {
    const readings = [manual(0, 90, 3700), manual(10, 90, 3700)];
    expect(manualModeWarning(readings, at(15))).toEqual({
      warning: false,
      reasons: [],
      manualSince: at(0),
      highOutputSince: at(0),
    });
    expect(manualModeWarning(readings, at(15, 1))).toEqual({
      warning: true,
      reasons: ['high-output-too-long'],
      manualSince: at(0),
      highOutputSince: at(0),
    });
  });

  it('80 % counts as high; 79 % does not (from memory)', () => {
    expect(manualModeWarning([manual(0, 80, 3700), manual(10, 80, 3700)], at(16)).reasons).toEqual(['high-output-too-long']);
    expect(manualModeWarning([manual(0, 79, 3700), manual(10, 79, 3700)], at(16)).warning).toBe(false);
  });

  it('a drop below the threshold restarts the high-output clock (from memory)', () => {
    const readings = [manual(0, 90, 3700), manual(5, 50, 3700), manual(8, 95, 3700), manual(20, null, 3700)];
    const result = manualModeWarning(readings, at(22));
    expect(result.highOutputSince).toEqual(at(8));
    expect(result.warning).toBe(false);
    expect(manualModeWarning(readings, at(23, 1)).reasons).toEqual(['high-output-too-long']);
  });

  it('no remote-site check for more than 15 minutes in manual warns (ECRI)', () => {
    const readings = [manual(0, 40, 3700)];
    expect(manualModeWarning(readings, at(15)).warning).toBe(false);
    expect(manualModeWarning(readings, at(15, 1)).reasons).toEqual(['no-check-in-manual']);
    // A check at 14 minutes restarts the clock.
    const checked = [...readings, manual(14, null, 3690)];
    expect(manualModeWarning(checked, at(20)).warning).toBe(false);
    expect(manualModeWarning(checked, at(29, 1)).reasons).toEqual(['no-check-in-manual']);
  });

  it('any charted temperature of the infant, probe included, is a check in manual (ECRI: check the infant at least every 15 minutes)', () => {
    const readings: ManualModeReading[] = [manual(0, 40, 3700), { ...manual(10, 40), probeCenti: 3650 }];
    expect(manualModeWarning(readings, at(16)).reasons).toEqual([]);
    expect(manualModeWarning(readings, at(25, 1)).reasons).toEqual(['no-check-in-manual']);
  });

  it('the check clock starts when manual mode is charted, not at an earlier servo check (ECRI)', () => {
    const readings: ManualModeReading[] = [{ takenAt: at(-60), controlMode: 'skin-servo', heaterOutputPct: 30, remoteCenti: 3700 }, manual(0, 40)];
    expect(manualModeWarning(readings, at(10)).warning).toBe(false);
    expect(manualModeWarning(readings, at(16)).reasons).toEqual(['no-check-in-manual']);
  });

  it('both reasons together, high output first (ECRI; from memory)', () => {
    expect(manualModeWarning([manual(0, 100)], at(30)).reasons).toEqual(['high-output-too-long', 'no-check-in-manual']);
  });

  it('servo modes never warn, whatever the output (common practice: the servo regulates)', () => {
    const readings: ManualModeReading[] = [
      { takenAt: at(0), controlMode: 'skin-servo', heaterOutputPct: 100 },
      { takenAt: at(1), controlMode: 'air-servo', heaterOutputPct: 100 },
    ];
    expect(manualModeWarning(readings, at(120))).toEqual({
      warning: false,
      reasons: [],
      manualSince: null,
      highOutputSince: null,
    });
  });

  it('leaving manual ends the warning and a new run starts a new clock (ECRI)', () => {
    const readings: ManualModeReading[] = [manual(0, 90, 3700), { takenAt: at(20), controlMode: 'skin-servo', heaterOutputPct: 90, remoteCenti: 3700 }, manual(30, 90, 3700)];
    expect(manualModeWarning(readings, at(25)).warning).toBe(false);
    const later = manualModeWarning(readings, at(40));
    expect(later).toMatchObject({ warning: false, manualSince: at(30), highOutputSince: at(30) });
  });

  it('a reading with no mode or no output charted keeps the last one (common practice)', () => {
    const readings: ManualModeReading[] = [manual(0, 90, 3700), { takenAt: at(10), controlMode: null, heaterOutputPct: null, remoteCenti: 3690 }];
    expect(manualModeWarning(readings, at(16))).toMatchObject({
      warning: true,
      reasons: ['high-output-too-long'],
      manualSince: at(0),
    });
  });

  it('takes readings in time order and ignores those after now (common practice)', () => {
    const readings = [manual(10, 90, 3700), manual(0, 90, 3700), { ...manual(30, 10, 3700) }];
    expect(manualModeWarning(readings, at(16))).toMatchObject({ warning: true, highOutputSince: at(0) });
  });

  it('takes a unit policy (from memory)', () => {
    const policy = { highOutputPct: 70, highOutputMinutes: 5, manualCheckMinutes: 30 };
    expect(manualModeWarning([manual(0, 75, 3700)], at(5, 1), policy).reasons).toEqual(['high-output-too-long']);
    expect(manualModeWarning([manual(0, 60, 3700)], at(29), policy).warning).toBe(false);
  });

  it('refuses an invalid date or mode (common practice: a 400 naming the field)', () => {
    expect(() => manualModeWarning([{ takenAt: new Date(NaN), controlMode: 'manual' }], at(0))).toThrow(ThermalInputError);
    expect(() => manualModeWarning([{ takenAt: at(0), controlMode: 'fixed' as never }], at(1))).toThrow(ThermalInputError);
  });
});
