import { TZDate } from '@date-fns/tz';
import { shiftAt as shiftWindowAt, type Shift } from './thermal/policy';

export type ShiftName = Shift;

export interface ShiftTimes {
  dayShiftStart: string; // "07:00"
  nightShiftStart: string; // "19:00"
  timeZone: string;
}

/** A shift as assignments and reports name it: the rules' window plus the local date it began on. */
export interface ShiftSlot {
  /** Local date (YYYY-MM-DD) on which the shift began. */
  shiftDate: string;
  shift: ShiftName;
  startsAt: Date;
  endsAt: Date;
}

function localDate(instant: Date, timeZone: string): string {
  const d = new TZDate(instant.getTime(), timeZone);
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`;
}

/** Which shift an instant falls in, in the unit's time zone. Night shifts belong to the date they began. */
export function shiftAt(instant: Date, times: ShiftTimes): ShiftSlot {
  const window = shiftWindowAt(instant, times);
  return { shiftDate: localDate(window.startsAt, times.timeZone), shift: window.shift, startsAt: window.startsAt, endsAt: window.endsAt };
}

/** The shift that follows a slot. */
export function nextShift(slot: ShiftSlot, times: ShiftTimes): ShiftSlot {
  return shiftAt(new Date(slot.endsAt.getTime() + 1000), times);
}
