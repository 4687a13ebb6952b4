/**
 * formatInZone builds Warmfold's own time patterns from one Intl call per instant. The reference
 * is date-fns `format` on an @date-fns/tz TZDate (the general-purpose libraries it replaces on
 * this path): the text must be identical in every zone, across DST changes both ways, at
 * midnight and noon, for every pattern the screens use.
 */
import { TZDate } from '@date-fns/tz';
import { format } from 'date-fns/format';
import { formatClock, formatDayTime, formatInZone, TIME_PATTERNS } from '@/components/ui/format-time';

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
