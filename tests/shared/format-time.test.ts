/**
 * formatInZone builds Warmfold's own time patterns from one Intl call per instant. The reference
 * is date-fns `format` on an @date-fns/tz TZDate (the general-purpose libraries it replaces on
 * this path): the text must be identical in every zone, across DST changes both ways, at
 * midnight and noon, for every pattern the screens use.
 */
import { TZDate } from '@date-fns/tz';
import { format } from 'date-fns/format';
import { dayHeading, formatClock, formatDayAndTime, formatDayTime, formatInZone, formatWhen, localDayKey, shiftDayKey, TIME_PATTERNS } from '@/components/ui/format-time';

// A 30-minute DST shift (Lord Howe), a 45-minute offset (Chatham), no DST (Kolkata), both hemispheres.
const ZONES = ['Europe/London', 'America/New_York', 'Australia/Lord_Howe', 'Pacific/Chatham', 'Asia/Kolkata', 'UTC'];

/** Every 15 minutes across a day either side of each 2026 DST change in London and New York, plus a spread over two years. */
function instants(): number[] {
  const out: number[] = [];
  for (const change of ['2026-03-08T07:00:00Z', '2026-03-29T01:00:00Z', '2026-10-25T01:00:00Z', '2026-11-01T06:00:00Z', '2026-04-05T15:00:00Z', '2026-10-04T16:00:00Z']) {
    const t = Date.parse(change);
    for (let m = -24 * 60; m <= 24 * 60; m += 15) out.push(t + m * 60_000);
  }
  // A fixed pseudo-random spread (an LCG, so every run checks the same instants).
  let seed = 20261202;
  for (let i = 0; i < 600; i++) {
    seed = (seed * 1103515245 + 12345) % 2 ** 31;
    out.push(Date.parse('2025-06-01T00:00:00Z') + (seed % (730 * 24 * 60)) * 60_000 + (seed % 60) * 1000);
  }
  return out;
}

describe('formatInZone', () => {
  it.each(ZONES)('matches date-fns on TZDate in %s for every pattern', (zone) => {
    const mismatches: string[] = [];
    for (const ms of instants()) {
      for (const pattern of TIME_PATTERNS) {
        const expected = format(new TZDate(ms, zone), pattern);
        const actual = formatInZone(ms, zone, pattern);
        if (actual !== expected && mismatches.length < 5) mismatches.push(`${new Date(ms).toISOString()} ${pattern}: ${actual} ≠ ${expected}`);
      }
    }
    expect(mismatches).toEqual([]);
  });

  it('gives known wall-clock times (hand-checked: London is UTC+0 in winter, UTC+1 in summer; New York UTC−5/−4)', () => {
    expect(formatClock('2026-12-02T14:05:00Z', 'Europe/London', '24h')).toBe('14:05');
    expect(formatClock('2026-07-02T14:05:00Z', 'Europe/London', '24h')).toBe('15:05');
    expect(formatClock('2026-07-02T04:05:00Z', 'America/New_York', '12h')).toBe('12:05 AM');
    expect(formatClock('2026-12-02T17:05:00Z', 'America/New_York', '12h')).toBe('12:05 PM');
    expect(formatDayTime('2026-12-31T23:30:00Z', 'Asia/Kolkata', '24h')).toBe('1 Jan, 05:00');
  });

  it('says UTC for a zone the runtime does not know, and a dash for no time', () => {
    expect(formatInZone('2026-12-02T14:05:00Z', 'Not/AZone', 'HH:mm')).toBe('14:05 UTC');
    expect(formatInZone('2026-07-02T23:05:00Z', 'Not/AZone', 'EEE d MMM, h:mm a')).toBe('Thu 2 Jul, 11:05 PM UTC');
    expect(formatInZone('not a time', 'Europe/London', 'HH:mm')).toBe('—');
  });
});

/**
 * Dates on every time outside today. The expected texts are written by hand from the zones'
 * offsets (from memory: London UTC+0 in winter and UTC+1 in summer, New York UTC−5 in winter,
 * Sydney UTC+11 in its summer, Kolkata UTC+5:30 all year), never taken from the code.
 */
