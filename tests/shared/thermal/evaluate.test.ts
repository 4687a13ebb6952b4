import fc from 'fast-check';
import {
  currentReadings,
  DEFAULT_POLICY,
  evaluateInfant,
  flagEscalation,
  type ActionInput,
  type EvaluatedFlag,
  type FlagKind,
  type InfantState,
  type ReadingInput,
  type SessionInput,
} from '../../../shared/thermal';
import { readingAfter } from './reading-fixture';

const t0 = new Date('2026-05-01T08:00:00Z');
const at = (minutes: number) => new Date(t0.getTime() + minutes * 60_000);

const reading = (id: string, minutes: number, values: Partial<ReadingInput> = {}): ReadingInput => readingAfter(t0, id, minutes, values);

/** A routine check: probe and axillary both charted, on skin servo. */
function check(id: string, minutes: number, probeCenti: number, remoteCenti: number, extra: Partial<ReadingInput> = {}) {
  return reading(id, minutes, { probeCenti, remoteCenti, remoteSite: 'axilla', controlMode: 'skin-servo', ...extra });
}

const action = (id: string, flagKey: string, minutes: number): ActionInput => ({
  id,
  flagKey,
  kind: 'moved-probe',
  at: at(minutes),
});

function evaluate(state: Partial<InfantState>, nowMinutes: number) {
  return evaluateInfant({ readings: [], actions: [], sessions: [], ...state }, at(nowMinutes), DEFAULT_POLICY);
}

const ofKind = <K extends FlagKind>(flags: EvaluatedFlag[], kind: K) => flags.filter((flag): flag is Extract<EvaluatedFlag, { kind: K }> => flag.kind === kind);

describe('gap flag: raised over 0.5 °C, closed by a recheck after an action (common practice)', () => {
  const raising = check('r1', 0, 3720, 3660); // 0.6 °C, remote in the normal band

  it('is raised by a reading over the limit, and not by one at the limit', () => {
    const atLimit = evaluate({ readings: [check('r0', 0, 3700, 3650)] }, 5);
    expect(ofKind(atLimit.flags, 'gap')).toEqual([]);

    const { flags, openFlags } = evaluate({ readings: [raising] }, 5);
    expect(openFlags).toEqual([
      {
        key: 'gap:r1',
        kind: 'gap',
        raisedAt: at(0),
        severitySince: at(0),
        raisedByReadingId: 'r1',
        detail: {
          gapCenti: 60,
          direction: 'probe-higher',
          limitCenti: 50,
          probeCenti: 3720,
          remoteCenti: 3660,
          worstGapCenti: 60,
        },
        status: 'open',
        closedAt: null,
        closedByReadingId: null,
        recheckDueAt: null,
        recheckCountsFrom: null,
        severity: 'urgent', // gap and overdue check: urgent (common practice)
      },
    ]);
    expect(flags).toEqual(openFlags);
  });

  it('gap raised → action → recheck within the limit closes it', () => {
    const state = { readings: [raising, check('r2', 30, 3680, 3660)], actions: [action('a1', 'gap:r1', 5)] };
    const before = evaluate({ ...state, readings: [raising] }, 20);
    expect(before.openFlags[0]).toMatchObject({ key: 'gap:r1', recheckDueAt: at(35) });

    const after = evaluate(state, 40);
    expect(after.openFlags).toEqual([]);
    expect(ofKind(after.flags, 'gap')).toEqual([
      expect.objectContaining({
        key: 'gap:r1',
        status: 'closed',
        closedAt: at(30),
        closedByReadingId: 'r2',
        recheckDueAt: null,
      }),
    ]);
  });

  it('a recheck within the limit with no action does not close it', () => {
    const { openFlags } = evaluate({ readings: [raising, check('r2', 30, 3680, 3660)] }, 40);
    expect(openFlags.map((flag) => flag.key)).toEqual(['gap:r1']);
  });

  it('a recheck before the action does not count; the next one after it does', () => {
    const readings = [raising, check('r2', 10, 3680, 3660), check('r3', 40, 3670, 3660)];
    const { flags } = evaluate({ readings, actions: [action('a1', 'gap:r1', 20)] }, 45);
    expect(ofKind(flags, 'gap')).toEqual([expect.objectContaining({ status: 'closed', closedByReadingId: 'r3' })]);
  });

  it('a recheck before the settle time after the action does not count (common practice: recheck 15–30 min after a change)', () => {
    const readings = [raising, check('r2', 21, 3680, 3660), check('r3', 34, 3680, 3660), check('r4', 35, 3670, 3660)];
    const early = evaluate({ readings: readings.slice(0, 3), actions: [action('a1', 'gap:r1', 20)] }, 34);
    expect(ofKind(early.flags, 'gap')).toEqual([expect.objectContaining({ status: 'open', recheckCountsFrom: at(35), recheckDueAt: at(50) })]);
    const settled = evaluate({ readings, actions: [action('a1', 'gap:r1', 20)] }, 40);
    expect(ofKind(settled.flags, 'gap')).toEqual([expect.objectContaining({ status: 'closed', closedByReadingId: 'r4' })]);
  });

  it('a recheck still over the limit keeps it open, one flag only, with the worst gap', () => {
    const readings = [raising, check('r2', 30, 3740, 3660)];
    const { flags } = evaluate({ readings, actions: [action('a1', 'gap:r1', 5)] }, 40);
    expect(ofKind(flags, 'gap')).toEqual([expect.objectContaining({ key: 'gap:r1', status: 'open', detail: expect.objectContaining({ gapCenti: 60, worstGapCenti: 80 }) })]);
  });

  it('an action on another flag does not close it', () => {
    const { openFlags } = evaluate({ readings: [raising, check('r2', 30, 3680, 3660)], actions: [action('a1', 'gap:other', 5)] }, 40);
    expect(openFlags.map((flag) => flag.key)).toEqual(['gap:r1']);
  });

  it('a new gap after a closed one is a new flag with its own key', () => {
    const readings = [raising, check('r2', 30, 3680, 3660), check('r3', 60, 3600, 3700)];
    const { flags } = evaluate({ readings, actions: [action('a1', 'gap:r1', 5)] }, 70);
    expect(ofKind(flags, 'gap').map((flag) => [flag.key, flag.status])).toEqual([
      ['gap:r1', 'closed'],
      ['gap:r3', 'open'],
    ]);
    expect(ofKind(flags, 'gap')[1].detail).toMatchObject({ direction: 'probe-lower', gapCenti: 100 });
  });

  it('uses the unit gap limit', () => {
    const result = evaluateInfant({ readings: [raising], actions: [], sessions: [] }, at(5), { gapLimitCenti: 100 });
    expect(result.flags).toEqual([]);
  });
});

