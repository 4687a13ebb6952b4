import type { CreateReadingInput } from '@/shared/schemas/bedside';
import { INFANT_POSITION_LABELS, PROBE_COVER_LABELS, PROBE_SITE_LABELS, type InfantPosition, type ProbeSite } from '@/shared/vocabulary';

/**
 * The reading form's placement settings (probe site, heat-reflecting cover, the infant's
 * position) and its current weight and incubator humidity, as the form holds them, and the words
 * every view uses for a placement. No zod here (placement-form-schema.ts has the checks).
 * The fields are optional: a form that does not show them (a correction) sends nothing, and the
 * server keeps what was charted.
 */
export interface PlacementFormValues {
  probeSite?: ProbeSite | null;
  /** 'yes': under a heat-reflecting cover. */
  probeCovered?: 'yes' | 'no' | null;
  position?: InfantPosition | null;
  /** Current weight in grams, as typed. */
  weight?: string;
  /** Incubator humidity in %, as typed. */
  humidity?: string;
}

export interface PlacementSettings {
  probeSite: ProbeSite | null;
  probeCovered: boolean | null;
  position: InfantPosition | null;
}

/** The form's starting values: the current placement carried forward; weight and humidity are measurements, never prefilled. */
export function placementDefaults(current: PlacementSettings | null | undefined): Required<PlacementFormValues> {
  return {
    probeSite: current?.probeSite ?? null,
    probeCovered: current?.probeCovered == null ? null : current.probeCovered ? 'yes' : 'no',
    position: current?.position ?? null,
    weight: '',
    humidity: '',
  };
}

const WHOLE = /^\d{1,5}$/;

/** A whole number as typed, null when blank, 'invalid' otherwise. */
export function parseWhole(text: string | undefined): number | null | 'invalid' {
  const t = (text ?? '').trim();
  if (t === '') return null;
  return WHOLE.test(t) ? Number(t) : 'invalid';
}

type PlacementBody = Pick<CreateReadingInput, 'probeSite' | 'probeCovered' | 'position' | 'weightGrams' | 'humidityPct'>;

/** The API's fields for the form's values: only those the form holds. */
export function placementBody(v: PlacementFormValues): PlacementBody {
  const out: PlacementBody = {};
  if (v.probeSite !== undefined) out.probeSite = v.probeSite;
  if (v.probeCovered !== undefined) out.probeCovered = v.probeCovered === null ? null : v.probeCovered === 'yes';
  if (v.position !== undefined) out.position = v.position;
  if (v.weight !== undefined) {
    const n = parseWhole(v.weight);
    out.weightGrams = typeof n === 'number' ? n : null;
  }
  if (v.humidity !== undefined) {
    const n = parseWhole(v.humidity);
    out.humidityPct = typeof n === 'number' ? n : null;
  }
  return out;
}

/** "Abdomen, under a heat-reflecting cover · On the front (prone)"; null when nothing is charted. */
export function placementWords(p: PlacementSettings | null | undefined): string | null {
  if (!p) return null;
  const probe = p.probeSite
    ? `Probe on the ${p.probeSite === 'other' ? 'other site' : PROBE_SITE_LABELS[p.probeSite].toLowerCase()}${p.probeCovered == null ? '' : p.probeCovered ? ', under a heat-reflecting cover' : ', not covered'}`
    : p.probeCovered == null
      ? null
      : PROBE_COVER_LABELS[p.probeCovered ? 'yes' : 'no'];
  const parts = [probe, p.position ? INFANT_POSITION_LABELS[p.position] : null].filter(Boolean);
  return parts.length ? parts.join(' · ') : null;
}

/** Short words for a grid cell or a tile: "Abdomen, covered · prone". */
export function placementShort(p: PlacementSettings | null | undefined): string | null {
  if (!p) return null;
  const site = p.probeSite ? PROBE_SITE_LABELS[p.probeSite] : null;
  const cover = p.probeCovered == null ? null : p.probeCovered ? 'covered' : 'not covered';
  const position = p.position ? { supine: 'supine', prone: 'prone', side: 'on the side' }[p.position] : null;
  const probe = [site, cover].filter(Boolean).join(', ');
  const parts = [probe || null, position].filter(Boolean);
  return parts.length ? parts.join(' · ') : null;
}
