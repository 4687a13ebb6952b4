/**
 * Temperature bands for the remote site (axillary or rectal).
 *
 * WHO, Thermal protection of the newborn: a practical guide (1997), as quoted by Miller, Lee
 * and Gould, J Perinatol 2011; also NHS Greater Glasgow & Clyde, Thermal care of the neonate.
 * The published bands are given to one decimal (36.0–36.4, 36.5–37.5); on hundredths they are
 * read as half-open intervals so that every value has exactly one band:
 *   below 32.00 severe | [32.00, 36.00) moderate | [36.00, 36.50) cold stress |
 *   [36.50, 37.50] normal | above 37.50 hyperthermia.
 * So 36.45 is cold stress and 37.50 is normal.
 */

import { requireInteger } from './errors';

export type TemperatureBand = 'severe-hypothermia' | 'moderate-hypothermia' | 'cold-stress' | 'normal' | 'hyperthermia';

export interface BandInfo {
  readonly band: TemperatureBand;
  readonly label: string;
  /** Lowest value in the band (hundredths of °C, inclusive), or null for no lower bound. */
  readonly minCenti: number | null;
  /** Highest value in the band (inclusive), or null for no upper bound. */
  readonly maxCenti: number | null;
}

/** Lowest normal remote-site temperature, 36.5 °C (WHO 1997 via Miller 2011). */
export const NORMAL_MIN_CENTI = 3650;
/** Highest normal remote-site temperature, 37.5 °C (WHO 1997 via Miller 2011; NHS GG&C). */
export const NORMAL_MAX_CENTI = 3750;
/** Below 36.0 °C is moderate hypothermia (WHO 1997 via Miller 2011). */
export const MODERATE_BELOW_CENTI = 3600;
/** Below 32.0 °C is severe hypothermia (WHO 1997 via Miller 2011). */
export const SEVERE_BELOW_CENTI = 3200;

/** Coldest first; the order is also the order of severity for the cold bands. */
export const TEMPERATURE_BANDS: readonly BandInfo[] = [
  {
    band: 'severe-hypothermia',
    label: 'Severe hypothermia',
    minCenti: null,
    maxCenti: SEVERE_BELOW_CENTI - 1,
  },
  {
    band: 'moderate-hypothermia',
    label: 'Moderate hypothermia',
    minCenti: SEVERE_BELOW_CENTI,
    maxCenti: MODERATE_BELOW_CENTI - 1,
  },
  {
    band: 'cold-stress',
    label: 'Cold stress (mild hypothermia)',
    minCenti: MODERATE_BELOW_CENTI,
    maxCenti: NORMAL_MIN_CENTI - 1,
  },
  { band: 'normal', label: 'Normal', minCenti: NORMAL_MIN_CENTI, maxCenti: NORMAL_MAX_CENTI },
  { band: 'hyperthermia', label: 'Hyperthermia', minCenti: NORMAL_MAX_CENTI + 1, maxCenti: null },
];

export const BAND_LABELS: Readonly<Record<TemperatureBand, string>> = Object.fromEntries(TEMPERATURE_BANDS.map((info) => [info.band, info.label])) as Record<
  TemperatureBand,
  string
>;

export function temperatureBand(centi: number): TemperatureBand {
  const value = requireInteger(centi, 'centi');
  if (value < SEVERE_BELOW_CENTI) return 'severe-hypothermia';
  if (value < MODERATE_BELOW_CENTI) return 'moderate-hypothermia';
  if (value < NORMAL_MIN_CENTI) return 'cold-stress';
  if (value <= NORMAL_MAX_CENTI) return 'normal';
  return 'hyperthermia';
}

export type ColdBand = Extract<TemperatureBand, 'cold-stress' | 'moderate-hypothermia' | 'severe-hypothermia'>;

export function isColdBand(band: TemperatureBand): band is ColdBand {
  return band === 'cold-stress' || band === 'moderate-hypothermia' || band === 'severe-hypothermia';
}

const COLD_SEVERITY: Readonly<Record<ColdBand, number>> = {
  'cold-stress': 1,
  'moderate-hypothermia': 2,
  'severe-hypothermia': 3,
};

/** The colder of two cold bands (used to keep the worst band while a cold flag is open). */
export function worseColdBand(a: ColdBand, b: ColdBand): ColdBand {
  return COLD_SEVERITY[b] > COLD_SEVERITY[a] ? b : a;
}

export type FeverBand = 'none' | 'low-grade-fever' | 'fever';

/** 37.6 °C: low-grade fever from here (Bedside Clinical Guidelines Partnership, axillary). */
export const LOW_GRADE_FEVER_MIN_CENTI = 3760;
/** 38.0 °C and over: fever (Bedside Clinical Guidelines Partnership, axillary). */
export const FEVER_MIN_CENTI = 3800;

/**
 * Axillary fever bands (Bedside Clinical Guidelines Partnership): 37.6–37.9 low-grade fever,
 * 38.0 and over fever; on hundredths [37.60, 38.00) and ≥ 38.00. 37.51–37.59 is above the
 * normal band (hyperthermia) but not a fever in this scheme.
 */
export function feverBand(centi: number): FeverBand {
  const value = requireInteger(centi, 'centi');
  if (value >= FEVER_MIN_CENTI) return 'fever';
  if (value >= LOW_GRADE_FEVER_MIN_CENTI) return 'low-grade-fever';
  return 'none';
}
