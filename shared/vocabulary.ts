/**
 * Warmfold's fixed lists, their labels and the limits the forms quote. Plain values, no zod:
 * screens import them from here so that showing a label does not pull in the validation
 * library (the web build loads zod only when a form first validates). The schemas, the server,
 * the rules and the screens all take their lists, labels and limits from here; limits on charted
 * values are in shared/thermal/limits.ts and usual ranges in shared/plausibility.ts.
 */

import type { FlagKind } from './thermal/evaluate';

export const HEAT_SOURCES = ['radiant-warmer', 'incubator', 'convertible'] as const;
export type HeatSource = (typeof HEAT_SOURCES)[number];
export const CONTROL_MODES = ['skin-servo', 'air-servo', 'manual'] as const;
export type ControlMode = (typeof CONTROL_MODES)[number];
export const REMOTE_SITES = ['axilla', 'rectal', 'other'] as const;
export type RemoteSite = (typeof REMOTE_SITES)[number];
/** Where a remote-site (body) temperature was taken, as the forms and the charts name it. */
export const REMOTE_SITE_LABELS: Record<RemoteSite, string> = { axilla: 'Axilla', rectal: 'Rectal', other: 'Other site' };
export const HEAT_SIGNS = ['red-skin', 'warm-to-touch', 'sweating', 'irritability', 'fast-breathing'] as const;
export type HeatSign = (typeof HEAT_SIGNS)[number];

/** Administrative sex recorded on admission (FHIR AdministrativeGender: indeterminate is sent as 'other'). */
export const INFANT_SEXES = ['female', 'male', 'indeterminate', 'unknown'] as const;
export type InfantSex = (typeof INFANT_SEXES)[number];
export const INFANT_SEX_LABELS: Record<InfantSex, string> = { female: 'Female', male: 'Male', indeterminate: 'Indeterminate', unknown: 'Not known' };

export const HEAT_SOURCE_LABELS: Record<HeatSource, string> = {
  'radiant-warmer': 'Radiant warmer',
  incubator: 'Incubator',
  convertible: 'Convertible bed',
};

export const CONTROL_MODE_LABELS: Record<ControlMode, string> = {
  'skin-servo': 'Skin servo',
  'air-servo': 'Air servo',
  manual: 'Manual',
};

export const ACTION_KINDS = [
  'checked-probe-contact',
  'checked-cover',
  'moved-probe',
  'adjusted-set-temperature',
  'changed-control-mode',
  'removed-coverings',
  'reduced-heater-output',
  'informed-charge-nurse',
  'informed-medical-team',
  'recorded-check',
  'other',
] as const;
export type ActionKind = (typeof ACTION_KINDS)[number];

export const ACTION_LABELS: Record<ActionKind, string> = {
  'checked-probe-contact': 'Checked probe contact',
  'checked-cover': 'Checked the heat-reflecting cover',
  'moved-probe': 'Moved the probe to another site',
  'adjusted-set-temperature': 'Adjusted the set temperature',
  'changed-control-mode': 'Changed the control mode',
  'removed-coverings': 'Removed extra coverings',
  'reduced-heater-output': 'Reduced heater output',
  'informed-charge-nurse': 'Told the charge nurse',
  'informed-medical-team': 'Told the medical team',
  'recorded-check': 'Recorded the check',
  other: 'Something else (see note)',
};

/** Each flag as the bedside screens name it (the review queue has its own, longer names below). */
export const FLAG_KIND_LABELS: Record<FlagKind, string> = {
  gap: 'Gap flag',
  'overdue-check': 'Check overdue',
  'heat-stress': 'Heat-stress prompt',
  'cold-stress': 'Cold stress',
  'manual-mode': 'Manual mode',
  'skin-to-skin-deviation': 'Skin-to-skin deviation',
  fever: 'Fever',
};

/** The flag kinds the educator's review queue shows. */
export const REVIEW_KINDS = ['gap', 'overdue-check', 'heat-stress', 'manual-mode', 'cold-stress', 'fever', 'skin-to-skin-deviation'] as const;
export type ReviewKind = (typeof REVIEW_KINDS)[number];

