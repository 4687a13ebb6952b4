/** The user's clock setting. */
export type ClockSetting = '24h' | '12h';

function instant(at: string | Date | number): number {
  return typeof at === 'number' ? at : typeof at === 'string' ? Date.parse(at) : at.getTime();
}

/**
 * Format in the unit's time zone, never the device's: a nurse on a phone set to another zone
 * must read the same times as the wall clock on the unit. A zone this runtime does not know falls
 * back to UTC, said so.
 *
 * The patterns are Warmfold's own few, built from one Intl call per instant: the screens format
 * many times per render (a flowsheet card shows several), and date-fns' general `format` on a
 * TZDate asks Intl for the zone's offset on every field it reads, and would bring its formatters
 * and English locale to every page. tests/shared/format-time.test.ts checks that the text is the
 * one date-fns gives, across zones and DST changes.
 */
export function formatInZone(at: string | Date | number, timeZone: string, pattern: TimePattern): string {
  const ms = instant(at);
  if (Number.isNaN(ms)) return '—';
  const build = PATTERNS[pattern];
  const local = wallClock(ms, timeZone);
  if (local) return build(local);
  const d = new Date(ms);
  return `${build({ year: d.getUTCFullYear(), month: d.getUTCMonth() + 1, day: d.getUTCDate(), hour: d.getUTCHours(), minute: d.getUTCMinutes() })} UTC`;
}

