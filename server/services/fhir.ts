/**
 * FHIR R4 exports a receiving system can reconcile.
 *
 * Each reading chain (the first row and the corrections that replace it) is one logical
 * Observation per measure: its id and its identifier (a Warmfold system plus the chain's first
 * reading id) stay the same across corrections, `meta.versionId` counts the versions, and the
 * status says what happened: `final`, `corrected` (a value or the time changed), `amended`
 * (information was only added) or `entered-in-error`. Each infant's stay is an Encounter whose
 * locations are the beds with their periods (from the bed stays). Resources reference each other by
 * `urn:uuid:` full URLs inside the Bundle, so every reference resolves without a server.
 */
import type { Bundle, BundleEntry, CodeableConcept, Encounter, Observation, Patient } from 'fhir/r4';
import { createHash } from 'node:crypto';
import { and, asc, eq, gte, inArray, lt } from 'drizzle-orm';
import { alias } from 'drizzle-orm/sqlite-core';
import type { Db } from '../../db/client';
import { beds, bedStays, infants, readings, units, users } from '../../db/schema';
import { localDateOf } from './review';

export const LOINC = 'http://loinc.org';
export const UCUM = 'http://unitsofmeasure.org';
export const SNOMED = 'http://snomed.info/sct';
const OBSERVATION_CATEGORY = 'http://terminology.hl7.org/CodeSystem/observation-category';
const IDENTIFIER_TYPE = 'http://terminology.hl7.org/CodeSystem/v2-0203';
const BIRTH_TIME = 'http://hl7.org/fhir/StructureDefinition/patient-birthTime';
/** Our own code system for what no standard code fits (the servo skin probe). */
export const WARMFOLD_CODES = 'urn:warmfold:fhir:observation';
/** Identifier systems: one per measure, the value is the id of the chain's first reading. */
export const READING_IDENTIFIER = {
  remote: 'urn:warmfold:fhir:reading:remote-site-temperature',
  probe: 'urn:warmfold:fhir:reading:skin-probe-temperature',
  hr: 'urn:warmfold:fhir:reading:heart-rate',
  weight: 'urn:warmfold:fhir:reading:body-weight',
} as const;
export const HOSPITAL_NUMBER_SYSTEM = 'urn:warmfold:fhir:hospital-number';

const vitalSigns: CodeableConcept[] = [{ coding: [{ system: OBSERVATION_CATEGORY, code: 'vital-signs', display: 'Vital Signs' }] }];

const SITE_CODES = {
  axilla: { loinc: { code: '8328-7', display: 'Axillary temperature' }, snomed: { code: '91470000', display: 'Axillary region structure' } },
  rectal: { loinc: { code: '8332-9', display: 'Rectal temperature' }, snomed: { code: '34402009', display: 'Rectum structure' } },
} as const;

const GENDER = { female: 'female', male: 'male', indeterminate: 'other', unknown: 'unknown' } as const;

