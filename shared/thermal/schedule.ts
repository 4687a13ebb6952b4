/**
 * The remote-site check schedule.
 *
 * While an infant is on a servo-controlled heater the probe is checked against a remote-site
 * temperature at least every 2 hours (common practice). A check is due a fixed number of real
 * minutes after the last one: the arithmetic is on instants, so a change to or from summer time
 * in the unit's time zone never shortens or stretches the interval.
 */

import { requireTime, ThermalInputError } from './errors';

export const MINUTE_MS = 60_000;

/** Remote-site check at least every 2 hours on a servo-controlled heater (common practice). */
export const DEFAULT_CHECK_INTERVAL_MINUTES = 120;
/** "Due soon" in the last 15 minutes before the check is due (common practice; a product choice). */
export const DEFAULT_DUE_SOON_MINUTES = 15;

export type CheckStatus = 'never' | 'ok' | 'due-soon' | 'overdue';

export interface CheckSchedulePolicy {
  readonly intervalMinutes?: number;
  readonly dueSoonMinutes?: number;
}

export interface CheckStatusResult {
  readonly status: CheckStatus;
  /** Last check + interval; null when there has never been a check. */
  readonly dueAt: Date | null;
  /** Whole minutes past dueAt (rounded down); 0 unless overdue. */
  readonly minutesLate: number;
}

export function requireMinutes(value: unknown, field: string, allowZero: boolean): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value < 0 || (!allowZero && value === 0)) {
    throw new ThermalInputError(field, 'invalid-policy', `${field} must be a ${allowZero ? 'non-negative' : 'positive'} number of minutes`);
  }
  return value;
}

/**
 * Where a stored next-due instant stands at `now` (the same boundaries as checkStatus): views
 * derive "due soon" and "overdue" from the stored instant and the clock, never from the rules.
 */
export function dueStatus(dueAt: Date | null, now: Date, dueSoonMinutes: number): CheckStatusResult {
  if (dueAt === null) return { status: 'never', dueAt: null, minutesLate: 0 };
  const dueMs = dueAt.getTime();
  const nowMs = now.getTime();
  if (nowMs > dueMs) return { status: 'overdue', dueAt, minutesLate: Math.floor((nowMs - dueMs) / MINUTE_MS) };
  return { status: nowMs >= dueMs - dueSoonMinutes * MINUTE_MS ? 'due-soon' : 'ok', dueAt, minutesLate: 0 };
}

/**
 * Where the next remote-site check stands at `now`:
 * - 'never'    no check recorded;
 * - 'ok'       now < dueAt − dueSoon;
 * - 'due-soon' dueAt − dueSoon ≤ now ≤ dueAt (both ends included);
 * - 'overdue'  now > dueAt, with minutesLate = whole minutes past dueAt.
 */
export function checkStatus(lastRemoteCheckAt: Date | null, now: Date, policy: CheckSchedulePolicy = {}): CheckStatusResult {
  const nowMs = requireTime(now, 'now');
  const interval = requireMinutes(policy.intervalMinutes ?? DEFAULT_CHECK_INTERVAL_MINUTES, 'intervalMinutes', false);
  const dueSoon = requireMinutes(policy.dueSoonMinutes ?? DEFAULT_DUE_SOON_MINUTES, 'dueSoonMinutes', true);
  if (lastRemoteCheckAt === null || lastRemoteCheckAt === undefined) {
    return { status: 'never', dueAt: null, minutesLate: 0 };
  }
  const dueMs = requireTime(lastRemoteCheckAt, 'lastRemoteCheckAt') + interval * MINUTE_MS;
  const dueAt = new Date(dueMs);
  if (nowMs > dueMs) {
    return { status: 'overdue', dueAt, minutesLate: Math.floor((nowMs - dueMs) / MINUTE_MS) };
  }
  const status = nowMs >= dueMs - dueSoon * MINUTE_MS ? 'due-soon' : 'ok';
  return { status, dueAt, minutesLate: 0 };
}