describe('corrections: a new row replaces an old one (common practice)', () => {
  const raising = check('r1', 0, 3720, 3660);

  it('marking the raising reading entered-in-error removes the flag', () => {
    const correction = check('c1', 0, 3720, 3660, { replacesId: 'r1', enteredInError: true, recordedAt: at(3) });
    const { flags, latest, lastRemoteCheckAt } = evaluate({ readings: [raising, correction] }, 5);
    expect(flags).toEqual([]);
    expect(lastRemoteCheckAt).toBeNull();
    expect(latest.remoteCenti).toBeNull();
  });

  it('a corrected value within the limit removes the flag', () => {
    const correction = check('c1', 0, 3700, 3670, { replacesId: 'r1', recordedAt: at(3) });
    const { flags, latest } = evaluate({ readings: [raising, correction] }, 5);
    expect(flags).toEqual([]);
    expect(latest.remoteCenti).toBe(3670);
  });

  it('a corrected value still over the limit keeps the flag key, so its actions still count', () => {
    const correction = check('c1', 0, 3730, 3660, { replacesId: 'r1', recordedAt: at(3) });
    const readings = [raising, correction, check('r2', 30, 3680, 3660)];
    const { flags } = evaluate({ readings, actions: [action('a1', 'gap:r1', 5)] }, 40);
    expect(ofKind(flags, 'gap')).toEqual([expect.objectContaining({ key: 'gap:r1', raisedByReadingId: 'c1', status: 'closed', closedByReadingId: 'r2' })]);
    expect(ofKind(flags, 'gap')[0].detail).toMatchObject({ gapCenti: 70 });
  });

  it('follows a chain of corrections to the latest version', () => {
    const rows = [raising, check('c1', 0, 3700, 3670, { replacesId: 'r1', recordedAt: at(3) }), check('c2', 0, 3700, 3600, { replacesId: 'c1', recordedAt: at(4) })];
    expect(currentReadings(rows).map((row) => row.id)).toEqual(['c2']);
    expect(evaluate({ readings: rows }, 5).openFlags.map((flag) => flag.key)).toEqual(['gap:r1', 'cold:r1']);
  });

  it('a late correction can move a reading in time', () => {
    const rows = [raising, check('c1', 20, 3720, 3660, { replacesId: 'r1', recordedAt: at(25) })];
    expect(evaluate({ readings: rows }, 30).openFlags[0]).toMatchObject({ key: 'gap:r1', raisedAt: at(20) });
  });
});