interface WallClock {
  year: number;
  /** 1 to 12. */
  month: number;
  day: number;
  /** 0 to 23. */
  hour: number;
  minute: number;
}

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
const WEEKDAYS = ['Sun', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat'];
const pad = (n: number) => String(n).padStart(2, '0');
const h24 = (w: WallClock) => `${pad(w.hour)}:${pad(w.minute)}`;
const h12 = (w: WallClock) => `${w.hour % 12 === 0 ? 12 : w.hour % 12}:${pad(w.minute)} ${w.hour < 12 ? 'AM' : 'PM'}`;
const dayMonth = (w: WallClock) => `${w.day} ${MONTHS[w.month - 1]}`;
const weekday = (w: WallClock) => WEEKDAYS[new Date(Date.UTC(w.year, w.month - 1, w.day)).getUTCDay()];

/** Each pattern in date-fns' notation, with what builds it. */
const PATTERNS = {
  'HH:mm': h24,
  'h:mm a': h12,
  'd MMM, HH:mm': (w: WallClock) => `${dayMonth(w)}, ${h24(w)}`,
  'd MMM, h:mm a': (w: WallClock) => `${dayMonth(w)}, ${h12(w)}`,
  'EEE d MMM, HH:mm': (w: WallClock) => `${weekday(w)} ${dayMonth(w)}, ${h24(w)}`,
  'EEE d MMM, h:mm a': (w: WallClock) => `${weekday(w)} ${dayMonth(w)}, ${h12(w)}`,
} satisfies Record<string, (w: WallClock) => string>;

export type TimePattern = keyof typeof PATTERNS;
export const TIME_PATTERNS = Object.keys(PATTERNS) as TimePattern[];

const wallFormats = new Map<string, Intl.DateTimeFormat | null>();

/** The wall-clock fields at `ms` in `timeZone`, or null if this runtime does not know the zone. */
function wallClock(ms: number, timeZone: string): WallClock | null {
  let f = wallFormats.get(timeZone);
  if (f === undefined) {
    try {
      f = new Intl.DateTimeFormat('en-US', { timeZone, hourCycle: 'h23', year: 'numeric', month: 'numeric', day: 'numeric', hour: 'numeric', minute: 'numeric' });
    } catch {
      f = null;
    }
    wallFormats.set(timeZone, f);
  }
  if (!f) return null;
  const w: Partial<Record<Intl.DateTimeFormatPartTypes, number>> = {};
  for (const p of f.formatToParts(ms)) if (p.type !== 'literal') w[p.type] = Number(p.value);
  const { year, month, day, hour, minute } = w;
  if ([year, month, day, hour, minute].some((v) => v === undefined || Number.isNaN(v))) return null;
  return { year: year!, month: month!, day: day!, hour: hour! % 24, minute: minute! };
}

/** "14:05" or "2:05 PM". */
export function formatClock(at: string | Date | number, timeZone: string, clock: ClockSetting): string {
  return formatInZone(at, timeZone, clock === '24h' ? 'HH:mm' : 'h:mm a');
}

/** "2 Dec, 14:05" or "2 Dec, 2:05 PM". */
export function formatDayTime(at: string | Date | number, timeZone: string, clock: ClockSetting): string {
  return formatInZone(at, timeZone, clock === '24h' ? 'd MMM, HH:mm' : 'd MMM, h:mm a');
}

/** The wall clock in the zone, or in UTC (said so by `utc`) for a zone this runtime does not know. */
function wallOrUtc(ms: number, timeZone: string): WallClock & { utc: boolean } {
  const local = wallClock(ms, timeZone);
  if (local) return { ...local, utc: false };
  const d = new Date(ms);
  return { year: d.getUTCFullYear(), month: d.getUTCMonth() + 1, day: d.getUTCDate(), hour: d.getUTCHours(), minute: d.getUTCMinutes(), utc: true };
}

/** A calendar day as a number of days since 1970-01-01, for counting days between two dates. */
const dayNumber = (w: Pick<WallClock, 'year' | 'month' | 'day'>) => Math.round(Date.UTC(w.year, w.month - 1, w.day) / 86_400_000);

/** The calendar day of an instant in the unit's zone, as "2026-12-03": a key to group a list by day. */
export function localDayKey(at: string | Date | number, timeZone: string): string {
  const w = wallOrUtc(instant(at), timeZone);
  return `${w.year}-${pad(w.month)}-${pad(w.day)}`;
}

/** A day key moved by whole days: shiftDayKey("2026-03-01", -1) is "2026-02-28". */
export function shiftDayKey(key: string, days: number): string {
  const [y, m, d] = key.split('-').map(Number) as [number, number, number];
  const t = new Date(Date.UTC(y, m - 1, d + days));
  return `${t.getUTCFullYear()}-${pad(t.getUTCMonth() + 1)}-${pad(t.getUTCDate())}`;
}

/** "Today", "Yesterday", "Tomorrow", else "Wed 2 Dec" (with the year when it is not this year's). */
export function dayKeyName(key: string, timeZone: string, now: Date | number): string {
  const [year, month, day] = key.split('-').map(Number) as [number, number, number];
  const today = wallOrUtc(instant(now), timeZone);
  const diff = dayNumber({ year, month, day }) - dayNumber(today);
  if (diff === 0) return 'Today';
  if (diff === -1) return 'Yesterday';
  if (diff === 1) return 'Tomorrow';
  const w = { year, month, day, hour: 0, minute: 0 };
  return `${weekday(w)} ${dayMonth(w)}${year === today.year ? '' : ` ${year}`}`;
}

/**
 * The heading of a day in a list or on a chart's axis, in the unit's zone: "Today",
 * "Yesterday", "Wed 2 Dec". Group rows with localDayKey and put this above each new day.
 */
export function dayHeading(at: string | Date | number, timeZone: string, now: Date | number): string {
  const ms = instant(at);
  if (Number.isNaN(ms)) return '—';
  return dayKeyName(localDayKey(ms, timeZone), timeZone, now);
}

/**
 * A time on a list or a card, dated whenever it is not today (in the unit's zone, on the
 * unit's calendar): "14:05" today, "Yesterday, 23:40", "Tomorrow, 00:30", "3 Dec, 09:15",
 * "3 Dec 2025, 09:15" in another year. With the 12-hour clock, "Yesterday, 11:40 PM".
 */
export function formatWhen(at: string | Date | number, timeZone: string, clock: ClockSetting, now: Date | number): string {
  const ms = instant(at);
  if (Number.isNaN(ms)) return '—';
  const w = wallOrUtc(ms, timeZone);
  const time = `${clock === '24h' ? h24(w) : h12(w)}${w.utc ? ' UTC' : ''}`;
  const today = wallOrUtc(instant(now), timeZone);
  const diff = dayNumber(w) - dayNumber(today);
  if (diff === 0) return time;
  if (diff === -1) return `Yesterday, ${time}`;
  if (diff === 1) return `Tomorrow, ${time}`;
  return `${dayMonth(w)}${w.year === today.year ? '' : ` ${w.year}`}, ${time}`;
}

/** Always naming the day, for a form's "taken at" line: "Today, 21:18", "Yesterday, 23:40", "Sat 14 Nov, 09:15". */
export function formatDayAndTime(at: string | Date | number, timeZone: string, clock: ClockSetting, now: Date | number): string {
  const ms = instant(at);
  if (Number.isNaN(ms)) return '—';
  const w = wallOrUtc(ms, timeZone);
  const time = `${clock === '24h' ? h24(w) : h12(w)}${w.utc ? ' UTC' : ''}`;
  return `${dayHeading(ms, timeZone, now)}, ${time}`;
}
