/**
 * The manual-mode warning.
 *
 * In manual (fixed-output) mode nothing regulates the heat: the heater gives the charted output
 * whatever the infant's temperature. Manual mode is for short-term use and the infant must be
 * checked at least every 15 minutes (ECRI, Infant Radiant Warmers Can Burn: Use with Care). The
 * warning has two reasons:
 * - 'high-output-too-long': in manual at a heater output at or above the threshold (80 %, from
 *   memory) continuously for MORE than the time limit (15 minutes, from memory);
 * - 'no-check-in-manual': in manual and no temperature of the infant (probe or remote site) for
 *   MORE than 15 minutes (ECRI: check the infant at least every 15 minutes). The clock runs from
 *   the later of the last charted temperature and the reading where manual mode began, so the
 *   first check is due 15 minutes after manual mode is charted. The two-hourly remote-site
 *   check keeps its own clock.
 *
 * Readings are taken in time order. A reading with no control mode or no heater output charted
 * leaves the last charted value in force (a quick remote-site check need not re-chart the mode).
 */

import { requireFinite, requireTime, ThermalInputError } from './errors';
import { MINUTE_MS, requireMinutes } from './schedule';
import { CONTROL_MODES, type ControlMode } from '../vocabulary';

/** The standards' control modes (IEC 60601-2-21, 2-19): baby (skin), air, manual; the list and its labels are in shared/vocabulary.ts. */
export type { ControlMode };

export function isControlMode(value: unknown): value is ControlMode {
  return (CONTROL_MODES as readonly unknown[]).includes(value);
}

/** Heater output at or above 80 % counts as high (from memory). */
export const DEFAULT_HIGH_OUTPUT_PCT = 80;
/** High output in manual for more than 15 minutes warns (from memory). */
export const DEFAULT_HIGH_OUTPUT_MINUTES = 15;
/** In manual, check the infant at least every 15 minutes (ECRI hazard report). */
export const DEFAULT_MANUAL_CHECK_MINUTES = 15;

export interface ManualModeReading {
  readonly takenAt: Date;
  readonly controlMode: ControlMode | null;
  readonly heaterOutputPct?: number | null;
  readonly remoteCenti?: number | null;
  readonly probeCenti?: number | null;
}

export interface ManualModePolicy {
  readonly highOutputPct?: number;
  readonly highOutputMinutes?: number;
  readonly manualCheckMinutes?: number;
}

export type ManualModeReason = 'high-output-too-long' | 'no-check-in-manual';

export interface ManualModeWarning {
  readonly warning: boolean;
  /** In this order when both apply: 'high-output-too-long', 'no-check-in-manual'. */
  readonly reasons: ManualModeReason[];
  /** First reading of the current run of manual mode; null when not in manual. */
  readonly manualSince: Date | null;
  /** First reading of the current run of high output in manual; null when none. */
  readonly highOutputSince: Date | null;
}

interface ResolvedManualPolicy {
  readonly highOutputPct: number;
  readonly highOutputMs: number;
  readonly checkMs: number;
}

export function resolveManualPolicy(policy: ManualModePolicy = {}): ResolvedManualPolicy {
  const highOutputPct = policy.highOutputPct ?? DEFAULT_HIGH_OUTPUT_PCT;
  if (typeof highOutputPct !== 'number' || !(highOutputPct >= 0 && highOutputPct <= 100)) {
    throw new ThermalInputError('highOutputPct', 'invalid-policy', 'highOutputPct must be 0–100');
  }
  return {
    highOutputPct,
    highOutputMs: requireMinutes(policy.highOutputMinutes ?? DEFAULT_HIGH_OUTPUT_MINUTES, 'highOutputMinutes', false) * MINUTE_MS,
    checkMs: requireMinutes(policy.manualCheckMinutes ?? DEFAULT_MANUAL_CHECK_MINUTES, 'manualCheckMinutes', false) * MINUTE_MS,
  };
}

interface Stamped<R> {
  readonly reading: R;
  readonly ms: number;
}

/**
 * Incremental state for the manual-mode rule, fed readings in time order. Kept separate so that
 * evaluating a whole chart is one pass instead of re-reading every earlier reading each time.
 */
export class ManualModeTracker<R extends ManualModeReading = ManualModeReading> {
  private mode: ControlMode | null = null;
  private manualStart: Stamped<R> | null = null;
  private highStart: Stamped<R> | null = null;
  private lastCheck: Stamped<R> | null = null;
  private output: number | null = null;

