/**
 * The probe vs remote-site gap.
 *
 * The skin probe drives the heater but is not trusted alone: when it differs from the remote
 * site (axillary or rectal) by more than 0.5 °C (0.9 °F), the probe needs attention (common
 * practice). Exactly 0.5 °C does not flag. The comparison is exact: both values are read as
 * typed and compared as rationals, so 0.9 °F never becomes 0.50000001 °C.
 */

import { requireInteger, ThermalInputError } from './errors';
import { roundHalfAwayBig, subtract } from './exact';
import { exactCelsius } from './temperature-input';
import type { TempUnit } from './units';

/** More than 0.5 °C (0.9 °F) between probe and remote site needs attention (common practice). */
export const DEFAULT_GAP_LIMIT_CENTI = 50;

export type GapDirection = 'probe-higher' | 'probe-lower' | 'equal';

export interface GapAssessment {
  /** |probe − remote| in hundredths of °C, rounded half away from zero. */
  readonly gapCenti: number;
  readonly direction: GapDirection;
  /** True only when the exact gap is MORE than the limit. */
  readonly exceeds: boolean;
}

export interface TemperatureEntry {
  readonly value: number;
  readonly unit: TempUnit;
}

function requireLimit(limitCenti: unknown): number {
  const limit = requireInteger(limitCenti, 'limitCenti');
  if (limit < 0) {
    throw new ThermalInputError('limitCenti', 'out-of-range', 'limitCenti must not be negative');
  }
  return limit;
}

function directionOf(sign: number): GapDirection {
  return sign > 0 ? 'probe-higher' : sign < 0 ? 'probe-lower' : 'equal';
}

/**
 * The gap between a probe and a remote-site temperature as typed, each in °C or °F.
 * Exact for every combination of units: two °F values 0.9 °F apart are exactly 0.5 °C apart
 * and do not exceed; 1.0 °F apart always does. Throws ThermalInputError with field 'probe' or
 * 'remote' for a bad value or unit.
 */
export function assessGap(probe: TemperatureEntry, remote: TemperatureEntry, limitCenti: number = DEFAULT_GAP_LIMIT_CENTI): GapAssessment {
  const limit = requireLimit(limitCenti);
  const probeC = exactCelsius(probe?.value, probe?.unit, 'probe');
  const remoteC = exactCelsius(remote?.value, remote?.unit, 'remote');
  const diff = subtract(probeC, remoteC);
  const magnitude = diff.num < 0n ? -diff.num : diff.num;
  return {
    gapCenti: roundHalfAwayBig(magnitude * 100n, diff.den),
    direction: directionOf(diff.num > 0n ? 1 : diff.num < 0n ? -1 : 0),
    // gap °C > limit/100 °C  ⇔  |num| × 100 > limit × den: integers only, nothing rounded.
    exceeds: magnitude * 100n > BigInt(limit) * diff.den,
  };
}

/** The same rule on stored values (integer hundredths of °C). */
export function assessGapCenti(probeCenti: number, remoteCenti: number, limitCenti: number = DEFAULT_GAP_LIMIT_CENTI): GapAssessment {
  const limit = requireLimit(limitCenti);
  const diff = requireInteger(probeCenti, 'probeCenti') - requireInteger(remoteCenti, 'remoteCenti');
  const gapCenti = Math.abs(diff);
  return { gapCenti, direction: directionOf(Math.sign(diff)), exceeds: gapCenti > limit };
}
