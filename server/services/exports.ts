import type { Bundle, BundleEntry, CodeableConcept, Observation, Patient } from 'fhir/r4';
import { toCsv } from '../../shared/csv';
import type { ReviewQueueItem } from '../../shared/types/review';
import type { UnitRangeQuery } from '../../shared/schemas/review';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { forbidden, notFound } from '../errors';
import { unitWindow } from './reports';

const c = (centi: number | null) => (centi === null ? null : centi / 100);

export function readingsCsv(ctx: AppContext, query: UnitRangeQuery, actorId: string): string {
  const { sqlite } = ctx.database;
  const w = unitWindow(sqlite, query);
  const rows = sqlite
    .prepare(
      `SELECT r.*, i.display_name, b.label AS bed_label, u.name AS by_name FROM readings r
         JOIN infants i ON i.id = r.infant_id LEFT JOIN beds b ON b.id = i.bed_id JOIN users u ON u.id = r.recorded_by
        WHERE r.unit_id = ? AND r.taken_at >= ? AND r.taken_at < ? ORDER BY r.taken_at, r.recorded_at`,
    )
    .all(w.unit.id, w.fromMs, w.toMs) as Array<Record<string, string | number | null>>;
  sqlite
    .transaction(() => appendAudit(sqlite, { at: ctx.clock.now(), actorId, action: 'export-readings-csv', entityType: 'unit', entityId: w.unit.id, unitId: w.unit.id, after: { ...query, rows: rows.length } }))
    .immediate();
  const iso = (v: unknown) => (typeof v === 'number' ? new Date(v).toISOString() : null);
  return toCsv(
    ['reading_id', 'infant_id', 'infant', 'bed', 'taken_at', 'recorded_at', 'recorded_by', 'probe_c', 'remote_c', 'remote_site', 'air_c', 'set_c', 'control_mode', 'heater_output_pct', 'heart_rate', 'note', 'replaces_id', 'correction_reason', 'entered_in_error'],
    rows.map((r) => [
      r.id as string, r.infant_id as string, r.display_name as string, r.bed_label as string | null, iso(r.taken_at), iso(r.recorded_at), r.by_name as string,
      c(r.probe_centi as number | null), c(r.remote_centi as number | null), r.remote_site as string | null, c(r.air_centi as number | null), c(r.set_centi as number | null),
      r.control_mode as string | null, r.heater_output_pct as number | null, r.heart_rate as number | null, r.note as string | null, r.replaces_id as string | null,
      r.correction_reason as string | null, r.entered_in_error === 1,
    ]),
  );
}

export function flagsCsv(items: ReviewQueueItem[]): string {
  return toCsv(
    ['flag_id', 'kind', 'unit', 'infant', 'bed', 'raised_at', 'shift', 'shift_date', 'nurse', 'summary', 'first_action_at', 'closed_at', 'minutes_to_first_action', 'minutes_to_resolution', 'teaching_notes'],
    items.map((i) => [i.flagId, i.kind, i.unitName, i.infantName, i.bedLabel, i.raisedAt, i.shift, i.shiftDate, i.nurse?.name ?? null, i.summary, i.firstActionAt, i.closedAt, i.minutesToFirstAction, i.minutesToResolution, i.reviewCount]),
  );
}

export const LOINC = 'http://loinc.org';
export const UCUM = 'http://unitsofmeasure.org';
export const SNOMED = 'http://snomed.info/sct';
const OBSERVATION_CATEGORY = 'http://terminology.hl7.org/CodeSystem/observation-category';
/** Our own code system for what no standard code fits (the servo skin probe). */
export const WARMFOLD_CODES = 'urn:warmfold:fhir:observation';

const vitalSigns: CodeableConcept[] = [{ coding: [{ system: OBSERVATION_CATEGORY, code: 'vital-signs', display: 'Vital Signs' }] }];

const SITE_CODES = {
  axilla: { loinc: { code: '8328-7', display: 'Axillary temperature' }, snomed: { code: '91470000', display: 'Axillary region structure' } },
  rectal: { loinc: { code: '8332-9', display: 'Rectal temperature' }, snomed: { code: '34402009', display: 'Rectum structure' } },
} as const;

interface ReadingRow {
  id: string;
  taken_at: number;
  probe_centi: number | null;
  remote_centi: number | null;
  remote_site: 'axilla' | 'rectal' | 'other' | null;
  heart_rate: number | null;
  by_name: string;
}