  constructor(private readonly policy: ResolvedManualPolicy) {}

  apply(reading: R, ms: number): void {
    const mode = reading.controlMode ?? this.mode;
    if (mode === 'manual') {
      if (this.mode !== 'manual') {
        this.manualStart = { reading, ms };
        this.highStart = null;
      }
      const output = reading.heaterOutputPct;
      if (output !== null && output !== undefined) {
        if (output < this.policy.highOutputPct) this.highStart = null;
        else if (this.highStart === null) this.highStart = { reading, ms };
      }
    } else {
      this.manualStart = null;
      this.highStart = null;
    }
    this.mode = mode;
    if (reading.heaterOutputPct !== null && reading.heaterOutputPct !== undefined) this.output = reading.heaterOutputPct;
    // Any charted temperature of the infant (probe or remote site) is a check in manual mode.
    const probe = reading.probeCenti;
    const remote = reading.remoteCenti;
    if ((remote !== null && remote !== undefined) || (probe !== null && probe !== undefined)) {
      this.lastCheck = { reading, ms };
    }
  }

  /** The latest charted heater output, if any. */
  get outputPct(): number | null {
    return this.output;
  }

  get manualSince(): Stamped<R> | null {
    return this.manualStart;
  }

  get highOutputSince(): Stamped<R> | null {
    return this.highStart;
  }

  /** The reading the 15-minute check clock runs from: the later of manual start and last check. */
  get checkClockFrom(): Stamped<R> | null {
    if (this.manualStart === null) return null;
    if (this.lastCheck !== null && this.lastCheck.ms >= this.manualStart.ms) return this.lastCheck;
    return this.manualStart;
  }

  /** Instant after which 'high-output-too-long' holds if nothing changes; null if never. */
  get highOutputLimitAt(): number | null {
    return this.highStart === null ? null : this.highStart.ms + this.policy.highOutputMs;
  }

  /** Instant after which 'no-check-in-manual' holds if nothing changes; null if never. */
  get checkLimitAt(): number | null {
    const from = this.checkClockFrom;
    return from === null ? null : from.ms + this.policy.checkMs;
  }

  /** The first instant after which some reason holds if nothing changes; null if never. */
  get warningFrom(): number | null {
    const times = [this.highOutputLimitAt, this.checkLimitAt].filter((t): t is number => t !== null);
    return times.length === 0 ? null : Math.min(...times);
  }

  reasonsAt(nowMs: number): ManualModeReason[] {
    const reasons: ManualModeReason[] = [];
    const high = this.highOutputLimitAt;
    if (high !== null && nowMs > high) reasons.push('high-output-too-long');
    const check = this.checkLimitAt;
    if (check !== null && nowMs > check) reasons.push('no-check-in-manual');
    return reasons;
  }
}

function validateReading(reading: ManualModeReading, index: number): number {
  const field = `readings[${index}]`;
  const ms = requireTime(reading?.takenAt, `${field}.takenAt`);
  const mode = reading.controlMode;
  if (mode !== null && mode !== undefined && !isControlMode(mode)) {
    throw new ThermalInputError(`${field}.controlMode`, 'invalid-value', `Unknown control mode: ${String(mode)}`);
  }
  if (reading.heaterOutputPct !== null && reading.heaterOutputPct !== undefined) {
    requireFinite(reading.heaterOutputPct, `${field}.heaterOutputPct`);
  }
  return ms;
}

/**
 * Whether manual mode needs a warning at `now`, from the readings taken up to `now` (any order;
 * sorted here by takenAt, ties kept in the given order; readings after `now` are ignored).
 */
export function manualModeWarning(readings: readonly ManualModeReading[], now: Date, policy: ManualModePolicy = {}): ManualModeWarning {
  const nowMs = requireTime(now, 'now');
  const tracker = new ManualModeTracker(resolveManualPolicy(policy));
  const stamped = readings
    .map((reading, index) => ({ reading, ms: validateReading(reading, index), index }))
    .filter((entry) => entry.ms <= nowMs)
    .sort((a, b) => a.ms - b.ms || a.index - b.index);
  for (const { reading, ms } of stamped) tracker.apply(reading, ms);
  const reasons = tracker.reasonsAt(nowMs);
  const manual = tracker.manualSince;
  const high = tracker.highOutputSince;
  return {
    warning: reasons.length > 0,
    reasons,
    manualSince: manual === null ? null : new Date(manual.ms),
    highOutputSince: high === null ? null : new Date(high.ms),
  };
}
