import { TZDate } from '@date-fns/tz';
import { dayKeyName, formatClock, localDayKey, shiftDayKey, type ClockSetting } from '@/components/ui/format-time';

/**
 * A chart's time axis in the unit's zone, naming the day when the window crosses midnight: each
 * midnight inside the window (where the chart draws a day separator), and tick labels that add
 * the day under the time on the first tick and on the first tick of each new day.
 */
export interface TimeAxis {
  /** The unit's midnights strictly inside the window, oldest first. */
  midnights: Date[];
  /** Whether the window holds more than one calendar day. */
  crossesMidnight: boolean;
  /** The label for a tick: "14:00", or "00:00\nToday" where a day begins. */
  label: (tick: Date, index: number, ticks: Date[]) => string;
}

export function timeAxis(from: Date, to: Date, timeZone: string, clock: ClockSetting, now: Date = to): TimeAxis {
  const first = localDayKey(from, timeZone);
  const last = localDayKey(to, timeZone);
  const midnights: Date[] = [];
  // At most a few days: the flowsheet's widest window is 72 hours.
  for (let key = shiftDayKey(first, 1), n = 0; key <= last && n < 31; key = shiftDayKey(key, 1), n++) {
    const [y, m, d] = key.split('-').map(Number) as [number, number, number];
    const midnight = new TZDate(y, m - 1, d, 0, 0, 0, timeZone).getTime();
    if (midnight > from.getTime() && midnight < to.getTime()) midnights.push(new Date(midnight));
  }
  const crossesMidnight = first !== last;
  const label = (tick: Date, index: number, ticks: Date[]) => {
    const time = formatClock(tick, timeZone, clock);
    if (!crossesMidnight) return time;
    const day = localDayKey(tick, timeZone);
    const previous = index > 0 && ticks[index - 1] ? localDayKey(ticks[index - 1]!, timeZone) : null;
    return day === previous ? time : `${time}\n${dayKeyName(day, timeZone, now)}`;
  };
  return { midnights, crossesMidnight, label };
}