describe('overdue check: due 2 hours after the last remote-site check (common practice)', () => {
  const first = check('r1', 0, 3680, 3670);

  it('no flag at 120 minutes; an open flag at 121', () => {
    const on = evaluate({ readings: [first] }, 120);
    expect(on.flags).toEqual([]);
    expect(on.nextCheck).toEqual({ status: 'due-soon', dueAt: at(120), minutesLate: 0 });

    const late = evaluate({ readings: [first] }, 121);
    expect(late.nextCheck).toEqual({ status: 'overdue', dueAt: at(120), minutesLate: 1 });
    expect(late.openFlags).toEqual([
      {
        key: 'overdue:r1',
        kind: 'overdue-check',
        raisedAt: at(120),
        severitySince: at(120),
        raisedByReadingId: 'r1',
        detail: { dueAt: at(120), lastCheckAt: at(0), intervalMinutes: 120, minutesLate: 1 },
        status: 'open',
        closedAt: null,
        closedByReadingId: null,
        recheckDueAt: null,
        recheckCountsFrom: null,
        severity: 'urgent', // gap and overdue check: urgent (common practice)
      },
    ]);
  });

  it('a late check leaves a closed overdue flag for the review queue', () => {
    const readings = [first, check('r2', 150, 3680, 3670), check('r3', 200, 3680, 3670)];
    const result = evaluate({ readings }, 210);
    expect(result.openFlags).toEqual([]);
    expect(result.flags).toEqual([
      expect.objectContaining({
        key: 'overdue:r1',
        kind: 'overdue-check',
        raisedAt: at(120),
        status: 'closed',
        closedAt: at(150),
        closedByReadingId: 'r2',
        detail: { dueAt: at(120), lastCheckAt: at(0), intervalMinutes: 120, minutesLate: 30 },
      }),
    ]);
    expect(result.lastRemoteCheckAt).toEqual(at(200));
    expect(result.nextCheck).toEqual({ status: 'ok', dueAt: at(320), minutesLate: 0 });
  });

  it('a probe-only reading is not a check (IEC 60601-2-21: the probe is not a thermometer)', () => {
    const readings = [first, reading('p1', 60, { probeCenti: 3690 })];
    expect(evaluate({ readings }, 121).openFlags.map((flag) => flag.key)).toEqual(['overdue:r1']);
  });

  it('counts from admission until the first check', () => {
    expect(evaluate({ admittedAt: at(0) }, 100).nextCheck).toEqual({ status: 'ok', dueAt: at(120), minutesLate: 0 });
    const late = evaluate({ admittedAt: at(0) }, 121);
    expect(late.openFlags).toEqual([expect.objectContaining({ key: 'overdue:admission', raisedAt: at(120), raisedByReadingId: null })]);
    const checkedLate = evaluate({ admittedAt: at(0), readings: [check('r1', 130, 3680, 3670)] }, 140);
    expect(checkedLate.flags).toEqual([expect.objectContaining({ key: 'overdue:admission', status: 'closed', closedAt: at(130), closedByReadingId: 'r1' })]);
  });

  it('with neither a check nor an admission time: never, no flag', () => {
    const result = evaluate({}, 500);
    expect(result.nextCheck).toEqual({ status: 'never', dueAt: null, minutesLate: 0 });
    expect(result.flags).toEqual([]);
  });

  it('follows the unit interval', () => {
    const result = evaluateInfant({ readings: [first], actions: [], sessions: [] }, at(61), { checkIntervalMinutes: 60 });
    expect(result.openFlags).toEqual([expect.objectContaining({ key: 'overdue:r1', raisedAt: at(60) })]);
  });
});