/** A name-based UUID (RFC 4122 version 5, SHA-1) in Warmfold's own namespace: the same name gives the same UUID. */
export function stableUuid(name: string): string {
  const namespace = Buffer.from('6f1d3c2a9b8e4f7d8c5a2e1b0d9f8a7c', 'hex');
  const hash = createHash('sha1').update(namespace).update(name, 'utf8').digest();
  hash[6] = (hash[6]! & 0x0f) | 0x50;
  hash[8] = (hash[8]! & 0x3f) | 0x80;
  const h = hash.subarray(0, 16).toString('hex');
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20, 32)}`;
}

const fullUrlOf = (type: string, id: string) => `urn:uuid:${stableUuid(`${type}/${id}`)}`;

/**
 * The measures exported: remote-site and probe temperatures, heart rate and the current weight
 * (LOINC 29463-7 Body weight, in g). Incubator humidity is left out: no LOINC code names the
 * humidity of an incubator's air cleanly.
 */
type Measure = 'remote' | 'probe' | 'hr' | 'weight';

interface Version {
  id: string;
  takenAt: Date;
  recordedAt: Date;
  probeCenti: number | null;
  remoteCenti: number | null;
  remoteSite: 'axilla' | 'rectal' | 'other' | null;
  heartRate: number | null;
  weightGrams: number | null;
  enteredInError: boolean;
  replacesId: string | null;
  uploadId: string | null;
  recorderName: string;
  takerName: string | null;
}

/** The chains of an infant's readings: first row first, each correction after the row it replaces. */
export function chainsOf(rows: Version[]): Version[][] {
  const byId = new Map(rows.map((r) => [r.id, r]));
  const next = new Map<string, Version>();
  for (const r of rows) if (r.replacesId && byId.has(r.replacesId)) next.set(r.replacesId, r);
  const chains: Version[][] = [];
  for (const root of rows) {
    if (root.replacesId && byId.has(root.replacesId)) continue;
    const chain = [root];
    for (let c = next.get(root.id); c && chain.length < 1000; c = next.get(c.id)) chain.push(c);
    chains.push(chain);
  }
  return chains;
}

const valueOf = (v: Version, m: Measure) => (m === 'remote' ? v.remoteCenti : m === 'probe' ? v.probeCenti : m === 'weight' ? v.weightGrams : v.heartRate);

/** The status of one measure across a chain's versions. */
export function statusOf(chain: Version[], m: Measure): Observation['status'] {
  const tip = chain[chain.length - 1]!;
  if (tip.enteredInError || valueOf(tip, m) === null) return 'entered-in-error';
  if (chain.length === 1) return 'final';
  const present = chain.filter((v) => valueOf(v, m) !== null);
  const changed = present.some((v) => valueOf(v, m) !== valueOf(tip, m) || v.takenAt.getTime() !== tip.takenAt.getTime() || (m === 'remote' && v.remoteSite !== tip.remoteSite));
  if (changed) return 'corrected';
  return present.length < chain.length ? 'amended' : 'final';
}

/**
 * The stay as an Encounter whose locations are the beds, each with the period the infant lay
 * there (from the append-only bed stays), so a receiver finds the bed at any Observation's time.
 */
function encounterFor(db: Db, infant: typeof infants.$inferSelect, unitName: string, patientUrl: string): Encounter {
  const stays = db
    .select({ at: bedStays.at, label: beds.label })
    .from(bedStays)
    .leftJoin(beds, eq(beds.id, bedStays.bedId))
    .where(eq(bedStays.infantId, infant.id))
    .orderBy(asc(bedStays.at), asc(bedStays.id))
    .all();
  const locations: NonNullable<Encounter['location']> = [];
  stays.forEach((stay, i) => {
    if (!stay.label) return;
    const end = stays[i + 1]?.at;
    locations.push({
      location: { display: `${unitName}, bed ${stay.label}` },
      status: end ? 'completed' : 'active',
      period: { start: stay.at.toISOString(), ...(end ? { end: end.toISOString() } : {}) },
    });
  });
  return {
    resourceType: 'Encounter',
    id: `${infant.id}-stay`,
    status: infant.status === 'discharged' ? 'finished' : 'in-progress',
    class: { system: 'http://terminology.hl7.org/CodeSystem/v3-ActCode', code: 'IMP', display: 'inpatient encounter' },
    subject: { reference: patientUrl },
    period: { start: infant.admittedAt.toISOString(), ...(infant.dischargedAt ? { end: infant.dischargedAt.toISOString() } : {}) },
    ...(locations.length ? { location: locations } : {}),
    ...(infant.dischargeReason ? { hospitalization: { dischargeDisposition: dischargeDisposition(infant.dischargeReason, infant.dischargeDestination) } } : {}),
  };
}

/** The discharge's reason in HL7's discharge-disposition codes (a ward in the same hospital has none of its own: other). */
const DISCHARGE_DISPOSITION = {
  home: { code: 'home', display: 'Home' },
  transfer: { code: 'other-hcf', display: 'Other healthcare facility' },
  ward: { code: 'oth', display: 'Other' },
  death: { code: 'exp', display: 'Expired' },
} as const;

function dischargeDisposition(reason: keyof typeof DISCHARGE_DISPOSITION, destination: string | null): CodeableConcept {
  const c = DISCHARGE_DISPOSITION[reason];
  return { coding: [{ system: 'http://terminology.hl7.org/CodeSystem/discharge-disposition', ...c }], text: destination ? `${c.display}: ${destination}` : c.display };
}

function observationFor(chain: Version[], m: Measure, patientUrl: string, encounterUrl: string): Observation | null {
  // The last version that carried this measure gives the value shown (an entered-in-error row keeps the values it withdrew).
  const withValue = [...chain].reverse().find((v) => valueOf(v, m) !== null);
  if (!withValue) return null;
  const root = chain[0]!;
  const tip = chain[chain.length - 1]!;
  const status = statusOf(chain, m);
  const suffix = m === 'hr' ? 'hr' : m;
  const base: Observation = {
    resourceType: 'Observation',
    id: `${root.id}-${suffix}`,
    meta: { versionId: String(chain.length), lastUpdated: tip.recordedAt.toISOString() },
    identifier: [{ use: 'official', system: READING_IDENTIFIER[m], value: root.id }],
    status,
    code: { text: '' },
    subject: { reference: patientUrl },
    encounter: { reference: encounterUrl },
    effectiveDateTime: withValue.takenAt.toISOString(),
    // An imported row that named nobody credits no nurse.
    ...(tip.uploadId === null ? { performer: [{ display: tip.recorderName }] } : tip.takerName ? { performer: [{ display: tip.takerName }] } : {}),
    ...(chain.length > 1 ? { note: [{ text: `Version ${chain.length} of this reading; it replaces version ${chain.length - 1} (reading ${chain[chain.length - 2]!.id}).` }] } : {}),
  };
  if (m === 'remote') {
    const site = withValue.remoteSite === 'axilla' || withValue.remoteSite === 'rectal' ? SITE_CODES[withValue.remoteSite] : null;
    return {
      ...base,
      category: vitalSigns,
      code: {
        coding: [{ system: LOINC, code: '8310-5', display: 'Body temperature' }, ...(site ? [{ system: LOINC, ...site.loinc }] : [])],
        text: site ? site.loinc.display : 'Body temperature',
      },
      valueQuantity: { value: withValue.remoteCenti! / 100, unit: 'Cel', system: UCUM, code: 'Cel' },
      ...(site ? { bodySite: { coding: [{ system: SNOMED, ...site.snomed }] } } : {}),
    };
  }
  if (m === 'probe') {
    return {
      ...base,
      code: { coding: [{ system: WARMFOLD_CODES, code: 'skin-probe-temperature', display: 'Skin probe temperature (heater servo sensor)' }], text: 'Skin probe temperature' },
      method: { coding: [{ system: WARMFOLD_CODES, code: 'skin-probe', display: 'Skin probe' }], text: 'Skin probe (servo sensor), not a clinical thermometer reading' },
      valueQuantity: { value: withValue.probeCenti! / 100, unit: 'Cel', system: UCUM, code: 'Cel' },
    };
  }
  if (m === 'weight') {
    return {
      ...base,
      category: vitalSigns,
      code: { coding: [{ system: LOINC, code: '29463-7', display: 'Body weight' }], text: 'Body weight' },
      valueQuantity: { value: withValue.weightGrams!, unit: 'g', system: UCUM, code: 'g' },
    };
  }
  return {
    ...base,
    category: vitalSigns,
    code: { coding: [{ system: LOINC, code: '8867-4', display: 'Heart rate' }], text: 'Heart rate' },
    valueQuantity: { value: withValue.heartRate!, unit: '/min', system: UCUM, code: '/min' },
  };
}

/**
 * A collection Bundle: one Patient per infant and the Observations of their reading chains.
 * With a window, a chain is included when any of its versions was taken inside it.
 */
export function fhirBundle(db: Db, infantIds: string[], now: Date, window?: { fromMs: number; toMs: number }): { bundle: Bundle; observations: number } {
  const entries: BundleEntry[] = [];
  let observations = 0;
  if (infantIds.length === 0) return { bundle: { resourceType: 'Bundle', type: 'collection', timestamp: now.toISOString(), entry: [] }, observations };
  const recorder = alias(users, 'recorder');
  const taker = alias(users, 'taker');
  const people = db
    .select({ infant: infants, unitZone: units.timeZone, unitName: units.name, hospitalName: units.hospitalName })
    .from(infants)
    .innerJoin(units, eq(units.id, infants.unitId))
    .where(inArray(infants.id, infantIds))
    .orderBy(asc(infants.displayName), asc(infants.id))
    .all();
  for (const { infant, unitZone, unitName, hospitalName } of people) {
    const patientUrl = fullUrlOf('Patient', infant.id);
    const patient: Patient = {
      resourceType: 'Patient',
      id: infant.id,
      ...(infant.hospitalNumber
        ? {
            identifier: [
              {
                use: 'usual',
                type: { coding: [{ system: IDENTIFIER_TYPE, code: 'MR', display: 'Medical record number' }] },
                system: HOSPITAL_NUMBER_SYSTEM,
                value: infant.hospitalNumber,
                assigner: { display: hospitalName },
              },
            ],
          }
        : {}),
      name: [{ text: infant.displayName }],
      ...(infant.sex ? { gender: GENDER[infant.sex] } : {}),
      // The date of birth is the calendar date where the infant was born (the unit's zone), with the instant beside it.
      birthDate: localDateOf(infant.birthAt, unitZone),
      _birthDate: { extension: [{ url: BIRTH_TIME, valueDateTime: infant.birthAt.toISOString() }] },
    };
    entries.push({ fullUrl: patientUrl, resource: patient });
    const encounterUrl = fullUrlOf('Encounter', `${infant.id}-stay`);
    entries.push({ fullUrl: encounterUrl, resource: encounterFor(db, infant, unitName, patientUrl) });
    const rows = db
      .select({
        id: readings.id,
        takenAt: readings.takenAt,
        recordedAt: readings.recordedAt,
        probeCenti: readings.probeCenti,
        remoteCenti: readings.remoteCenti,
        remoteSite: readings.remoteSite,
        heartRate: readings.heartRate,
        weightGrams: readings.weightGrams,
        enteredInError: readings.enteredInError,
        replacesId: readings.replacesId,
        uploadId: readings.uploadId,
        recorderName: recorder.name,
        takerName: taker.name,
      })
      .from(readings)
      .innerJoin(recorder, eq(recorder.id, readings.recordedBy))
      .leftJoin(taker, eq(taker.id, readings.takenBy))
      .where(eq(readings.infantId, infant.id))
      .orderBy(asc(readings.takenAt), asc(readings.recordedAt), asc(readings.id))
      .all();
    for (const chain of chainsOf(rows)) {
      if (window && !chain.some((v) => v.takenAt.getTime() >= window.fromMs && v.takenAt.getTime() < window.toMs)) continue;
      for (const m of ['remote', 'probe', 'hr', 'weight'] as const) {
        const o = observationFor(chain, m, patientUrl, encounterUrl);
        if (!o) continue;
        entries.push({ fullUrl: fullUrlOf('Observation', o.id!), resource: o });
        observations += 1;
      }
    }
  }
  return { bundle: { resourceType: 'Bundle', type: 'collection', timestamp: now.toISOString(), entry: entries }, observations };
}

/** The infants of a unit with a reading in the window. */
export function infantsWithReadings(db: Db, unitId: string, window: { fromMs: number; toMs: number }): string[] {
  return db
    .selectDistinct({ id: readings.infantId })
    .from(readings)
    .where(and(eq(readings.unitId, unitId), gte(readings.takenAt, new Date(window.fromMs)), lt(readings.takenAt, new Date(window.toMs))))
    .all()
    .map((r) => r.id);
}
