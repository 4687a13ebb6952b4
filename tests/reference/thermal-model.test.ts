/**
 * The reference model's own checks, each against a published or handbook value (named beside
 * it), so that the property and scenario tests compare the product with something that was
 * itself checked.
 */
import { bandOf, centiFrom, clockStatus, evaluateModel, fahrenheitFromCenti, lateChecks, MODEL_DEFAULTS, type ModelHistory, type ModelReading } from './thermal-model';

const T0 = Date.parse('2026-11-16T08:00:00Z');
const MIN = 60_000;
const m = (minutes: number) => T0 + minutes * MIN;
let seq = 0;
const rd = (minute: number, values: Partial<ModelReading> = {}): ModelReading => ({ id: `r${++seq}`, takenAt: m(minute), recordedAt: m(minute), ...values });
const history = (h: Partial<ModelHistory> = {}): ModelHistory => ({
  admittedAt: T0,
  admissionControlMode: 'skin-servo',
  readings: [],
  actions: [],
  sessions: [],
  settings: [],
  ...h,
});
const kinds = (h: ModelHistory, minute: number) => evaluateModel(h, m(minute)).open.map((f) => f.kind);

describe('conversions', () => {
  it('matches the published vectors (NIST SP 811, App. B.8)', () => {
    const vectors: Record<string, number> = { '32.0': 89.6, '36.0': 96.8, '36.5': 97.7, '37.5': 99.5, '38.0': 100.4, '39.0': 102.2 };
    for (const [c, f] of Object.entries(vectors)) {
      expect([fahrenheitFromCenti(centiFrom(Number(c), 'C')), centiFrom(f, 'F')]).toEqual([f, Number(c) * 100]);
    }
  });

  it('reads 0 °F as −17.78 °C and −1 °C as 30.2 °F (asserted in @lhncbc/ucum-lhc tests)', () => {
    expect(centiFrom(0, 'F')).toBe(-1778);
    expect(fahrenheitFromCenti(centiFrom(-1, 'C'))).toBe(30.2);
  });

  it('a difference of 0.9 °F is 0.5 °C, no offset (NIST SP 811)', () => {
    expect(centiFrom(98.6, 'F') - centiFrom(97.7, 'F')).toBe(50);
  });

  it('agrees with the US National Library of Medicine UCUM library across the clinical range (UCUM 2.2)', () => {
    // eslint-disable-next-line @typescript-eslint/no-require-imports
    const { UcumLhcUtils } = require('@lhncbc/ucum-lhc');
    const ucum = UcumLhcUtils.getInstance();
    for (let tenths = 300; tenths <= 420; tenths += 1) {
      const c = tenths / 10;
      const res = ucum.convertUnitTo('Cel', c, '[degF]');
      expect(res.status).toBe('succeeded');
      expect(fahrenheitFromCenti(centiFrom(c, 'C'))).toBeCloseTo(res.toVal, 6);
    }
  });

  it('reads a typed value as the decimal that was typed (32.035 °C is 3204, not 3203)', () => {
    // from memory: the binary double of 32.035 is just below it; half away from zero on the decimal.
    expect(centiFrom(32.035, 'C')).toBe(3204);
  });
});

describe('remote-site bands (WHO 1997 via Miller 2011; fever: Bedside Clinical Guidelines Partnership)', () => {
  it.each([
    [3650, 'normal'],
    [3750, 'normal'],
    [3640, 'cold-stress'],
    [3645, 'cold-stress'],
    [3600, 'cold-stress'],
    [3590, 'moderate-hypothermia'],
    [3200, 'moderate-hypothermia'],
    [3190, 'severe-hypothermia'],
    [3180, 'severe-hypothermia'],
    [3760, 'hyperthermia'],
    [3799, 'hyperthermia'],
    [3800, 'fever'],
  ])('%p centi is %p', (centi, band) => {
    expect(bandOf(centi)).toBe(band);
  });
});