describe('heat stress (NHS GG&C signs; WHO 1997 via Miller 2011 band; Duquesne heart rate)', () => {
  it('opens on a sign and closes at the next observation that raises nothing', () => {
    const readings = [
      check('r1', 0, 3700, 3700, { heatSigns: ['sweating'] }),
      check('r2', 20, 3720, 3760), // remote above normal: still open, reason added
      reading('p1', 30, { probeCenti: 3700 }), // probe alone says nothing about heat stress
      check('r3', 45, 3690, 3700, { heartRate: 140 }),
    ];
    const { flags } = evaluate({ readings }, 60);
    expect(ofKind(flags, 'heat-stress')).toEqual([
      expect.objectContaining({
        key: 'heat-stress:r1',
        status: 'closed',
        closedByReadingId: 'r3',
        detail: { reasons: [{ kind: 'sign', sign: 'sweating' }, { kind: 'remote-above-normal' }] },
      }),
    ]);
  });

  it('a heart rate over 160 opens it', () => {
    const { openFlags } = evaluate({ readings: [reading('h1', 0, { heartRate: 161 })] }, 5);
    expect(openFlags).toEqual([expect.objectContaining({ key: 'heat-stress:h1', detail: { reasons: [{ kind: 'heart-rate-high' }] } })]);
    expect(evaluate({ readings: [reading('h1', 0, { heartRate: 160 })] }, 5).flags).toEqual([]);
  });
});

describe('cold stress (WHO 1997 via Miller 2011)', () => {
  it('opens below 36.5, keeps the worst band, closes in the normal band', () => {
    const readings = [check('r1', 0, 3650, 3640), check('r2', 30, 3620, 3590), check('r3', 60, 3650, 3620), check('r4', 90, 3660, 3650)];
    const { flags } = evaluate({ readings }, 100);
    expect(ofKind(flags, 'cold-stress')).toEqual([
      expect.objectContaining({
        key: 'cold:r1',
        status: 'closed',
        closedAt: at(90),
        closedByReadingId: 'r4',
        detail: { band: 'moderate-hypothermia', lowestCenti: 3590 },
      }),
    ]);
  });

  it('36.45 is cold stress; 36.50 is not', () => {
    expect(evaluate({ readings: [check('r1', 0, 3645, 3645)] }, 5).openFlags[0]).toMatchObject({
      kind: 'cold-stress',
      detail: { band: 'cold-stress' },
    });
    expect(evaluate({ readings: [check('r1', 0, 3650, 3650)] }, 5).flags).toEqual([]);
  });

  it('reaches a worse severity at the reading that shows the colder band, not at its raising; a band no worse keeps it', () => {
    // 36.4 mild (caution) at 0, 35.0 moderate (urgent) at 40, 34.0 still moderate at 70, 31.8 severe (critical) at 100.
    const readings = [check('r1', 0, 3650, 3640), check('r2', 40, 3520, 3500), check('r3', 70, 3420, 3400)];
    expect(evaluate({ readings }, 80).openFlags[0]).toMatchObject({ severity: 'urgent', raisedAt: at(0), severitySince: at(40) });
    expect(evaluate({ readings: [...readings, check('r4', 100, 3200, 3180)] }, 110).openFlags[0]).toMatchObject({ severity: 'critical', severitySince: at(100) });
    expect(evaluate({ readings: readings.slice(0, 1) }, 10).openFlags[0]).toMatchObject({ severity: 'caution', severitySince: at(0) });
  });
});

