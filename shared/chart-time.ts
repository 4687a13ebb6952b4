/**
 * When a reading may be charted: one rule for the bedside form and the server, so the form
 * refuses exactly what the server would. No zod, React or database imports: the form's first
 * page loads this.
 */
import { FUTURE_TOLERANCE_MINUTES, LATE_ENTRY_MINUTES } from './vocabulary';

export { FUTURE_TOLERANCE_MINUTES, LATE_ENTRY_MINUTES };

/** What a nurse reads when the time she entered is ahead of the clock. */
export const FUTURE_TIME_MESSAGE = 'The time cannot be in the future.';

/** Later than now, beyond the few minutes a device's clock may run ahead of the server's. */
export function isFutureTime(takenAtMs: number, nowMs: number): boolean {
  return takenAtMs > nowMs + FUTURE_TOLERANCE_MINUTES * 60_000;
}

/** Taken more than LATE_ENTRY_MINUTES before now: charted late, so a reason is needed. */
export function isLateEntry(takenAtMs: number, nowMs: number): boolean {
  return nowMs - takenAtMs > LATE_ENTRY_MINUTES * 60_000;
}

/**
 * A temperature typed to at most one decimal place, as thermometers and monitors show it.
 * Applied to the number in the unit the nurse typed it in (°C or °F), before any conversion:
 * 97.71 °F and 98.62 °F are 0.91 °F apart yet both round to hundredths of °C exactly 0.50 °C
 * apart, so a second decimal would decide whether a gap flag is raised.
 * A binary number's last-digit noise (36.7 + 0.1 = 36.800000000000004) is not a second decimal.
 */
export function hasOneDecimalAtMost(value: number): boolean {
  if (!Number.isFinite(value)) return false;
  const tenths = value * 10;
  return Math.abs(tenths - Math.round(tenths)) < 1e-9 * Math.max(1, Math.abs(tenths));
}

/** The error for a second decimal, with an example in the nurse's unit. */
export function oneDecimalMessage(label: string, unit: 'C' | 'F'): string {
  return `${label}: enter one decimal place, e.g. ${unit === 'C' ? '36.8' : '98.2'}.`;
}
