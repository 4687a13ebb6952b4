import {
  DEFAULT_POLICY,
  escalationDelayOf,
  evaluateInfant,
  needsAttention,
  resolvePolicy,
  severityOf,
  ThermalInputError,
  type InfantState,
  type ReadingInput,
} from '../../../shared/thermal';
import { readingAfter } from './reading-fixture';

const t0 = new Date('2026-05-01T08:00:00Z');
const at = (minutes: number) => new Date(t0.getTime() + minutes * 60_000);

const reading = (id: string, minutes: number, values: Partial<ReadingInput> = {}): ReadingInput => readingAfter(t0, id, minutes, { controlMode: 'skin-servo', ...values });
const remote = (id: string, minutes: number, remoteCenti: number, extra: Partial<ReadingInput> = {}) => reading(id, minutes, { remoteCenti, remoteSite: 'axilla', ...extra });

function evaluate(state: Partial<InfantState>, nowMinutes: number, policy = {}) {
  return evaluateInfant({ readings: [], actions: [], sessions: [], ...state }, at(nowMinutes), policy);
}

describe('severity of each flag kind and band', () => {
  it('severe hypothermia (below 32.0 °C) is critical, moderate (32.0–35.9) urgent, cold stress (36.0–36.4) a caution (WHO 1997 via Miller 2011)', () => {
    expect(severityOf('cold-stress', { band: 'severe-hypothermia' })).toBe('critical');
    expect(severityOf('cold-stress', { band: 'moderate-hypothermia' })).toBe('urgent');
    expect(severityOf('cold-stress', { band: 'cold-stress' })).toBe('caution');
    expect(needsAttention('caution')).toBe(false);
    expect(needsAttention('urgent')).toBe(true);
  });

  it('an axillary 31.8 °C raises one critical cold flag (WHO 1997 via Miller 2011: below 32.0 is severe)', () => {
    const { openFlags } = evaluate({ readings: [remote('r1', 0, 3180)] }, 1);
    expect(openFlags.map((f) => [f.kind, f.severity])).toEqual([['cold-stress', 'critical']]);
  });

  it('38.0 °C raises a fever flag, not a heat-stress prompt; 37.9 does not (Bedside Clinical Guidelines Partnership)', () => {
    const fever = evaluate({ readings: [remote('r1', 0, 3800)] }, 1);
    expect(fever.openFlags.map((f) => [f.kind, f.severity])).toEqual([['fever', 'critical']]);
    const below = evaluate({ readings: [remote('r1', 0, 3790)] }, 1);
    expect(below.openFlags.map((f) => f.kind)).toEqual(['heat-stress']);
  });

  it('a fever closes at the next remote site below 38.0 °C (Bedside Clinical Guidelines Partnership)', () => {
    const { flags } = evaluate({ readings: [remote('r1', 0, 3820), remote('r2', 30, 3840), remote('r3', 60, 3700)] }, 70);
    const fever = flags.filter((f) => f.kind === 'fever');
    expect(fever).toEqual([expect.objectContaining({ status: 'closed', closedByReadingId: 'r3', detail: { highestCenti: 3840 } })]);
  });

  it('fever with a sign keeps the heat-stress prompt for the sign only (NHS GG&C: signs of overheating)', () => {
    const { openFlags } = evaluate({ readings: [remote('r1', 0, 3810, { heatSigns: ['sweating'] })] }, 1);
    expect(openFlags.map((f) => f.kind).sort()).toEqual(['fever', 'heat-stress']);
    const heat = openFlags.find((f) => f.kind === 'heat-stress');
    expect(heat?.detail).toEqual({ reasons: [{ kind: 'sign', sign: 'sweating' }] });
  });

  it('escalation delays: the most severe at once, urgent after the unit delay, mild cold stress never (from memory)', () => {
    expect(escalationDelayOf('severe-hypothermia', DEFAULT_POLICY)).toBe(0);
    expect(escalationDelayOf('fever', DEFAULT_POLICY)).toBe(0);
    expect(escalationDelayOf('heat-stress', DEFAULT_POLICY)).toBe(30);
    expect(escalationDelayOf('cold-stress', DEFAULT_POLICY)).toBeNull();
    const unit = resolvePolicy({ escalationDelays: { 'cold-stress': 60, 'severe-hypothermia': 5 } });
    expect(escalationDelayOf('cold-stress', unit)).toBe(60);
    expect(escalationDelayOf('severe-hypothermia', unit)).toBe(5);
    expect(() => resolvePolicy({ escalationDelays: { warm: 3 } as never })).toThrow(ThermalInputError);
    expect(() => resolvePolicy({ escalationDelays: { gap: -1 } })).toThrow(ThermalInputError);
  });
});

