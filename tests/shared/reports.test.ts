/**
 * The report arithmetic against a small example worked by hand (the working is in the comments).
 * Percentiles: nearest rank, as documented in shared/reports (common practice for audit
 * reports; the method is a product choice, not a clinical rule).
 */
import {
  formatPercent,
  gapFlagsPer100,
  medianNearestRank,
  onTimeReport,
  percentileNearestRank,
  responseTimes,
  skinToSkinDeviationShare,
  type FlagTimes,
  type RemoteCheck,
} from '../../shared/reports';
import { csvCell, toCsv } from '../../shared/csv';

const times = { dayShiftStart: '07:00', nightShiftStart: '19:00', timeZone: 'Europe/London' };
const at = (iso: string) => new Date(iso);
// November: London is on GMT, so local time = UTC.
const checks: RemoteCheck[] = [
  { takenAt: at('2026-11-10T08:00:00Z'), dueAt: at('2026-11-10T08:30:00Z') }, // 1 on time, day shift, 10 Nov
  { takenAt: at('2026-11-10T10:15:00Z'), dueAt: at('2026-11-10T10:00:00Z') }, // 2 late, day, 10 Nov
  { takenAt: at('2026-11-10T20:00:00Z'), dueAt: at('2026-11-10T20:00:00Z') }, // 3 exactly at due: on time, night, 10 Nov
  { takenAt: at('2026-11-11T02:00:00Z'), dueAt: at('2026-11-11T01:50:00Z') }, // 4 late, night (began 10 Nov), local date 11 Nov
  { takenAt: at('2026-11-11T09:00:00Z'), dueAt: at('2026-11-11T08:45:00Z') }, // 5 late, day, 11 Nov
  { takenAt: at('2026-11-11T21:00:00Z'), dueAt: at('2026-11-11T22:00:00Z') }, // 6 on time, night, 11 Nov
];

describe('on-time rate of remote-site checks (hand-computed)', () => {
  const report = onTimeReport(checks, times);

  it('overall: 3 of 6 on time = 50 %', () => {
    expect(report.overall).toEqual({ checks: 6, onTime: 3, rate: 0.5 });
  });

  it('by shift: day 1 of 3 (checks 1, 2, 5), night 2 of 3 (checks 3, 4, 6)', () => {
    expect(report.byShift).toEqual([
      { shift: 'day', checks: 3, onTime: 1, rate: 1 / 3 },
      { shift: 'night', checks: 3, onTime: 2, rate: 2 / 3 },
    ]);
  });

  it('by local date: 10 Nov 2 of 3 (1, 2, 3), 11 Nov 1 of 3 (4, 5, 6)', () => {
    expect(report.byDay).toEqual([
      { date: '2026-11-10', checks: 3, onTime: 2, rate: 2 / 3 },
      { date: '2026-11-11', checks: 3, onTime: 1, rate: 1 / 3 },
    ]);
  });

  it('no checks gives no rate rather than 0 %', () => {
    expect(onTimeReport([], times).overall).toEqual({ checks: 0, onTime: 0, rate: null });
    expect(formatPercent(null)).toBe('—');
    expect(formatPercent(2 / 3)).toBe('66.7 %');
  });
});

describe('gap flags per 100 remote checks', () => {
  it('2 gap flags over 6 checks = 33.3 per 100', () => {
    expect(gapFlagsPer100(2, 6).per100).toBeCloseTo(33.333, 3);
    expect(gapFlagsPer100(0, 0).per100).toBeNull();
  });
});

describe('nearest-rank percentiles', () => {
  it('rank = ceil(P/100 × n)', () => {
    const one2ten = [10, 1, 9, 2, 8, 3, 7, 4, 6, 5];
    expect(percentileNearestRank(one2ten, 90)).toBe(9); // ceil(9) = rank 9
    expect(percentileNearestRank(one2ten, 50)).toBe(5); // ceil(5) = rank 5: the lower middle
    expect(percentileNearestRank([42], 90)).toBe(42);
    expect(percentileNearestRank([], 90)).toBeNull();
    expect(medianNearestRank([3, 1, 2])).toBe(2);
    expect(() => percentileNearestRank([1], 0)).toThrow(RangeError);
  });
});

