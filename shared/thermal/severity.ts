/**
 * How serious each flag is: one table that decides the board's order, the "needs attention"
 * filter, the colour, icon and word of a flag, and whether and when it escalates.
 *
 * Severity follows the band or kind of the flag, never the view that shows it:
 * - severe hypothermia (below 32.0 °C, WHO 1997 via Miller 2011) and fever (38.0 °C and over,
 *   Bedside Clinical Guidelines Partnership; a newborn's fever may mean infection) are critical
 *   and escalate at once by default;
 * - moderate hypothermia, heat stress, manual mode beyond its limit, skin-to-skin deviation, a
 *   probe/remote-site gap and an overdue check are urgent and escalate after the unit's delay;
 * - mild cold stress (36.0–36.4 °C) is a caution: it does not escalate unless the unit says so.
 * The delays are the unit's to set (`UnitPolicy.escalationDelays`); the defaults are from memory.
 */

import type { ColdBand } from './bands';

export type Severity = 'critical' | 'urgent' | 'caution';

/** Higher is more severe. */
export const SEVERITY_RANK: Readonly<Record<Severity, number>> = { critical: 3, urgent: 2, caution: 1 };

/** What a flag is, for severity and escalation: its kind, or its band for cold stress. */
export type SeverityClass =
  'severe-hypothermia' | 'moderate-hypothermia' | 'cold-stress' | 'fever' | 'heat-stress' | 'manual-mode' | 'skin-to-skin-deviation' | 'gap' | 'overdue-check';

export interface SeverityRule {
  readonly severity: Severity;
  /**
   * Default minutes a flag of this class may stay open before it escalates: a number, 'unit' for
   * the unit's general `escalationDelayMinutes`, or null for never.
   */
  readonly defaultDelay: number | 'unit' | null;
  /** What the flag is called on a card or in an e-mail. */
  readonly label: string;
}

export const SEVERITY_TABLE: Readonly<Record<SeverityClass, SeverityRule>> = {
  'severe-hypothermia': { severity: 'critical', defaultDelay: 0, label: 'Severe hypothermia' },
  fever: { severity: 'critical', defaultDelay: 0, label: 'Fever' },
  'moderate-hypothermia': { severity: 'urgent', defaultDelay: 'unit', label: 'Moderate hypothermia' },
  'heat-stress': { severity: 'urgent', defaultDelay: 'unit', label: 'Heat stress' },
  'manual-mode': { severity: 'urgent', defaultDelay: 'unit', label: 'Manual mode beyond its limit' },
  'skin-to-skin-deviation': { severity: 'urgent', defaultDelay: 'unit', label: 'Skin-to-skin deviation' },
  gap: { severity: 'urgent', defaultDelay: 'unit', label: 'Probe and remote site apart' },
  'overdue-check': { severity: 'urgent', defaultDelay: 'unit', label: 'Remote-site check overdue' },
  'cold-stress': { severity: 'caution', defaultDelay: null, label: 'Cold stress' },
};

export const SEVERITY_CLASSES = Object.keys(SEVERITY_TABLE) as SeverityClass[];

/** The word a screen shows beside a flag of this severity. */
export const SEVERITY_WORDS: Readonly<Record<Severity, string>> = {
  critical: 'Critical',
  urgent: 'Needs attention',
  caution: 'Watch',
};

/** Critical and urgent flags put a bed under "needs attention"; a caution does not. */
export function needsAttention(severity: Severity | null | undefined): boolean {
  return severity === 'critical' || severity === 'urgent';
}

export function worseSeverity(a: Severity | null, b: Severity | null): Severity | null {
  if (a === null) return b;
  if (b === null) return a;
  return SEVERITY_RANK[b] > SEVERITY_RANK[a] ? b : a;
}

/** The class of a flag from its kind and (for cold stress) its worst band. */
export function severityClassOf(kind: string, detail: unknown): SeverityClass {
  if (kind === 'cold-stress') {
    const band = (detail as { band?: ColdBand } | null)?.band;
    return band === 'severe-hypothermia' || band === 'moderate-hypothermia' ? band : 'cold-stress';
  }
  if (kind in SEVERITY_TABLE) return kind as SeverityClass;
  return 'gap';
}

export function severityOf(kind: string, detail: unknown): Severity {
  return SEVERITY_TABLE[severityClassOf(kind, detail)].severity;
}

/**
 * Minutes after reaching its severity that an open flag of this class escalates, or null for
 * never: the unit's own number for the class when it set one, else the table's default.
 */
export function escalationDelayOf(cls: SeverityClass, policy: { escalationDelayMinutes: number; escalationDelays?: Partial<Record<SeverityClass, number | null>> }): number | null {
  const own = policy.escalationDelays?.[cls];
  if (own !== undefined) return own;
  const fallback = SEVERITY_TABLE[cls].defaultDelay;
  return fallback === 'unit' ? policy.escalationDelayMinutes : fallback;
}
