import type { FlowsheetReading } from '@/shared/types/bedside';
import { PROBE_SITE_LABELS, type InfantPosition } from '@/shared/vocabulary';
import { placementShort } from './placement-values';

/**
 * What a reading charted beside its temperatures, for the flowsheet's rows: the probe's place
 * (site, cover, position), the current weight and the incubator humidity.
 */
export function readingExtras(r: FlowsheetReading): string[] {
  const placement = placementShort({ probeSite: r.probeSite ?? null, probeCovered: r.probeCovered ?? null, position: r.position ?? null });
  return [placement ? `probe ${placement}` : null, r.weightGrams != null ? `weight ${r.weightGrams} g` : null, r.humidityPct != null ? `humidity ${r.humidityPct} %` : null].filter(
    (x): x is string => x !== null,
  );
}

const POSITION_SHORT: Record<InfantPosition, string> = { supine: 'Supine', prone: 'Prone', side: 'Side' };

/** The wide grid's extra rows. */
export const PLACEMENT_GRID_ROWS: [string, (r: FlowsheetReading) => string][] = [
  ['Probe site', (r) => (r.probeSite ? PROBE_SITE_LABELS[r.probeSite] : '—') + (r.probeCovered == null ? '' : r.probeCovered ? ', covered' : ', not covered')],
  ['Position', (r) => (r.position ? POSITION_SHORT[r.position] : '—')],
  ['Weight', (r) => (r.weightGrams == null ? '—' : `${r.weightGrams} g`)],
  ['Humidity', (r) => (r.humidityPct == null ? '—' : `${r.humidityPct} %`)],
];