describe('manual mode (ECRI: check every 15 min; high output 80 % / 15 min from memory)', () => {
  const manual = (id: string, minutes: number, heaterOutputPct: number | null, remoteCenti: number | null) =>
    reading(id, minutes, { controlMode: 'manual', heaterOutputPct, remoteCenti, remoteSite: remoteCenti === null ? null : 'axilla' });

  it('opens when high output has lasted more than 15 minutes, raised at that moment', () => {
    const readings = [manual('m1', 0, 90, 3700), manual('m2', 10, 90, 3710)];
    expect(evaluate({ readings }, 15).flags).toEqual([]);
    const { openFlags } = evaluate({ readings }, 16);
    expect(openFlags).toEqual([
      expect.objectContaining({
        key: 'manual:m1',
        kind: 'manual-mode',
        raisedAt: at(15),
        raisedByReadingId: 'm1',
        detail: { reasons: ['high-output-too-long'], manualSince: at(0), highOutputSince: at(0) },
      }),
    ]);
  });

  it('closes at the reading that leaves manual', () => {
    const readings = [manual('m1', 0, 90, 3700), manual('m2', 10, 90, 3710), check('s1', 20, 3700, 3700, { heaterOutputPct: 40 })];
    const { flags } = evaluate({ readings }, 30);
    expect(ofKind(flags, 'manual-mode')).toEqual([expect.objectContaining({ raisedAt: at(15), status: 'closed', closedAt: at(20), closedByReadingId: 's1' })]);
  });

  it('closes when output drops below the threshold; a missed check then opens its own flag', () => {
    const readings = [manual('m1', 0, 90, 3700), manual('m2', 10, 90, 3700), manual('m3', 16, 50, null)];
    const { flags } = evaluate({ readings }, 40);
    expect(ofKind(flags, 'manual-mode').map((flag) => [flag.key, flag.status, flag.raisedAt, flag.closedAt, flag.detail.reasons])).toEqual([
      ['manual:m1', 'closed', at(15), at(16), ['high-output-too-long']],
      // The last remote-site check was m2 at 10 minutes: the check was due by 25.
      ['manual:m2', 'open', at(25), null, ['no-check-in-manual']],
    ]);
  });

  it('stays open while any reason holds', () => {
    const readings = [manual('m1', 0, 90, 3700), manual('m2', 16, 50, null), manual('m3', 20, null, 3700)];
    const { flags } = evaluate({ readings }, 30);
    expect(ofKind(flags, 'manual-mode')).toEqual([
      expect.objectContaining({
        key: 'manual:m1',
        raisedAt: at(15),
        closedAt: at(20),
        closedByReadingId: 'm3',
        detail: expect.objectContaining({ reasons: ['high-output-too-long', 'no-check-in-manual'] }),
      }),
    ]);
  });
});

describe('skin-to-skin deviation (common practice)', () => {
  const session: SessionInput = { id: 's1', startedAt: at(0), endedAt: at(60), referenceCenti: 3650, limitCenti: 50 };

  it('opens outside the limit, closes within it or at the session end', () => {
    const readings = [
      check('r1', 10, 3600, 3590), // −0.6: opens
      check('r2', 20, 3610, 3600), // −0.5 exactly: closes
      check('r3', 30, 3720, 3710), // +0.6: opens again
      check('r4', 70, 3500, 3700), // after the session: not a deviation
    ];
    const { flags } = evaluate({ readings, sessions: [session] }, 80);
    expect(ofKind(flags, 'skin-to-skin-deviation')).toEqual([
      expect.objectContaining({
        key: 's2s:s1:r1',
        raisedAt: at(10),
        status: 'closed',
        closedAt: at(20),
        closedByReadingId: 'r2',
        detail: { sessionId: 's1', deviationCenti: -60, referenceCenti: 3650, limitCenti: 50, worstDeviationCenti: -60, site: 'remote' },
      }),
      expect.objectContaining({ key: 's2s:s1:r3', raisedAt: at(30), status: 'closed', closedAt: at(60), closedByReadingId: null }),
    ]);
  });

  it('a 1.0 °C limit allows 1.0 exactly, flags beyond', () => {
    const wide = { ...session, limitCenti: 100 };
    expect(ofKind(evaluate({ readings: [check('r1', 10, 3550, 3550)], sessions: [wide] }, 20).flags, 'skin-to-skin-deviation')).toEqual([]);
    expect(ofKind(evaluate({ readings: [check('r1', 10, 3549, 3549)], sessions: [wide] }, 20).openFlags, 'skin-to-skin-deviation')).toHaveLength(1);
  });

  it('an ongoing session keeps its flag open', () => {
    const ongoing = { ...session, endedAt: null };
    const { openFlags } = evaluate({ readings: [reading('p1', 10, { probeCenti: 3580 })], sessions: [ongoing] }, 300);
    expect(ofKind(openFlags, 'skin-to-skin-deviation')).toEqual([expect.objectContaining({ key: 's2s:s1:p1', detail: expect.objectContaining({ deviationCenti: -70 }) })]);
  });
});