describe('flags', () => {
  it('a gap of more than 0.5 °C flags, exactly 0.5 does not; it says the probe is lower (common practice)', () => {
    const exact = history({ readings: [rd(10, { probe: 3600, remote: 3650 })] });
    expect(kinds(exact, 11)).toEqual([]);
    const h = history({ readings: [rd(10, { probe: 3590, remote: 3650 })] });
    const [gap] = evaluateModel(h, m(11)).open;
    expect(gap).toMatchObject({ kind: 'gap', direction: 'probe-lower', severity: 'urgent' });
  });

  it('a gap stays open without an action, through any number of in-limit readings (common practice)', () => {
    const readings = [rd(0, { probe: 3700, remote: 3640 })];
    for (let i = 1; i <= 48; i += 1) readings.push(rd(i * 100, { probe: 3680, remote: 3670 }));
    expect(kinds(history({ readings }), 48 * 100 + 5)).toContain('gap');
  });

  it('a recheck seconds after an action does not close a gap; one after the settle time does (common practice: 15–30 min)', () => {
    const first = rd(0, { probe: 3700, remote: 3620 });
    const base = history({ readings: [first], actions: [{ flagKey: `gap:${first.id}`, at: m(5) }] });
    const early = { ...base, readings: [...base.readings, { ...rd(5), takenAt: m(5) + 20_000, recordedAt: m(5) + 20_000, probe: 3680, remote: 3670 }] };
    expect(kinds(early, 6)).toContain('gap');
    const later = { ...base, readings: [...base.readings, rd(5 + MODEL_DEFAULTS.settleMinutes, { probe: 3680, remote: 3670 })] };
    expect(kinds(later, 25)).not.toContain('gap');
  });

  it('axillary 31.8 °C is severe hypothermia, critical, escalated at once (WHO 1997 via Miller 2011)', () => {
    const [flag] = evaluateModel(history({ readings: [rd(10, { remote: 3180 })] }), m(11)).open;
    expect(flag).toMatchObject({ kind: 'cold-stress', band: 'severe-hypothermia', severity: 'critical', escalateAfter: m(10) });
  });

  it('mild cold stress (36.0–36.4 °C) is watched and does not escalate by default (WHO 1997 via Miller 2011)', () => {
    const [flag] = evaluateModel(history({ readings: [rd(10, { remote: 3620 })] }), m(11)).open;
    expect(flag).toMatchObject({ kind: 'cold-stress', band: 'cold-stress', severity: 'caution', escalateAfter: null });
  });

  it('cold stress keeps its worst band and closes at 36.5 °C (WHO 1997 via Miller 2011)', () => {
    const h = history({ readings: [rd(10, { remote: 3620 }), rd(40, { remote: 3550 }), rd(70, { remote: 3640 })] });
    expect(evaluateModel(h, m(75)).open[0]).toMatchObject({ band: 'moderate-hypothermia', severity: 'urgent', severityAt: m(40) });
    const closed = { ...h, readings: [...h.readings, rd(100, { remote: 3650 })] };
    expect(kinds(closed, 101)).toEqual([]);
  });

  it('38.0 °C is fever, not hyperthermia; 37.6 °C is a heat-stress prompt (Bedside Clinical Guidelines Partnership; WHO 1997)', () => {
    expect(kinds(history({ readings: [rd(10, { remote: 3800 })] }), 11)).toEqual(['fever']);
    expect(kinds(history({ readings: [rd(10, { remote: 3760 })] }), 11)).toEqual(['heat-stress']);
  });

  it('a heart rate of 160 raises nothing, 161 raises heat stress; a probe-only reading does not close it (Duquesne; Fleming 2011)', () => {
    expect(kinds(history({ readings: [rd(10, { probe: 3680, heartRate: 160 })] }), 11)).toEqual([]);
    const h = history({ readings: [rd(10, { probe: 3680, heartRate: 161 }), rd(20, { probe: 3680 })] });
    expect(kinds(h, 21)).toEqual(['heat-stress']);
    const closed = { ...h, readings: [...h.readings, rd(30, { probe: 3680, heartRate: 140 })] };
    expect(kinds(closed, 31)).toEqual([]);
  });
});