/**
 * One infant's current readings as a FHIR R4 collection Bundle. The remote site is a body
 * temperature (LOINC 8310-5 with the site's own code and body site); the servo skin probe is its
 * own observation, named by its method, and never coded as a body temperature; heart rate is
 * LOINC 8867-4. Corrected-away and entered-in-error rows are left out.
 */
export function infantFhirBundle(ctx: AppContext, infantId: string, auth: { userId: string; unitIds: string[] }): Bundle {
  const { sqlite } = ctx.database;
  const infant = sqlite.prepare('SELECT id, unit_id, display_name, birth_at FROM infants WHERE id = ?').get(infantId) as
    | { id: string; unit_id: string; display_name: string; birth_at: number }
    | undefined;
  if (!infant) throw notFound('That infant');
  if (!auth.unitIds.includes(infant.unit_id)) throw forbidden('This infant belongs to a unit you are not part of.');
  const readings = sqlite
    .prepare(
      `SELECT r.id, r.taken_at, r.probe_centi, r.remote_centi, r.remote_site, r.heart_rate, u.name AS by_name FROM readings r JOIN users u ON u.id = r.recorded_by
        WHERE r.infant_id = ? AND r.entered_in_error = 0 AND NOT EXISTS (SELECT 1 FROM readings c WHERE c.replaces_id = r.id) ORDER BY r.taken_at`,
    )
    .all(infantId) as ReadingRow[];
  const base = ctx.config.publicUrl;
  const patientRef = `Patient/${infant.id}`;
  const patient: Patient = { resourceType: 'Patient', id: infant.id, name: [{ text: infant.display_name }], birthDate: new Date(infant.birth_at).toISOString().slice(0, 10) };
  const entries: BundleEntry[] = [{ fullUrl: `${base}/fhir/${patientRef}`, resource: patient }];
  const add = (o: Observation) => entries.push({ fullUrl: `${base}/fhir/Observation/${o.id}`, resource: o });
  for (const r of readings) {
    const common = {
      resourceType: 'Observation' as const,
      status: 'final' as const,
      subject: { reference: patientRef },
      effectiveDateTime: new Date(r.taken_at).toISOString(),
      performer: [{ display: r.by_name }],
    };
    if (r.remote_centi !== null) {
      const site = r.remote_site === 'axilla' || r.remote_site === 'rectal' ? SITE_CODES[r.remote_site] : null;
      add({
        ...common,
        id: `${r.id}-remote`,
        category: vitalSigns,
        code: {
          coding: [{ system: LOINC, code: '8310-5', display: 'Body temperature' }, ...(site ? [{ system: LOINC, ...site.loinc }] : [])],
          text: site ? site.loinc.display : 'Body temperature',
        },
        valueQuantity: { value: r.remote_centi / 100, unit: 'Cel', system: UCUM, code: 'Cel' },
        ...(site ? { bodySite: { coding: [{ system: SNOMED, ...site.snomed }] } } : {}),
      });
    }
    if (r.probe_centi !== null) {
      add({
        ...common,
        id: `${r.id}-probe`,
        code: { coding: [{ system: WARMFOLD_CODES, code: 'skin-probe-temperature', display: 'Skin probe temperature (heater servo sensor)' }], text: 'Skin probe temperature' },
        method: { coding: [{ system: WARMFOLD_CODES, code: 'skin-probe', display: 'Skin probe' }], text: 'Skin probe (servo sensor), not a clinical thermometer reading' },
        valueQuantity: { value: r.probe_centi / 100, unit: 'Cel', system: UCUM, code: 'Cel' },
      });
    }
    if (r.heart_rate !== null) {
      add({
        ...common,
        id: `${r.id}-hr`,
        category: vitalSigns,
        code: { coding: [{ system: LOINC, code: '8867-4', display: 'Heart rate' }], text: 'Heart rate' },
        valueQuantity: { value: r.heart_rate, unit: '/min', system: UCUM, code: '/min' },
      });
    }
  }
  sqlite
    .transaction(() => appendAudit(sqlite, { at: ctx.clock.now(), actorId: auth.userId, action: 'export-fhir', entityType: 'infant', entityId: infant.id, unitId: infant.unit_id, after: { observations: entries.length - 1 } }))
    .immediate();
  return { resourceType: 'Bundle', type: 'collection', timestamp: ctx.clock.now().toISOString(), total: undefined, entry: entries };
}
