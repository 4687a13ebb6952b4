/**
 * Skin-to-skin (kangaroo) care: the deviation limit.
 *
 * During a skin-to-skin session the infant is off the heater, so the nurse sets a deviation
 * limit of 0.5 or 1.0 °C around a reference temperature (usually the set temperature when the
 * session starts) and watches for readings outside it (common practice). A reading exactly at
 * the limit does not exceed it.
 *
 * A session covers [startedAt, endedAt): a reading taken at the instant the session ended
 * belongs to the time after it.
 */

import { requireInteger, requireTime, ThermalInputError } from './errors';

/** The deviation limits offered when a session starts: 0.5 or 1.0 °C (common practice). */
export const SKIN_TO_SKIN_LIMITS_CENTI: readonly number[] = [50, 100];

export interface SkinToSkinSession {
  /** The temperature deviations are measured from, in hundredths of °C. */
  readonly referenceCenti: number;
  /** Deviation limit in hundredths of °C (50 or 100 in the product). */
  readonly limitCenti: number;
  readonly startedAt: Date;
  readonly endedAt?: Date | null;
}

export interface SkinToSkinReading {
  readonly takenAt: Date;
  readonly remoteCenti?: number | null;
  readonly probeCenti?: number | null;
}

export interface SkinToSkinDeviation {
  /** Whether the reading was taken during the session. */
  readonly inSession: boolean;
  /**
   * Reading minus reference, signed, in hundredths of °C (negative: colder than the reference).
   * Null outside the session or when the reading has no temperature.
   */
  readonly deviationCenti: number | null;
  /** |deviation| MORE than the limit; false outside the session. */
  readonly exceeds: boolean;
}

export function validateSession(
  session: SkinToSkinSession,
  field = 'session',
): {
  startMs: number;
  endMs: number | null;
} {
  requireInteger(session?.referenceCenti, `${field}.referenceCenti`);
  const limit = requireInteger(session.limitCenti, `${field}.limitCenti`);
  if (limit <= 0) {
    throw new ThermalInputError(`${field}.limitCenti`, 'out-of-range', 'The deviation limit must be above zero');
  }
  const startMs = requireTime(session.startedAt, `${field}.startedAt`);
  const endMs = session.endedAt === null || session.endedAt === undefined ? null : requireTime(session.endedAt, `${field}.endedAt`);
  if (endMs !== null && endMs < startMs) {
    throw new ThermalInputError(`${field}.endedAt`, 'out-of-range', 'A session cannot end before it starts');
  }
  return { startMs, endMs };
}

/** Which temperature is compared: the remote site when taken, otherwise the probe. */
export function skinToSkinTemperature(reading: SkinToSkinReading): number | null {
  if (reading.remoteCenti !== null && reading.remoteCenti !== undefined) {
    return requireInteger(reading.remoteCenti, 'remoteCenti');
  }
  if (reading.probeCenti !== null && reading.probeCenti !== undefined) {
    return requireInteger(reading.probeCenti, 'probeCenti');
  }
  return null;
}

export function skinToSkinDeviation(session: SkinToSkinSession, reading: SkinToSkinReading): SkinToSkinDeviation {
  const { startMs, endMs } = validateSession(session);
  const takenMs = requireTime(reading?.takenAt, 'takenAt');
  const inSession = takenMs >= startMs && (endMs === null || takenMs < endMs);
  const temperature = skinToSkinTemperature(reading);
  if (!inSession || temperature === null) {
    return { inSession, deviationCenti: null, exceeds: false };
  }
  const deviationCenti = temperature - session.referenceCenti;
  return { inSession, deviationCenti, exceeds: Math.abs(deviationCenti) > session.limitCenti };
}