describe("formatWhen: the day named whenever it is not today, in the unit's zone", () => {
  // A fixed clock: 2026-12-03 08:30 UTC. In London that is Thu 3 Dec 08:30; in New York Thu 3 Dec 03:30;
  // in Sydney Thu 3 Dec 19:30; in Kolkata Thu 3 Dec 14:00.
  const NOW = new Date('2026-12-03T08:30:00Z');

  it('in London (UTC+0 in December)', () => {
    const tz = 'Europe/London';
    expect(formatWhen('2026-12-03T07:05:00Z', tz, '24h', NOW)).toBe('07:05');
    expect(formatWhen('2026-12-03T00:00:00Z', tz, '24h', NOW)).toBe('00:00');
    expect(formatWhen('2026-12-02T23:40:00Z', tz, '24h', NOW)).toBe('Yesterday, 23:40');
    expect(formatWhen('2026-12-02T23:40:00Z', tz, '12h', NOW)).toBe('Yesterday, 11:40 PM');
    expect(formatWhen('2026-12-01T09:15:00Z', tz, '24h', NOW)).toBe('1 Dec, 09:15');
    expect(formatWhen('2026-12-04T00:30:00Z', tz, '24h', NOW)).toBe('Tomorrow, 00:30');
    expect(formatWhen('2025-12-31T22:00:00Z', tz, '24h', NOW)).toBe('31 Dec 2025, 22:00');
  });

  it('in New York (UTC−5): the same instants fall on other days', () => {
    const tz = 'America/New_York';
    // 07:05 UTC is 02:05 in New York, still 3 Dec: today.
    expect(formatWhen('2026-12-03T07:05:00Z', tz, '24h', NOW)).toBe('02:05');
    // 00:00 UTC on 3 Dec is 19:00 on 2 Dec in New York: yesterday there, today in London.
    expect(formatWhen('2026-12-03T00:00:00Z', tz, '24h', NOW)).toBe('Yesterday, 19:00');
    // 04:59 UTC is 23:59 the evening before in New York; 05:00 UTC is its midnight.
    expect(formatWhen('2026-12-03T04:59:00Z', tz, '12h', NOW)).toBe('Yesterday, 11:59 PM');
    expect(formatWhen('2026-12-03T05:00:00Z', tz, '12h', NOW)).toBe('12:00 AM');
    expect(formatWhen('2026-12-02T04:59:00Z', tz, '12h', NOW)).toBe('1 Dec, 11:59 PM');
    expect(formatWhen('2026-12-01T04:00:00Z', tz, '24h', NOW)).toBe('30 Nov, 23:00');
  });

  it('in Sydney (UTC+11) and Kolkata (UTC+5:30)', () => {
    // 13:00 UTC on 3 Dec is 00:00 on 4 Dec in Sydney: tomorrow there.
    expect(formatWhen('2026-12-03T13:00:00Z', 'Australia/Sydney', '24h', NOW)).toBe('Tomorrow, 00:00');
    expect(formatWhen('2026-12-02T12:59:00Z', 'Australia/Sydney', '24h', NOW)).toBe('Yesterday, 23:59');
    expect(formatWhen('2026-12-02T18:29:00Z', 'Asia/Kolkata', '24h', NOW)).toBe('Yesterday, 23:59');
    expect(formatWhen('2026-12-02T18:30:00Z', 'Asia/Kolkata', '24h', NOW)).toBe('00:00');
  });

  it('names the day for the form and the day separators', () => {
    expect(formatDayAndTime('2026-12-03T08:18:00Z', 'Europe/London', '24h', NOW)).toBe('Today, 08:18');
    expect(formatDayAndTime('2026-12-02T23:40:00Z', 'Europe/London', '24h', NOW)).toBe('Yesterday, 23:40');
    expect(formatDayAndTime('2026-11-28T09:15:00Z', 'Europe/London', '24h', NOW)).toBe('Sat 28 Nov, 09:15');
    expect(dayHeading('2026-12-03T00:00:00Z', 'Europe/London', NOW)).toBe('Today');
    expect(dayHeading('2026-12-03T00:00:00Z', 'America/New_York', NOW)).toBe('Yesterday');
    expect(dayHeading('2026-12-01T12:00:00Z', 'America/New_York', NOW)).toBe('Tue 1 Dec');
    expect(localDayKey('2026-12-03T00:00:00Z', 'America/New_York')).toBe('2026-12-02');
    expect(localDayKey('2026-12-03T00:00:00Z', 'Asia/Kolkata')).toBe('2026-12-03');
    expect(shiftDayKey('2026-03-01', -1)).toBe('2026-02-28');
    expect(shiftDayKey('2024-03-01', -1)).toBe('2024-02-29');
    expect(shiftDayKey('2026-12-31', 1)).toBe('2027-01-01');
  });

  it('counts calendar days across a DST change (London clocks go back at 02:00 BST on 25 Oct 2026)', () => {
    const after = new Date('2026-10-26T09:00:00Z'); // Mon 26 Oct 09:00 GMT
    // 23:30 UTC on 23 Oct is 00:30 BST on 24 Oct; 00:30 UTC on 25 Oct is 01:30 BST, before the change.
    expect(formatWhen('2026-10-23T23:30:00Z', 'Europe/London', '24h', after)).toBe('24 Oct, 00:30');
    expect(formatWhen('2026-10-25T00:30:00Z', 'Europe/London', '24h', after)).toBe('Yesterday, 01:30');
    expect(formatWhen('2026-10-25T23:30:00Z', 'Europe/London', '24h', after)).toBe('Yesterday, 23:30');
    expect(formatWhen('2026-10-26T00:30:00Z', 'Europe/London', '24h', after)).toBe('00:30');
  });

  it('says UTC for a zone the runtime does not know, and a dash for no time', () => {
    expect(formatWhen('2026-12-03T07:05:00Z', 'Not/AZone', '24h', NOW)).toBe('07:05 UTC');
    expect(formatWhen('2026-12-02T07:05:00Z', 'Not/AZone', '24h', NOW)).toBe('Yesterday, 07:05 UTC');
    expect(formatWhen('not a time', 'Europe/London', '24h', NOW)).toBe('—');
  });
});
