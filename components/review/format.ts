import { formatTemperature, type TempUnit } from '@/shared/thermal/units';
import { formatDayTime, type ClockSetting } from '@/components/ui/format-time';

/** "16 Nov, 08:40" or "16 Nov, 8:40 AM" in the unit's zone (never the device's), on the viewer's clock. */
export function shortDateTime(iso: string, timeZone: string, clock: ClockSetting): string {
  return formatDayTime(iso, timeZone, clock);
}

export function minutesText(m: number | null): string {
  return m === null ? '—' : m < 90 ? `${m} min` : `${Math.floor(m / 60)} h ${m % 60} min`;
}

/** A temperature in the viewer's unit. */
export function temp(centi: number | null, unit: TempUnit): string {
  return centi === null ? '—' : formatTemperature(centi, unit);
}

/** YYYY-MM-DD of a local day `offset` days from today. */
export function localDay(offset = 0): string {
  const d = new Date();
  d.setDate(d.getDate() + offset);
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`;
}

/** The review's own status in words (apart from the flag's lifecycle). */
export const REVIEW_STATE_WORDS = {
  unreviewed: 'To review',
  noted: 'Noted, not yet read by the nurse',
  acknowledged: 'Noted and read by the nurse',
  'no-teaching-point': 'No teaching point',
} as const;
