/**
 * The one table of usual ranges and the CSV readers' time rule, checked against values from
 * outside the project: each range's bounds as stated beside it (common practice / from memory),
 * °F by the exact 9/5 conversion (NIST SP 811 §B.8), and clock changes from the tz database
 * (Europe/London: last Sunday of March and October at 01:00 UTC; Pacific/Auckland: last Sunday
 * of September at 02:00 NZST and first Sunday of April at 03:00 NZDT).
 */
import { unusualReason, unusualValues, usualRangeOf, USUAL_RANGES } from '@/shared/plausibility';
import { PLAUSIBLE } from '@/shared/thermal/limits';
import { detectDelimiter, parseCsvLines, parseRowTime } from '@/shared/uploads/csv-text';

describe('usual ranges', () => {
  it('every range names its source', () => {
    for (const r of Object.values(USUAL_RANGES)) expect(r.source).toMatch(/^(from memory|common practice)|WHO|NICE/);
  });

  it('the bedside limits take their numbers from the same table', () => {
    expect(PLAUSIBLE.probe).toEqual({ min: USUAL_RANGES.skin.min, max: USUAL_RANGES.skin.max });
    expect(PLAUSIBLE.set).toEqual({ min: USUAL_RANGES.skinSet.min, max: USUAL_RANGES.skinSet.max });
  });

  it('a set point is judged as skin in skin servo and as air in air servo or manual (an incubator at 32.0 °C air is usual: common practice)', () => {
    expect(usualRangeOf('set', 'skin-servo')).toBe(USUAL_RANGES.skinSet);
    expect(usualRangeOf('set', 'air-servo')).toBe(USUAL_RANGES.airSet);
    expect(usualRangeOf('set', 'manual')).toBe(USUAL_RANGES.airSet);
    expect(unusualReason('set', 3200, { controlMode: 'air-servo' })).toBeNull();
    expect(unusualReason('set', 3200, { controlMode: 'skin-servo' })).toBe('Set temperature 32.0 °C is outside the usual 34.0–38.0 °C for skin servo: confirm it is correct');
  });

  it("says the reason in the nurse's unit: 31.2 °C is 88.2 °F (NIST SP 811: °F = 9/5 °C + 32)", () => {
    expect(unusualReason('remote', 3120, { unit: 'F' })).toBe('Remote-site temperature 88.2 °F is outside the usual 93.2–103.1 °F: confirm it is correct');
    expect(unusualValues({ remoteCenti: 3120, heartRate: 245, probeCenti: 3660 }).map((u) => u.field)).toEqual(['remote', 'heartRate']);
    expect(unusualValues({ remoteCenti: 3650, heartRate: 150 })).toEqual([]);
  });
});

describe('reading a CSV file', () => {
  it('detects the separator from the header line, ignoring quoted ones', () => {
    expect(detectDelimiter('infant,time,probe')).toBe(',');
    expect(detectDelimiter('infant;time;probe')).toBe(';');
    expect(detectDelimiter('"a;b;c",time,probe')).toBe(',');
  });

  it("keeps each row on its line: an unclosed quote is that line's error only", () => {
    const parsed = parseCsvLines('a,b\r\n"1,2\r\n3,4\r\n\r\n5');
    expect(parsed.rows.map((r) => [r.line, r.values.a, r.error ?? ''])).toEqual([
      [2, expect.any(String), expect.stringMatching(/not closed/)],
      [3, '3', ''],
      [5, '5', 'row: 1 cells, but the header has 2 (separator ",")'],
    ]);
  });

  it("reads times: an offset is an instant, a wall-clock time is the unit's, skipped and repeated times are refused", () => {
    expect(parseRowTime('2026-11-16T08:00:00Z', 'Europe/London')).toEqual({ at: new Date('2026-11-16T08:00:00Z') });
    expect(parseRowTime('2026-11-16T09:00+01:00', 'Europe/London')).toEqual({ at: new Date('2026-11-16T08:00:00Z') });
    // NZDT is UTC+13 in December: 08:30 local on 4 Dec is 19:30 UTC on 3 Dec.
    expect(parseRowTime('2026-12-04T08:30', 'Pacific/Auckland')).toEqual({ at: new Date('2026-12-03T19:30:00Z') });
    expect(parseRowTime('2026-07-01 12:00', 'Europe/London')).toEqual({ at: new Date('2026-07-01T11:00:00Z') });
    expect(parseRowTime('2026-09-27T02:30', 'Pacific/Auckland')).toEqual({ error: expect.stringMatching(/does not exist in Pacific\/Auckland/) });
    expect(parseRowTime('2026-04-05T02:30', 'Pacific/Auckland')).toEqual({ error: expect.stringMatching(/happened twice in Pacific\/Auckland/) });
    expect(parseRowTime('2024-02-29T08:00', 'Europe/London')).toEqual({ at: new Date('2024-02-29T08:00:00Z') });
    expect(parseRowTime('2026-02-29T08:00', 'Europe/London')).toEqual({ error: '2026-02-29 is not a date (February 2026 has 28 days)' });
    expect(parseRowTime('2026-04-31T08:00Z', 'Europe/London')).toEqual({ error: '2026-04-31 is not a date (April 2026 has 30 days)' });
    expect(parseRowTime('2026-11-16T24:00', 'Europe/London')).toEqual({ error: '24:00 is not a time of day' });
  });
});
