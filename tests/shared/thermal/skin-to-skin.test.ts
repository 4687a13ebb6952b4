import { skinToSkinDeviation, ThermalInputError } from '../../../shared/thermal';

const start = new Date('2026-05-01T14:00:00Z');
const at = (minutes: number) => new Date(start.getTime() + minutes * 60_000);
const session = (limitCenti: number) => ({ referenceCenti: 3650, limitCenti, startedAt: start, endedAt: at(60) });

// Deviation limits of 0.5 or 1.0 °C around the reference during skin-to-skin care: common practice.
describe('skin-to-skin deviation limit (common practice)', () => {
  it('exactly 0.5 °C from the reference does not exceed a 0.5 limit; 0.51 does', () => {
    expect(skinToSkinDeviation(session(50), { takenAt: at(10), remoteCenti: 3600 })).toEqual({
      inSession: true,
      deviationCenti: -50,
      exceeds: false,
    });
    expect(skinToSkinDeviation(session(50), { takenAt: at(10), remoteCenti: 3701 })).toEqual({
      inSession: true,
      deviationCenti: 51,
      exceeds: true,
    });
  });

  it('exactly 1.0 °C does not exceed a 1.0 limit; 1.01 and beyond do', () => {
    expect(skinToSkinDeviation(session(100), { takenAt: at(10), remoteCenti: 3550 }).exceeds).toBe(false);
    expect(skinToSkinDeviation(session(100), { takenAt: at(10), remoteCenti: 3549 }).exceeds).toBe(true);
    expect(skinToSkinDeviation(session(100), { takenAt: at(10), remoteCenti: 3800 }).exceeds).toBe(true);
  });

  it('uses the remote site when taken, else the probe', () => {
    expect(skinToSkinDeviation(session(50), { takenAt: at(5), remoteCenti: 3650, probeCenti: 3500 }).exceeds).toBe(false);
    expect(skinToSkinDeviation(session(50), { takenAt: at(5), probeCenti: 3500 })).toEqual({
      inSession: true,
      deviationCenti: -150,
      exceeds: true,
    });
    expect(skinToSkinDeviation(session(50), { takenAt: at(5) })).toEqual({
      inSession: true,
      deviationCenti: null,
      exceeds: false,
    });
  });

  it('readings outside the session never exceed; the session is [start, end)', () => {
    const cold = { remoteCenti: 3400 };
    expect(skinToSkinDeviation(session(50), { takenAt: at(-1), ...cold })).toEqual({
      inSession: false,
      deviationCenti: null,
      exceeds: false,
    });
    expect(skinToSkinDeviation(session(50), { takenAt: at(0), ...cold }).inSession).toBe(true);
    expect(skinToSkinDeviation(session(50), { takenAt: at(60), ...cold }).inSession).toBe(false);
    const ongoing = { ...session(50), endedAt: null };
    expect(skinToSkinDeviation(ongoing, { takenAt: at(600), ...cold })).toMatchObject({ inSession: true, exceeds: true });
  });

  it('refuses a session that ends before it starts or has no limit', () => {
    expect(() => skinToSkinDeviation({ ...session(50), endedAt: at(-5) }, { takenAt: at(1) })).toThrow(ThermalInputError);
    expect(() => skinToSkinDeviation(session(0), { takenAt: at(1) })).toThrow(ThermalInputError);
  });
});
