import { formatInZone, formatWhen } from '@/components/ui/format-time';
import { ACTION_LABELS, CONTROL_MODE_LABELS, CONTROL_MODES, FLAG_KIND_LABELS, HEAT_SOURCE_LABELS, REMOTE_SITE_LABELS, REMOTE_SITES, type ActionKind } from '@/shared/vocabulary';
import { formatTemperature, formatTemperatureDifference, type TempUnit } from '@/shared/thermal/units';

export interface DisplayPrefs {
  tempUnit: TempUnit;
  clock: '24h' | '12h';
}

/** A no-break space keeps a value and its unit on one line: "36.9" and "°C" never part. */
const NBSP = '\u00a0';
const keepTogether = (text: string) => text.replace(/ °/g, `${NBSP}°`);

export function temp(centi: number | null | undefined, unit: TempUnit): string {
  return centi === null || centi === undefined ? '—' : keepTogether(formatTemperature(centi, unit));
}

export function tempDelta(centi: number, unit: TempUnit): string {
  return keepTogether(formatTemperatureDifference(centi, unit));
}

/**
 * A time in the unit's zone, by the user's 12/24-hour setting, dated whenever it is not today:
 * "14:05", "Yesterday, 23:40", "3 Dec, 09:15" (formatWhen in components/ui/format-time.ts).
 * A bare time of day (a form's HH:MM) is formatClock.
 */
export function clockTime(at: string | Date | number, timeZone: string, clock: '24h' | '12h', now: Date | number = Date.now()): string {
  return formatWhen(at, timeZone, clock, now);
}

/** "Wed 2 Dec, 14:05": the weekday helps across a night shift. */
export function dayTime(iso: string, timeZone: string, clock: '24h' | '12h'): string {
  return formatInZone(iso, timeZone, clock === '24h' ? 'EEE d MMM, HH:mm' : 'EEE d MMM, h:mm a');
}

/** "1 h 05 min", "12 min". */
export function duration(ms: number): string {
  const minutes = Math.max(0, Math.floor(ms / 60_000));
  const h = Math.floor(minutes / 60);
  const m = minutes % 60;
  return h > 0 ? `${h} h ${String(m).padStart(2, '0')} min` : `${m} min`;
}

export function gestation(weeks: number, days: number): string {
  return `${weeks}+${days} wk`;
}

export { CONTROL_MODE_LABELS, HEAT_SOURCE_LABELS };

/** The control-mode choice of the reading form. */
export const CONTROL_MODE_OPTIONS = CONTROL_MODES.map((value) => ({ value, label: CONTROL_MODE_LABELS[value] }));
/** The remote-site choice of the reading and correction forms. */
export const REMOTE_SITE_OPTIONS = REMOTE_SITES.map((value) => ({ value, label: REMOTE_SITE_LABELS[value] }));
export const SITE_LABELS = REMOTE_SITE_LABELS;
export const FLAG_LABELS = FLAG_KIND_LABELS;
export const CORRECTION_REASON_LABELS = { 'corrected-value': 'Corrected value', 'entered-in-error': 'Entered in error', 'late-entry': 'Late entry' } as const;

/** An action on a flag in words: "something else" is its note; another action's note follows it. */
export function actionWords(a: { kind: string; note: string | null }): string {
  const label = ACTION_LABELS[a.kind as ActionKind] ?? 'Something done';
  if (a.kind === 'other') return a.note ? `Something else: ${a.note}` : label;
  return a.note ? `${label} (${a.note})` : label;
}
