/**
 * One way to say how late a check is: the wall board's countdown and the printed unit summary
 * say the same words for the same instant. Expected strings are written out by hand.
 */
import { countdown } from '@/components/board/board-format';
import { nextCheckWords } from '@/components/unit-shift/unit-summary';
import type { HandoverInfant } from '@/shared/types/board';

const NBSP = '\u00a0';
const words = (s: string) => s.replace(new RegExp(NBSP, 'g'), ' ');
const DUE = '2026-03-10T02:00:00.000Z';
const at = (minutesAfterDue: number, seconds = 0) => Date.parse(DUE) + minutesAfterDue * 60_000 + seconds * 1000;

function handover(dueAt: string | null): HandoverInfant {
  // Only the next check matters to nextCheckWords; the rest of a handover is left out.
  return { nextCheck: { status: 'overdue', dueAt, minutesLate: 0 } } as unknown as HandoverInfant;
}

describe('how late a check is, in words', () => {
  it('says 82 minutes late as "1 h 22 min" on the board and on the printed summary alike', () => {
    expect(words(countdown(DUE, at(82, 30), 30).text)).toBe('Overdue by 1 h 22 min');
    expect(words(nextCheckWords(handover(DUE), at(82, 30), 'UTC', '24h'))).toBe('Overdue by 1 h 22 min (due 02:00)');
  });

  it('counts whole minutes gone by, and says "under 1 min" in the first minute, never "0 min"', () => {
    expect(words(countdown(DUE, at(0, 40), 30).text)).toBe('Overdue by under 1 min');
    expect(words(countdown(DUE, at(5, 59), 30).text)).toBe('Overdue by 5 min');
    expect(words(nextCheckWords(handover(DUE), at(0, 40), 'UTC', '24h'))).toBe('Overdue by under 1 min (due 02:00)');
  });

  it('counts a started minute ahead, so the last seconds read "in 1 min"', () => {
    expect(words(countdown(DUE, at(-1, 50), 30).text)).toBe('Due in 1 min');
    expect(words(countdown(DUE, at(-65), 30).text)).toBe('Check in 1 h 05 min');
    expect(words(nextCheckWords(handover(DUE), at(-65), 'UTC', '24h'))).toBe('Check in 1 h 05 min (due 02:00)');
  });

  it('never prints a clock-like countdown', () => {
    for (const m of [-200, -61, -1, 0, 1, 59, 60, 125]) expect(countdown(DUE, at(m, 7), 30).text).not.toMatch(/\d:\d\d/);
  });

  it('says when no remote-site check was charted', () => {
    expect(nextCheckWords(handover(null), at(0), 'UTC', '24h')).toBe('No remote-site check charted');
  });
});
