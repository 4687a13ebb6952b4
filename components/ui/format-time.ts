import { TZDate } from '@date-fns/tz';
import { format } from 'date-fns/format';

/** The user's clock setting. */
export type ClockSetting = '24h' | '12h';

function instant(at: string | Date | number): number {
  return typeof at === 'number' ? at : typeof at === 'string' ? Date.parse(at) : at.getTime();
}

/**
 * Format in the unit's time zone, never the device's: a nurse on a phone set to another zone
 * must read the same times as the wall clock on the unit. A bad zone falls back to UTC, said so.
 */
export function formatInZone(at: string | Date | number, timeZone: string, pattern: string): string {
  const ms = instant(at);
  if (Number.isNaN(ms)) return '—';
  try {
    return format(new TZDate(ms, timeZone), pattern);
  } catch {
    return `${format(new TZDate(ms, 'UTC'), pattern)} UTC`;
  }
}

/** "14:05" or "2:05 PM". */
export function formatClock(at: string | Date | number, timeZone: string, clock: ClockSetting): string {
  return formatInZone(at, timeZone, clock === '24h' ? 'HH:mm' : 'h:mm a');
}

/** "2 Dec, 14:05" or "2 Dec, 2:05 PM". */
export function formatDayTime(at: string | Date | number, timeZone: string, clock: ClockSetting): string {
  return formatInZone(at, timeZone, clock === '24h' ? 'd MMM, HH:mm' : 'd MMM, h:mm a');
}
