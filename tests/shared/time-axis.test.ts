/**
 * The trend chart's time axis names the day when its window crosses midnight. Expected values
 * by hand: London is UTC+0 in November, New York UTC−5 (from memory).
 */
import { timeAxis } from '@/components/bedside/time-axis';

describe('timeAxis', () => {
  it("finds the unit's midnight inside a 24-hour window and names the day on the ticks after it", () => {
    const to = new Date('2026-11-16T10:00:00Z');
    const from = new Date('2026-11-15T10:00:00Z');
    const axis = timeAxis(from, to, 'Europe/London', '24h');
    expect(axis.crossesMidnight).toBe(true);
    expect(axis.midnights.map((d) => d.toISOString())).toEqual(['2026-11-16T00:00:00.000Z']);
    const ticks = ['2026-11-15T12:00:00Z', '2026-11-15T18:00:00Z', '2026-11-16T00:00:00Z', '2026-11-16T06:00:00Z'].map((t) => new Date(t));
    expect(ticks.map((t, i) => axis.label(t, i, ticks))).toEqual(['12:00\nYesterday', '18:00', '00:00\nToday', '06:00']);
  });

  it("puts the midnight where the unit's zone has it (05:00 UTC for New York), with dates further back", () => {
    const to = new Date('2026-11-16T15:00:00Z');
    const from = new Date(to.getTime() - 72 * 3_600_000);
    const axis = timeAxis(from, to, 'America/New_York', '12h');
    expect(axis.midnights.map((d) => d.toISOString())).toEqual(['2026-11-14T05:00:00.000Z', '2026-11-15T05:00:00.000Z', '2026-11-16T05:00:00.000Z']);
    const ticks = [new Date('2026-11-13T20:00:00Z'), new Date('2026-11-14T20:00:00Z')];
    expect(ticks.map((t, i) => axis.label(t, i, ticks))).toEqual(['3:00 PM\nFri 13 Nov', '3:00 PM\nSat 14 Nov']);
  });

  it('leaves the day out of a window inside one day', () => {
    const axis = timeAxis(new Date('2026-11-16T08:00:00Z'), new Date('2026-11-16T20:00:00Z'), 'Europe/London', '24h');
    expect(axis.crossesMidnight).toBe(false);
    expect(axis.midnights).toEqual([]);
    expect(axis.label(new Date('2026-11-16T12:00:00Z'), 0, [new Date('2026-11-16T12:00:00Z')])).toBe('12:00');
  });
});
