/**
 * The heat-stress prompt.
 *
 * Overheating shows as red or flushed skin, warmth to touch, sweating, irritability and fast
 * breathing (NHS GG&C, Thermal care of the neonate; common practice), a remote-site temperature
 * above the normal band (above 37.5 °C, WHO 1997 via Miller 2011) or a heart rate above 160/min
 * (Duquesne University newborn assessment; Fleming et al., Lancet 2011). Any one of them raises
 * the prompt. The heart rate may not rise in an overheated newborn, so a normal rate never
 * lowers the prompt.
 */

import { requireInteger, requireFinite, ThermalInputError } from './errors';
import { NORMAL_MAX_CENTI } from './bands';

export type HeatStressSign = 'red-skin' | 'warm-to-touch' | 'sweating' | 'irritability' | 'fast-breathing';

export interface HeatStressSignInfo {
  readonly sign: HeatStressSign;
  readonly label: string;
}

/** The signs a nurse can tick, in the order the form shows them. */
export const HEAT_STRESS_SIGNS: readonly HeatStressSignInfo[] = [
  { sign: 'red-skin', label: 'Red or flushed skin' },
  { sign: 'warm-to-touch', label: 'Warm to touch' },
  { sign: 'sweating', label: 'Sweating' },
  { sign: 'irritability', label: 'Irritable or unsettled' },
  { sign: 'fast-breathing', label: 'Fast breathing (over 60 a minute)' },
];

export const HEAT_STRESS_SIGN_LABELS: Readonly<Record<HeatStressSign, string>> = Object.fromEntries(HEAT_STRESS_SIGNS.map((info) => [info.sign, info.label])) as Record<
  HeatStressSign,
  string
>;

const SIGN_ORDER: ReadonlyMap<HeatStressSign, number> = new Map(HEAT_STRESS_SIGNS.map((info, index) => [info.sign, index]));

export function isHeatStressSign(value: unknown): value is HeatStressSign {
  return typeof value === 'string' && SIGN_ORDER.has(value as HeatStressSign);
}

/** Tachycardia is a heart rate over 160/min; exactly 160 is not (Duquesne; Fleming 2011). */
export const HEART_RATE_HIGH_ABOVE = 160;

/**
 * Why the prompt was raised, one entry per cause:
 * - `{ kind: 'sign', sign }` for each sign ticked, in HEAT_STRESS_SIGNS order;
 * - `{ kind: 'remote-above-normal' }` for a remote-site temperature above 37.50 °C;
 * - `{ kind: 'heart-rate-high' }` for a heart rate above 160/min.
 */
export type HeatStressReason = { readonly kind: 'sign'; readonly sign: HeatStressSign } | { readonly kind: 'remote-above-normal' } | { readonly kind: 'heart-rate-high' };

export interface HeatStressInput {
  /** Remote-site temperature in hundredths of °C, if one was taken. */
  readonly remoteCenti?: number | null;
  readonly heartRate?: number | null;
  readonly signs: readonly HeatStressSign[];
}

export interface HeatStressPrompt {
  readonly raised: boolean;
  readonly reasons: HeatStressReason[];
}

/**
 * What to do when the prompt is raised (common practice): short, in working order, and always
 * under the unit's own policy.
 */
export const HEAT_STRESS_CHECKLIST: readonly string[] = [
  'Check the heater: control mode (skin servo, air servo or manual), set temperature and heater output.',
  'Reduce the set temperature as your unit policy directs.',
  'Check the skin probe is on the skin and covered: a loose probe reads low and drives the heater up.',
  'Remove extra coverings, hats or blankets.',
  'Recheck the remote-site temperature in 15–30 minutes.',
  'Inform the nurse in charge or the medical team as your unit policy directs.',
];

export function heatStressPrompt(input: HeatStressInput): HeatStressPrompt {
  const signs = input?.signs ?? [];
  if (!Array.isArray(signs)) {
    throw new ThermalInputError('signs', 'invalid-value', 'signs must be a list');
  }
  const seen = new Set<HeatStressSign>();
  for (const sign of signs as readonly unknown[]) {
    if (!isHeatStressSign(sign)) {
      throw new ThermalInputError('signs', 'invalid-value', `Unknown heat-stress sign: ${String(sign)}`);
    }
    seen.add(sign);
  }
  const reasons: HeatStressReason[] = seen.size === 0 ? [] : [...seen].sort((a, b) => (SIGN_ORDER.get(a) ?? 0) - (SIGN_ORDER.get(b) ?? 0)).map((sign) => ({ kind: 'sign', sign }));
  if (input.remoteCenti !== undefined && input.remoteCenti !== null) {
    if (requireInteger(input.remoteCenti, 'remoteCenti') > NORMAL_MAX_CENTI) {
      reasons.push({ kind: 'remote-above-normal' });
    }
  }
  if (input.heartRate !== undefined && input.heartRate !== null) {
    if (requireFinite(input.heartRate, 'heartRate') > HEART_RATE_HIGH_ABOVE) {
      reasons.push({ kind: 'heart-rate-high' });
    }
  }
  return { raised: reasons.length > 0, reasons };
}