describe('evaluation as a whole (common practice)', () => {
  it('orders flags by raisedAt and reports the latest values', () => {
    const readings = [
      check('r1', 0, 3720, 3660, { setCenti: 3650, heaterOutputPct: 40 }),
      reading('p1', 30, { probeCenti: 3660 }),
      check('r2', 60, 3600, 3540, { remoteSite: 'rectal' }),
    ];
    const result = evaluate({ readings }, 90);
    expect(result.flags.map((flag) => flag.key)).toEqual(['gap:r1', 'cold:r2']);
    expect(result.latest).toEqual({
      probeCenti: 3600,
      probeTakenAt: at(60),
      remoteCenti: 3540,
      remoteSite: 'rectal',
      remoteTakenAt: at(60),
      controlMode: 'skin-servo',
      setCenti: 3650,
      heaterOutputPct: 40,
      takenAt: at(60),
    });
  });

  it('evaluates as of now: later readings and actions are left out', () => {
    const readings = [check('r1', 0, 3720, 3660), check('r2', 30, 3680, 3660)];
    const actions = [action('a1', 'gap:r1', 5)];
    expect(evaluate({ readings, actions }, 20).openFlags.map((flag) => flag.key)).toEqual(['gap:r1']);
    expect(evaluate({ readings, actions: [action('a1', 'gap:r1', 50)] }, 40).openFlags.map((flag) => flag.key)).toEqual(['gap:r1']);
  });

  it('is deterministic whatever the input order', () => {
    const readings = [check('r1', 0, 3720, 3660), check('r2', 30, 3680, 3660), check('r3', 60, 3600, 3700)];
    const actions = [action('a1', 'gap:r1', 5)];
    const forward = evaluate({ readings, actions }, 200);
    const backward = evaluate({ readings: [...readings].reverse(), actions }, 200);
    expect(backward).toEqual(forward);
  });

  it('escalates an open flag left without action for more than 30 minutes (from memory)', () => {
    const [flag] = evaluate({ readings: [check('r1', 0, 3720, 3660)] }, 5).openFlags;
    expect(flagEscalation(flag, at(30))).toEqual({ escalateAt: at(30), escalated: false });
    expect(flagEscalation(flag, at(31)).escalated).toBe(true);
    const [worked] = evaluate({ readings: [check('r1', 0, 3720, 3660)], actions: [action('a1', 'gap:r1', 5)] }, 40).openFlags;
    expect(flagEscalation(worked, at(40))).toEqual({ escalateAt: null, escalated: false });
  });

  it('refuses an invalid reading, naming it', () => {
    expect(() => evaluate({ readings: [reading('r1', 0, { remoteCenti: 36.5 })] }, 5)).toThrow(expect.objectContaining({ field: 'readings[0].remoteCenti' }));
  });
});

describe('performance sanity: 60 infants × 14 days of hourly readings (common practice; not timed)', () => {
  it('evaluates a whole unit', () => {
    let seed = 42;
    const random = () => {
      seed = (seed * 1_103_515_245 + 12_345) % 2_147_483_648;
      return seed / 2_147_483_648;
    };
    const infants = Array.from({ length: 60 }, (_, infant) => {
      const readings: ReadingInput[] = [];
      const actions: ActionInput[] = [];
      for (let hour = 0; hour < 14 * 24; hour += 1) {
        const id = `i${infant}-h${hour}`;
        const remote = 3600 + Math.floor(random() * 160);
        const probe = remote + Math.floor(random() * 120) - 60;
        readings.push(
          check(id, hour * 60 + Math.floor(random() * 20), probe, remote, {
            heartRate: 120 + Math.floor(random() * 50),
            controlMode: random() < 0.05 ? 'manual' : 'skin-servo',
            heaterOutputPct: Math.floor(random() * 100),
          }),
        );
        if (random() < 0.1) actions.push(action(`${id}-a`, `gap:${id}`, hour * 60 + 25));
        if (random() < 0.02) {
          readings.push(check(`${id}-c`, hour * 60, probe, remote, { replacesId: id, enteredInError: true, recordedAt: at(hour * 60 + 5) }));
        }
      }
      return { readings, actions, sessions: [], admittedAt: at(-10) } satisfies InfantState;
    });
    const now = at(14 * 24 * 60);
    const results = infants.map((state) => evaluateInfant(state, now, DEFAULT_POLICY));
    expect(results).toHaveLength(60);
    for (const result of results) {
      expect(result.flags.length).toBeGreaterThan(0);
      for (let i = 1; i < result.flags.length; i += 1) {
        expect(result.flags[i].raisedAt.getTime()).toBeGreaterThanOrEqual(result.flags[i - 1].raisedAt.getTime());
      }
      expect(new Set(result.flags.map((flag) => flag.key)).size).toBe(result.flags.length);
    }
  });
});