describe('check clocks', () => {
  it('a remote-site check is due 2 h after the last one; due soon in the last 15 min; overdue after (common practice)', () => {
    const h = history({ readings: [rd(0, { remote: 3680 })] });
    const state = evaluateModel(h, m(100));
    expect(state.clocks.remoteDueAt).toBe(m(120));
    expect(clockStatus(m(120), m(104))).toBe('ok');
    expect(clockStatus(m(120), m(105))).toBe('due-soon');
    expect(clockStatus(m(120), m(120))).toBe('due-soon');
    expect(clockStatus(m(120), m(120) + 1)).toBe('overdue');
    expect(kinds(h, 120)).toEqual([]);
    expect(evaluateModel(h, m(121)).open[0]).toMatchObject({ kind: 'overdue-check', raisedAt: m(120) });
  });

  it('a probe value is not a remote-site check (IEC 60601-2-21:2020 scope note)', () => {
    const h = history({ readings: [rd(0, { remote: 3680 }), rd(110, { probe: 3660 })] });
    expect(evaluateModel(h, m(121)).open.map((f) => f.kind)).toEqual(['overdue-check']);
  });

  it('manual mode: a check at least every 15 minutes, any infant temperature counts; the 2-hourly clock keeps running (ECRI)', () => {
    const h = history({ readings: [rd(0, { remote: 3680 }), rd(30, { controlMode: 'manual', heaterOutputPct: 40 }), rd(40, { probe: 3670 })] });
    const at50 = evaluateModel(h, m(50));
    expect(at50.clocks).toMatchObject({ manualDueAt: m(55), remoteDueAt: m(120), nextDueAt: m(55) });
    expect(at50.open).toEqual([]);
    expect(evaluateModel(h, m(56)).open[0]).toMatchObject({ kind: 'manual-mode', raisedAt: m(55) });
  });

  it('manual mode at 100 % output for more than 15 min raises the manual-mode flag, exactly 15 does not (from memory)', () => {
    const h = history({ readings: [rd(0, { controlMode: 'manual', heaterOutputPct: 100, probe: 3680 }), rd(10, { probe: 3690 }), rd(15, { probe: 3690 })] });
    expect(kinds(h, 15)).toEqual([]);
    expect(evaluateModel(h, m(16)).open[0]).toMatchObject({ kind: 'manual-mode', raisedAt: m(15) });
  });

  it('a recheck is due 30 min after the last action on an open flag (common practice)', () => {
    const first = rd(0, { probe: 3700, remote: 3620 });
    const h = history({
      readings: [first],
      actions: [
        { flagKey: `gap:${first.id}`, at: m(5) },
        { flagKey: `gap:${first.id}`, at: m(12) },
      ],
    });
    expect(evaluateModel(h, m(20)).clocks).toMatchObject({ recheckDueAt: m(42), nextDueAt: m(42) });
  });

  it('a late-charted on-time check leaves no overdue flag (the flag is withdrawn) and is not late (common practice)', () => {
    const late: ModelReading = { id: 'late', takenAt: m(115), recordedAt: m(140), remote: 3680 };
    const h = history({ readings: [rd(0, { remote: 3680 }), late] });
    expect(kinds(h, 130)).toEqual(['overdue-check']);
    expect(kinds(h, 140)).toEqual([]);
    expect(lateChecks(h, m(150)).map((c) => c.late)).toEqual([false, false]);
  });

  it('a change of interval 120 → 90 applies from the next check; earlier checks are judged as before (common practice)', () => {
    const readings = [rd(0, { remote: 3680 }), rd(115, { remote: 3680 }), rd(230, { remote: 3680 }), rd(340, { remote: 3680 })];
    const before = lateChecks(history({ readings }), m(400)).map((c) => c.late);
    expect(before).toEqual([false, false, false, false]);
    const changed = history({ readings, settings: [{ effectiveFrom: m(300), ...MODEL_DEFAULTS, checkIntervalMinutes: 90 }] });
    // The check at 340 was due at 230 + 120 (the version at the previous check): on time.
    expect(lateChecks(changed, m(400)).map((c) => c.late)).toEqual([false, false, false, false]);
    expect(evaluateModel(changed, m(400)).clocks.remoteDueAt).toBe(m(340 + 90));
  });

  it('an entered-in-error check is removed; the corrected version counts (FHIR R4 Observation.status)', () => {
    const original = rd(30, { remote: 3680 });
    const error: ModelReading = { id: 'err', replacesId: original.id, takenAt: m(30), recordedAt: m(40), enteredInError: true };
    expect(evaluateModel(history({ readings: [original, error] }), m(41)).clocks.remoteDueAt).toBe(m(120));
    expect(evaluateModel(history({ readings: [original] }), m(41)).clocks.remoteDueAt).toBe(m(150));
    const moved = history({ readings: [original, { ...error, enteredInError: false, takenAt: m(0), remote: 3700 }, rd(60, { remote: 3690 })] });
    expect(evaluateModel(moved, m(61)).clocks.remoteDueAt).toBe(m(180));
  });
});

describe('skin-to-skin (common practice)', () => {
  const session = { id: 's1', startedAt: m(0), endedAt: m(120), referenceCenti: 3650, limitCenti: 50 };
  it('a deviation of exactly the limit raises nothing; more raises, saying colder', () => {
    expect(kinds(history({ sessions: [session], readings: [rd(10, { remote: 3600 })] }), 11)).toEqual(['cold-stress']);
    const h = history({ sessions: [session], readings: [rd(10, { probe: 3590 })] });
    expect(evaluateModel(h, m(11)).open[0]).toMatchObject({ kind: 'skin-to-skin-deviation', direction: 'colder' });
  });

  it('a probe-only reading does not close a flag raised on the remote site; the session end does', () => {
    const h = history({ sessions: [session], readings: [rd(10, { remote: 3710 }), rd(20, { probe: 3650 })] });
    expect(kinds(h, 21)).toEqual(['skin-to-skin-deviation']);
    expect(kinds(h, 121)).not.toContain('skin-to-skin-deviation');
  });
});
