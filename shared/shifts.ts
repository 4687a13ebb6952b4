import { TZDate } from '@date-fns/tz';

export type ShiftName = 'day' | 'night';

export interface ShiftTimes {
  dayShiftStart: string; // "07:00"
  nightShiftStart: string; // "19:00"
  timeZone: string;
}

export interface ShiftSlot {
  /** Local date (YYYY-MM-DD) on which the shift began. */
  shiftDate: string;
  shift: ShiftName;
  startsAt: Date;
  endsAt: Date;
}

function minutesOf(hhmm: string): number {
  const [h, m] = hhmm.split(':').map(Number);
  return (h ?? 0) * 60 + (m ?? 0);
}

function pad(n: number): string {
  return String(n).padStart(2, '0');
}

function localDateString(d: TZDate): string {
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
}

/** The instant a local wall-clock time happens in the unit's zone (DST-aware). */
function at(dateStr: string, minutes: number, timeZone: string): Date {
  const [y, mo, d] = dateStr.split('-').map(Number);
  const local = new TZDate(y!, mo! - 1, d!, Math.floor(minutes / 60), minutes % 60, 0, timeZone);
  return new Date(local.getTime());
}

function addDays(dateStr: string, days: number): string {
  const [y, mo, d] = dateStr.split('-').map(Number);
  const t = new Date(Date.UTC(y!, mo! - 1, d! + days));
  return `${t.getUTCFullYear()}-${pad(t.getUTCMonth() + 1)}-${pad(t.getUTCDate())}`;
}

/** Which shift an instant falls in, in the unit's time zone. Night shifts belong to the date they began. */
export function shiftAt(instant: Date, times: ShiftTimes): ShiftSlot {
  const local = new TZDate(instant.getTime(), times.timeZone);
  const minutes = local.getHours() * 60 + local.getMinutes();
  const day = minutesOf(times.dayShiftStart);
  const night = minutesOf(times.nightShiftStart);
  const today = localDateString(local);
  if (minutes >= day && minutes < night) {
    return { shiftDate: today, shift: 'day', startsAt: at(today, day, times.timeZone), endsAt: at(today, night, times.timeZone) };
  }
  const shiftDate = minutes >= night ? today : addDays(today, -1);
  return {
    shiftDate,
    shift: 'night',
    startsAt: at(shiftDate, night, times.timeZone),
    endsAt: at(addDays(shiftDate, 1), day, times.timeZone),
  };
}

/** The shift that follows a slot. */
export function nextShift(slot: ShiftSlot, times: ShiftTimes): ShiftSlot {
  return shiftAt(new Date(slot.endsAt.getTime() + 1000), times);
}