describe('time from flag to first action and to resolution (hand-computed)', () => {
  const raised = at('2026-11-10T08:00:00Z');
  const plus = (m: number) => new Date(raised.getTime() + m * 60_000);
  const flags: FlagTimes[] = [
    { kind: 'gap', raisedAt: raised, firstActionAt: plus(12), closedAt: plus(30) },
    { kind: 'gap', raisedAt: raised, firstActionAt: plus(3), closedAt: plus(10) },
    { kind: 'gap', raisedAt: raised, firstActionAt: plus(45), closedAt: plus(90) },
    { kind: 'heat-stress', raisedAt: raised, firstActionAt: plus(7), closedAt: plus(25) },
    { kind: 'gap', raisedAt: raised, firstActionAt: plus(20), closedAt: null },
    { kind: 'gap', raisedAt: raised, firstActionAt: null, closedAt: null },
  ];

  it('first action: sorted 3, 7, 12, 20, 45 → median (odd count) the middle value 12; p90 rank ceil(4.5)=5 → 45', () => {
    const r = responseTimes(flags);
    expect(r.flags).toBe(6);
    expect(r.toFirstAction).toEqual({ count: 5, medianMinutes: 12, p90Minutes: 45 });
  });

  it('resolution: sorted 10, 25, 30, 90 → median (25 + 30) / 2 = 27.5 (conventional median, NIST/SEMATECH e-Handbook 1.3.5.1); p90 rank ceil(3.6)=4 → 90', () => {
    expect(responseTimes(flags).toResolution).toEqual({ count: 4, medianMinutes: 27.5, p90Minutes: 90 });
  });
});

describe('share of skin-to-skin time with a deviation (hand-computed)', () => {
  it('range 10:00–16:00: session A 60 min with 30 min deviating (overlap counted once), session B 120 min with 40 → 70/180', () => {
    const report = skinToSkinDeviationShare(
      [
        {
          id: 'a',
          start: at('2026-11-10T09:00:00Z'),
          end: at('2026-11-10T11:00:00Z'),
          deviations: [
            { start: at('2026-11-10T09:30:00Z'), end: at('2026-11-10T10:15:00Z') },
            { start: at('2026-11-10T10:10:00Z'), end: at('2026-11-10T10:30:00Z') },
          ],
        },
        {
          id: 'b',
          start: at('2026-11-10T14:00:00Z'),
          end: null,
          deviations: [
            { start: at('2026-11-10T15:00:00Z'), end: at('2026-11-10T15:30:00Z') },
            { start: at('2026-11-10T15:50:00Z'), end: null },
          ],
        },
        { id: 'outside', start: at('2026-11-10T17:00:00Z'), end: at('2026-11-10T18:00:00Z'), deviations: [] },
      ],
      at('2026-11-10T10:00:00Z'),
      at('2026-11-10T16:00:00Z'),
    );
    expect(report.sessions).toBe(2);
    expect(report.sessionMinutes).toBe(180);
    expect(report.deviationMinutes).toBe(70);
    expect(report.share).toBeCloseTo(70 / 180, 10);
  });
});

describe('CSV cells', () => {
  it('quotes commas and quotes, defuses formulas, keeps negative numbers', () => {
    expect(csvCell('a,b')).toBe('"a,b"');
    expect(csvCell('say "hi"')).toBe('"say ""hi"""');
    expect(csvCell('=SUM(A1)')).toBe("'=SUM(A1)");
    expect(csvCell(-0.5)).toBe('-0.5');
    expect(toCsv(['x', 'y'], [[1, null]])).toBe('x,y\r\n1,\r\n');
  });
});