describe('skin-to-skin: a probe-only reading never closes a deviation seen on the remote site (IEC 60601-2-21 scope: the probe is not a thermometer)', () => {
  const session = { id: 's1', startedAt: at(0), endedAt: null, referenceCenti: 3650, limitCenti: 50 };
  it('stays open after an in-limit probe, closes at an in-limit remote site', () => {
    const readings = [remote('r1', 10, 3580), reading('p1', 20, { probeCenti: 3650 }), remote('r2', 30, 3640)];
    const open = evaluate({ readings: readings.slice(0, 2), sessions: [session] }, 25);
    expect(open.openFlags.filter((f) => f.kind === 'skin-to-skin-deviation')).toHaveLength(1);
    const closed = evaluate({ readings, sessions: [session] }, 35);
    expect(closed.flags.filter((f) => f.kind === 'skin-to-skin-deviation')).toEqual([
      expect.objectContaining({ status: 'closed', closedByReadingId: 'r2', detail: expect.objectContaining({ site: 'remote', deviationCenti: -70 }) }),
    ]);
  });
});

describe('manual-mode check clock (ECRI: check the infant at least every 15 minutes in manual)', () => {
  it('runs from the last temperature of any kind while manual, and is absent in servo', () => {
    const readings = [remote('r1', 0, 3680, { controlMode: 'manual', heaterOutputPct: 40 }), reading('p1', 10, { probeCenti: 3660, controlMode: null })];
    const { manualCheck, nextCheck } = evaluate({ readings }, 20);
    expect(manualCheck).toEqual(expect.objectContaining({ since: at(0), dueAt: at(25), outputPct: 40, limitMinutes: 15, status: 'due-soon' }));
    expect(nextCheck.dueAt).toEqual(at(120)); // the remote-site clock keeps its own two hours (common practice)
    const late = evaluate({ readings }, 26);
    expect(late.manualCheck?.status).toBe('overdue');
    const servo = evaluate({ readings: [remote('r1', 0, 3680)] }, 20);
    expect(servo.manualCheck).toBeNull();
  });
});

describe('policy in force at the time: a check is due by the interval in force at the check before it', () => {
  it('a change from 120 to 90 minutes takes effect from the next check, never rewriting an earlier judgement', () => {
    const readings = [remote('r1', 0, 3680), remote('r2', 115, 3680), remote('r3', 210, 3690)];
    // Version 2 (90 min) in force from minute 60: the check at 115 was due at 120 (set at minute 0
    // by version 1), so it was on time; the next is due 90 minutes after it, at 205: r3 is late.
    const versions = [{ effectiveFrom: at(60), policy: { checkIntervalMinutes: 90 } }];
    const { flags } = evaluateInfant({ readings, actions: [], sessions: [] }, at(220), { checkIntervalMinutes: 120 }, versions);
    expect(flags.filter((f) => f.kind === 'overdue-check')).toEqual([
      expect.objectContaining({ raisedAt: at(205), detail: expect.objectContaining({ intervalMinutes: 90, minutesLate: 5 }) }),
    ]);
  });
});
