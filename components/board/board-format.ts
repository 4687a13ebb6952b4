import { duration } from '@/components/bedside/format';
import { formatWhen, type ClockSetting } from '@/components/ui/format-time';
import type { IconName } from '@/components/ui/icon';
import type { StatusTone } from '@/components/ui/status-badge';

/** "55 min" or "2 h 05 min": a span of seconds in the words every screen uses (never a clock-like "55:33"). */
export function minutesWords(totalSeconds: number): string {
  return duration(totalSeconds * 1000);
}

/** The same span held together on one line (no-break spaces): a narrow tile breaks before it, never inside it. */
function unbroken(words: string): string {
  return words.replace(/ /g, '\u00a0');
}

/** The countdown to the next check at `nowMs`, in words ("Overdue by 55 min"). */
export function countdown(dueAt: string | null, nowMs: number, dueSoonMinutes: number): { text: string; tone: StatusTone; icon: IconName } {
  if (!dueAt) return { text: 'No check yet', tone: 'neutral', icon: 'clock' };
  const left = (Date.parse(dueAt) - nowMs) / 1000;
  // Late: whole minutes gone by ("under 1 min" in the first minute, never "by 0 min").
  if (left < 0) return { text: left > -60 ? 'Overdue by under 1 min' : `Overdue by ${unbroken(minutesWords(-left))}`, tone: 'danger', icon: 'alert' };
  // To come: minutes started count, so the last seconds read "Due in 1 min", never "Due in 0 min".
  const ahead = Math.ceil(left / 60) * 60;
  if (left <= dueSoonMinutes * 60) return { text: `Due in ${unbroken(minutesWords(ahead))}`, tone: 'warning', icon: 'clock' };
  return { text: `Check in ${unbroken(minutesWords(ahead))}`, tone: 'ok', icon: 'check' };
}

/** "4 min ago", "2 h 10 min ago". */
export function ageOf(iso: string, nowMs: number): string {
  const minutes = Math.max(0, Math.floor((nowMs - Date.parse(iso)) / 60_000));
  if (minutes < 60) return `${minutes} min ago`;
  return `${Math.floor(minutes / 60)} h ${minutes % 60} min ago`;
}

/** A time in the unit's zone, by the user's 12/24-hour setting, dated whenever it is not today ("Yesterday, 23:40"). */
export function clockTime(iso: string, timeZone: string, clock: ClockSetting = '24h', now: Date | number = Date.now()): string {
  return formatWhen(iso, timeZone, clock, now);
}
