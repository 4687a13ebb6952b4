import { TZDate } from '@date-fns/tz';
import { checkStatus, shiftAt, ThermalInputError } from '../../../shared/thermal';

const MIN = 60_000;
const last = new Date('2026-05-01T08:00:00Z');
const at = (minutes: number, seconds = 0) => new Date(last.getTime() + minutes * MIN + seconds * 1000);

describe('remote-site check every 2 hours, due soon in the last 15 minutes (common practice)', () => {
  it('119 min: due soon', () => {
    expect(checkStatus(last, at(119))).toEqual({ status: 'due-soon', dueAt: at(120), minutesLate: 0 });
  });

  it('120 min: due soon (due at, not yet overdue)', () => {
    expect(checkStatus(last, at(120))).toEqual({ status: 'due-soon', dueAt: at(120), minutesLate: 0 });
  });

  it('121 min: overdue by 1 minute', () => {
    expect(checkStatus(last, at(121))).toEqual({ status: 'overdue', dueAt: at(120), minutesLate: 1 });
  });

  it('120 min 1 s: overdue, 0 whole minutes late', () => {
    expect(checkStatus(last, at(120, 1))).toEqual({ status: 'overdue', dueAt: at(120), minutesLate: 0 });
  });

  it('counts whole minutes late, rounded down', () => {
    expect(checkStatus(last, at(150, 59)).minutesLate).toBe(30);
  });

  it('due-soon edge: 104:59 ok, 105:00 due soon', () => {
    expect(checkStatus(last, at(104, 59)).status).toBe('ok');
    expect(checkStatus(last, at(105)).status).toBe('due-soon');
  });

  it('just after a check: ok', () => {
    expect(checkStatus(last, last).status).toBe('ok');
  });

  it('never checked: never, no due time', () => {
    expect(checkStatus(null, at(0))).toEqual({ status: 'never', dueAt: null, minutesLate: 0 });
  });

  it('custom interval 60 / due soon 10 (a unit setting; published ranges 1–3 h)', () => {
    const policy = { intervalMinutes: 60, dueSoonMinutes: 10 };
    expect(checkStatus(last, at(49, 59), policy).status).toBe('ok');
    expect(checkStatus(last, at(50), policy).status).toBe('due-soon');
    expect(checkStatus(last, at(60), policy)).toEqual({ status: 'due-soon', dueAt: at(60), minutesLate: 0 });
    expect(checkStatus(last, at(61), policy)).toEqual({ status: 'overdue', dueAt: at(60), minutesLate: 1 });
  });

  it('refuses an invalid date or interval', () => {
    expect(() => checkStatus(new Date(NaN), at(1))).toThrow(ThermalInputError);
    expect(() => checkStatus(last, at(1), { intervalMinutes: 0 })).toThrow(ThermalInputError);
  });
});

describe('the interval is 120 real minutes across a change of clocks (common practice)', () => {
  const zone = 'Europe/London';

  it('spring forward, 2026-03-29: a check at 00:30 GMT is due at 03:30 BST (02:30 UTC)', () => {
    const check = new TZDate(2026, 2, 29, 0, 30, zone);
    expect(new Date(check.getTime()).toISOString()).toBe('2026-03-29T00:30:00.000Z');
    const { dueAt } = checkStatus(check, check);
    expect(dueAt?.toISOString()).toBe('2026-03-29T02:30:00.000Z');
    const dueLocal = new TZDate(dueAt!.getTime(), zone);
    // Three hours on the wall clock, two in real time.
    expect([dueLocal.getHours(), dueLocal.getMinutes()]).toEqual([3, 30]);
    expect(dueLocal.getTimezoneOffset()).toBe(-60); // BST
    expect(dueAt!.getTime() - check.getTime()).toBe(120 * MIN);
    expect(checkStatus(check, new TZDate(2026, 2, 29, 3, 30, zone)).status).toBe('due-soon');
    expect(checkStatus(check, new TZDate(2026, 2, 29, 3, 31, zone))).toMatchObject({ status: 'overdue', minutesLate: 1 });
  });

  it('fall back, 2026-10-25: a check at 00:30 BST is due at 01:30 GMT (01:30 UTC)', () => {
    const check = new TZDate(2026, 9, 25, 0, 30, zone);
    expect(new Date(check.getTime()).toISOString()).toBe('2026-10-24T23:30:00.000Z');
    const { dueAt } = checkStatus(check, check);
    expect(dueAt?.toISOString()).toBe('2026-10-25T01:30:00.000Z');
    const dueLocal = new TZDate(dueAt!.getTime(), zone);
    // One hour on the wall clock, two in real time.
    expect([dueLocal.getHours(), dueLocal.getMinutes()]).toEqual([1, 30]);
    expect(dueLocal.getTimezoneOffset() === 0).toBe(true); // GMT again
    // 01:30 BST (00:30 UTC) comes first: an hour before the check is due.
    expect(checkStatus(check, new Date('2026-10-25T00:30:00Z')).status).toBe('ok');
    expect(checkStatus(check, new Date('2026-10-25T01:31:00Z'))).toMatchObject({ status: 'overdue', minutesLate: 1 });
  });
});

describe('shifts by the unit clock: day 07:00, night 19:00 (common practice)', () => {
  it('places an instant in its shift', () => {
    const day = shiftAt(new Date('2026-05-01T10:00:00Z'));
    expect(day.shift).toBe('day');
    expect(day.startsAt.toISOString()).toBe('2026-05-01T06:00:00.000Z'); // 07:00 BST
    expect(day.endsAt.toISOString()).toBe('2026-05-01T18:00:00.000Z');
    const night = shiftAt(new Date('2026-05-01T03:00:00Z'));
    expect(night.shift).toBe('night');
    expect(night.startsAt.toISOString()).toBe('2026-04-30T18:00:00.000Z');
    expect(night.endsAt.toISOString()).toBe('2026-05-01T06:00:00.000Z');
  });

  it('the night of the spring change is 11 real hours; of the autumn change 13', () => {
    const spring = shiftAt(new Date('2026-03-29T03:00:00Z'));
    expect(spring.shift).toBe('night');
    expect((spring.endsAt.getTime() - spring.startsAt.getTime()) / 3_600_000).toBe(11);
    const autumn = shiftAt(new Date('2026-10-25T03:00:00Z'));
    expect(autumn.shift).toBe('night');
    expect((autumn.endsAt.getTime() - autumn.startsAt.getTime()) / 3_600_000).toBe(13);
  });

  it('the shift start itself belongs to the new shift', () => {
    expect(shiftAt(new Date('2026-01-10T07:00:00Z')).shift).toBe('day');
    expect(shiftAt(new Date('2026-01-10T06:59:59Z')).shift).toBe('night');
    expect(shiftAt(new Date('2026-01-10T19:00:00Z')).shift).toBe('night');
  });

  it('uses the unit time zone', () => {
    const ny = shiftAt(new Date('2026-01-10T13:00:00Z'), { timeZone: 'America/New_York' });
    expect(ny.shift).toBe('day');
    expect(ny.startsAt.toISOString()).toBe('2026-01-10T12:00:00.000Z');
  });
});
