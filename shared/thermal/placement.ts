/**
 * Where the skin probe sits, judged: one pure module for the reading form (before saving), the
 * server (which stores the infant's current placement with its prompt at write time) and every
 * view (which reads the stored prompt and only puts it into words here).
 *
 * Sources: the probe goes on the abdomen, or on the back or flank when the infant lies prone,
 * under a heat-reflecting cover; never between the infant and the mattress, where it reads the
 * mattress, not the infant (Iowa Neonatology Handbook, "Servocontrol"; common practice). A probe
 * on the axilla leaves the axilla taken for the remote-site check, which must then be taken
 * elsewhere (common practice: rectal per unit policy, or the other axilla where policy allows).
 */
import type { InfantPosition, ProbeSite, RemoteSite } from '../vocabulary';

export interface Placement {
  probeSite: ProbeSite | null;
  probeCovered: boolean | null;
  position: InfantPosition | null;
}

/** The prompts a placement can raise (stored by code; the words come from PLACEMENT_PROMPT_WORDS). */
export const PLACEMENT_PROMPTS = ['probe-under-prone-infant'] as const;
export type PlacementPromptCode = (typeof PLACEMENT_PROMPTS)[number];

export const PLACEMENT_PROMPT_WORDS: Record<PlacementPromptCode, string> = {
  'probe-under-prone-infant': 'The probe is on the abdomen of an infant lying prone: it reads the mattress, not the infant. Move it to the back or flank.',
};

/** Where each rule comes from, shown with the prompt. */
export const PLACEMENT_SOURCES = {
  'probe-under-prone-infant': 'Iowa Neonatology Handbook, "Servocontrol" (flank if prone); common practice',
  'axilla-probe': 'common practice',
} as const;

/**
 * The prompt a placement raises, or null. A probe on the abdomen of an infant charted prone lies
 * between the infant and the mattress: move it to the back or flank. Nothing is judged while the
 * site or the position is not charted.
 */
export function placementPrompt(p: Pick<Placement, 'probeSite' | 'position'>): PlacementPromptCode | null {
  if (p.probeSite === 'abdomen' && p.position === 'prone') return 'probe-under-prone-infant';
  return null;
}

export function placementPromptWords(code: PlacementPromptCode | null | undefined): string | null {
  return code ? (PLACEMENT_PROMPT_WORDS[code] ?? null) : null;
}

/** Said on the form while the probe is on the axilla: the remote-site check goes elsewhere. */
export const AXILLA_PROBE_NOTE =
  'The probe is on the axilla: take the remote-site temperature elsewhere (rectal per unit policy, or the other axilla where unit policy allows, charted as other site).';

/** The error when the remote site would be the axilla the probe already occupies. */
export const AXILLA_TAKEN_ERROR = 'The probe is on the axilla: take the remote-site temperature at another site (rectal per unit policy).';

/** A note for the form when the probe is on the axilla, else null. */
export function axillaProbeNote(probeSite: ProbeSite | null | undefined): string | null {
  return probeSite === 'axilla' ? AXILLA_PROBE_NOTE : null;
}

/**
 * The remote-site check cannot be charted at the axilla while the probe is there: an error for
 * the remote site, or null. (Only when a remote-site temperature is charted.)
 */
export function remoteSiteConflict(probeSite: ProbeSite | null | undefined, remoteSite: RemoteSite | null | undefined, remoteCharted = true): string | null {
  return remoteCharted && probeSite === 'axilla' && remoteSite === 'axilla' ? AXILLA_TAKEN_ERROR : null;
}
