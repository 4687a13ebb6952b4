/**
 * Warmfold's fixed lists, their labels and the limits the forms quote. Plain values, no zod:
 * screens import them from here so that showing a label does not pull in the validation
 * library (the web build loads zod only when a form first validates). shared/schemas re-exports
 * each of them, so the server and the schemas keep one source.
 */

export const HEAT_SOURCES = ['radiant-warmer', 'incubator', 'convertible'] as const;
export type HeatSource = (typeof HEAT_SOURCES)[number];
export const CONTROL_MODES = ['skin-servo', 'air-servo', 'manual'] as const;
export type ControlMode = (typeof CONTROL_MODES)[number];
export const REMOTE_SITES = ['axilla', 'rectal', 'other'] as const;
export type RemoteSite = (typeof REMOTE_SITES)[number];
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