describe('evaluation invariants (fast-check; common practice)', () => {
  const readingArb = fc.record({
    minute: fc.integer({ min: 0, max: 600 }),
    probe: fc.option(fc.integer({ min: 3500, max: 3800 }), { nil: null }),
    remote: fc.option(fc.integer({ min: 3500, max: 3800 }), { nil: null }),
    mode: fc.constantFrom('skin-servo' as const, 'manual' as const, null),
    output: fc.option(fc.integer({ min: 0, max: 100 }), { nil: null }),
    heartRate: fc.option(fc.integer({ min: 100, max: 190 }), { nil: null }),
  });
  const chartArb = fc.record({
    rows: fc.array(readingArb, { maxLength: 40 }),
    actionMinutes: fc.array(fc.integer({ min: 0, max: 600 }), { maxLength: 10 }),
    now: fc.integer({ min: 0, max: 900 }),
  });

  type Chart = typeof chartArb extends fc.Arbitrary<infer T> ? T : never;

  function build(chart: Chart): InfantState {
    const readings = chart.rows.map((row, i) =>
      reading(`r${i}`, row.minute, {
        probeCenti: row.probe,
        remoteCenti: row.remote,
        controlMode: row.mode,
        heaterOutputPct: row.output,
        heartRate: row.heartRate,
      }),
    );
    // Actions on whatever gap flags the readings might raise.
    const actions = chart.actionMinutes.map((minute, i) => action(`a${i}`, `gap:r${i % Math.max(1, readings.length)}`, minute));
    const sessions: SessionInput[] = [{ id: 's1', startedAt: at(100), endedAt: at(200), referenceCenti: 3650, limitCenti: 50 }];
    return { readings, actions, sessions, admittedAt: at(0) };
  }

  it('keys are unique, flags are ordered, closed flags close after they open, at most one gap open', () => {
    fc.assert(
      fc.property(chartArb, (chart) => {
        const result = evaluateInfant(build(chart), at(chart.now), DEFAULT_POLICY);
        expect(new Set(result.flags.map((flag) => flag.key)).size).toBe(result.flags.length);
        for (let i = 1; i < result.flags.length; i += 1) {
          expect(result.flags[i].raisedAt.getTime()).toBeGreaterThanOrEqual(result.flags[i - 1].raisedAt.getTime());
        }
        for (const flag of result.flags) {
          if (flag.status === 'closed') expect(flag.closedAt!.getTime()).toBeGreaterThanOrEqual(flag.raisedAt.getTime());
          else expect(flag.closedAt).toBeNull();
          expect(flag.raisedAt.getTime()).toBeLessThanOrEqual(at(chart.now).getTime());
        }
        expect(result.openFlags).toEqual(result.flags.filter((flag) => flag.status === 'open'));
        for (const kind of ['gap', 'heat-stress', 'cold-stress', 'manual-mode', 'overdue-check'] as const) {
          expect(ofKind(result.openFlags, kind).length).toBeLessThanOrEqual(1);
        }
      }),
      { numRuns: 300 },
    );
  });

  it('does not depend on the order the rows arrive in', () => {
    fc.assert(
      fc.property(chartArb, fc.integer(), (chart, seed) => {
        const state = build(chart);
        // Fisher–Yates driven by a small seeded generator.
        const shuffled = [...state.readings];
        let x = seed >>> 0;
        for (let i = shuffled.length - 1; i > 0; i -= 1) {
          x = (Math.imul(x, 1_664_525) + 1_013_904_223) >>> 0;
          const j = x % (i + 1);
          [shuffled[i], shuffled[j]] = [shuffled[j], shuffled[i]];
        }
        expect(evaluateInfant({ ...state, readings: shuffled }, at(chart.now))).toEqual(evaluateInfant(state, at(chart.now)));
      }),
      { numRuns: 200 },
    );
  });
});
