/** API paths that more than one place builds: the queries, and the early reads a page starts (early-requests.ts). */
const enc = encodeURIComponent;

export const MY_INFANTS_PATH = '/infants/mine';
export const UNIT_INFANTS_PATH = '/infants';

export type FlowsheetHours = 12 | 24 | 72;
/** The window the flowsheet opens with. */
export const FLOWSHEET_FIRST_HOURS: FlowsheetHours = 12;

export const unitInfantsPath = (unitId: string | null) => (unitId ? `${UNIT_INFANTS_PATH}?unitId=${enc(unitId)}` : UNIT_INFANTS_PATH);
export const flowsheetPath = (infantId: string, hours: number) => `/infants/${enc(infantId)}/flowsheet?hours=${hours}`;