export const REVIEW_KIND_LABELS: Record<ReviewKind, string> = {
  gap: 'Gap flag',
  'overdue-check': 'Overdue check',
  'heat-stress': 'Heat-stress prompt',
  'manual-mode': 'Manual-mode warning',
  'cold-stress': 'Cold stress or hypothermia',
  fever: 'Fever',
  'skin-to-skin-deviation': 'Skin-to-skin deviation',
};

export const REVIEW_STATUSES = ['unreviewed', 'reviewed', 'all'] as const;
export type ReviewStatus = (typeof REVIEW_STATUSES)[number];

/** Minutes a reading's time may lag the clock before it counts as a late entry needing a reason. */
export const LATE_ENTRY_MINUTES = 10;
/** Minutes a time may run ahead of the server's clock (phone clocks drift). */
export const FUTURE_TOLERANCE_MINUTES = 2;

/** bcrypt only reads the first 72 bytes: longer passwords are refused, never truncated. */
export const PASSWORD_MIN_LENGTH = 12;
export const PASSWORD_MAX_BYTES = 72;

export const TEACHING_NOTE_MAX = 2000;
export const REVIEW_PAGE_MAX = 500;

/**
 * Where the skin probe sits, whether it is under a heat-reflecting cover, and how the infant
 * lies: settings charted with each reading and on admission, carried forward until changed.
 * Abdomen, or the back or flank when prone, under a heat-reflecting cover (Iowa Neonatology
 * Handbook, "Servocontrol"); the axilla is a local alternative (common practice).
 */
export const PROBE_SITES = ['abdomen', 'back-or-flank', 'axilla', 'other'] as const;
export type ProbeSite = (typeof PROBE_SITES)[number];
export const PROBE_SITE_LABELS: Record<ProbeSite, string> = {
  abdomen: 'Abdomen',
  'back-or-flank': 'Back or flank',
  axilla: 'Axilla',
  other: 'Other site',
};
export const INFANT_POSITIONS = ['supine', 'prone', 'side'] as const;
export type InfantPosition = (typeof INFANT_POSITIONS)[number];
export const INFANT_POSITION_LABELS: Record<InfantPosition, string> = {
  supine: 'On the back (supine)',
  prone: 'On the front (prone)',
  side: 'On the side',
};
/** The cover as a choice: yes or no (null: not charted). */
export const PROBE_COVER_LABELS = { yes: 'Under a heat-reflecting cover', no: 'Not covered' } as const;

/** Current weight on the reading form, grams: the same bounds as a weight change on the board (common practice). */
export const WEIGHT_GRAMS_MIN = 300;
export const WEIGHT_GRAMS_MAX = 8000;
/** Incubator humidity, whole percent of relative humidity: 0–100 by definition. */
export const HUMIDITY_PCT_MIN = 0;
export const HUMIDITY_PCT_MAX = 100;

/** Why an infant left the unit; a transfer names where to, a ward may. */
export const DISCHARGE_REASONS = ['home', 'transfer', 'ward', 'death'] as const;
export type DischargeReason = (typeof DISCHARGE_REASONS)[number];
export const DISCHARGE_REASON_LABELS: Record<DischargeReason, string> = {
  home: 'Home',
  transfer: 'Transfer to another unit or hospital',
  ward: 'To a ward in this hospital',
  death: 'Died',
};
/** The reasons whose destination is written in: required for a transfer, optional for a ward. */
export const DISCHARGE_DESTINATION_REQUIRED: readonly DischargeReason[] = ['transfer'];
export const DISCHARGE_DESTINATION_ALLOWED: readonly DischargeReason[] = ['transfer', 'ward'];

/**
 * How a flag closed (the resolution's `how`), in words that follow "closed": "closed 14:05 by a
 * recheck". A withdrawn flag says "withdrawn" instead.
 */
export const FLAG_CLOSED_HOW_LABELS: Readonly<Record<string, string>> = {
  recheck: 'by a recheck',
  'check-recorded': 'when the check was charted',
  'session-ended': 'when skin-to-skin ended',
  discharged: 'at discharge',
};
