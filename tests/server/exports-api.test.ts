/**
 * Exports. FHIR checks follow ../shared/REFERENCES.md: LOINC 8310-5 body temperature with 8328-7
 * axillary / 8332-9 rectal, UCUM 'Cel' from http://unitsofmeasure.org, SNOMED CT body sites
 * 91470000 / 34402009 (HL7 FHIR R4 bodytemp profile); heart rate LOINC 8867-4; the skin probe is
 * not a clinical thermometer reading (IEC 60601-2-21 / 2-19 scope notes).
 */
import type { Bundle, Observation } from 'fhir/r4';
import request from 'supertest';
import Papa from 'papaparse';
import { count, DEMO, makeEnv, type TestEnv } from './helpers';
// eslint-disable-next-line @typescript-eslint/no-require-imports
const fhirpath = require('fhirpath') as { evaluate: (resource: unknown, path: string) => unknown[] };

let env: TestEnv;
let educator: string;
let nurse: string;
beforeAll(async () => {
  env = await makeEnv();
  [educator, nurse] = await Promise.all([env.signIn(DEMO.educator), env.signIn(DEMO.nurse)]);
});
afterAll(() => env.close());

const get = (path: string, token: string | null) => {
  const r = request(env.app).get(path).buffer(true);
  return token ? r.set('Authorization', `Bearer ${token}`) : r;
};
const parseCsv = (text: string) => Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true }).data;

describe('readings and flags CSV', () => {
  it("exports the unit's readings for a date range, audited", async () => {
    const audits = count(env.database, 'audit_events');
    const res = await get('/api/exports/readings.csv?unitId=unit-north&from=2026-11-13&to=2026-11-16', educator);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    expect(res.headers['content-disposition']).toMatch(/attachment; filename="readings-2026-11-13-2026-11-16.csv"/);
    const rows = parseCsv(res.text);
    expect(rows.length).toBe((env.database.sqlite.prepare("SELECT COUNT(*) AS n FROM readings WHERE unit_id = 'unit-north'").get() as { n: number }).n);
    expect(rows[0]).toEqual(expect.objectContaining({ infant: expect.stringMatching(/^Baby /), remote_site: expect.any(String) }));
    expect(rows.some((r) => r.remote_c === '36.2')).toBe(true);
    expect(count(env.database, 'audit_events')).toBe(audits + 1);
    const none = parseCsv((await get('/api/exports/readings.csv?unitId=unit-north&from=2020-01-01&to=2020-01-02', educator)).text);
    expect(none).toEqual([]);
  });

  it('exports flags with the queue filters', async () => {
    const res = await get('/api/exports/flags.csv?shift=night&kind=gap', educator);
    expect(res.status).toBe(200);
    const rows = parseCsv(res.text);
    expect(rows.length).toBeGreaterThan(0);
    for (const r of rows) expect([r.kind, r.shift]).toEqual(['gap', 'night']);
  });

  it("validates, and is the educator's", async () => {
    const bad = await get('/api/exports/readings.csv?unitId=unit-north&from=2026-11-16&to=2026-11-01', educator);
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.to).toBeDefined();
    expect((await get('/api/exports/readings.csv?from=2026-11-01&to=2026-11-02', educator)).body.error.fields.unitId).toBeDefined();
    expect((await get('/api/exports/readings.csv?unitId=nowhere&from=2026-11-01&to=2026-11-02', educator)).status).toBe(403);
    expect((await get('/api/exports/readings.csv?unitId=unit-north&from=2026-11-01&to=2026-11-02', nurse)).status).toBe(403);
    expect((await get('/api/exports/readings.csv?unitId=unit-north&from=2026-11-01&to=2026-11-02', null)).status).toBe(401);
  });
});

describe('reports', () => {
  it('answers the figures and tables for a unit and range; each table as CSV', async () => {
    const res = await get('/api/reports?unitId=unit-north&from=2026-11-13&to=2026-11-16', educator);
    expect(res.status).toBe(200);
    const { report, tables } = res.body;
    expect(report.onTime.overall.checks).toBeGreaterThan(10);
    expect(report.onTime.overall.onTime).toBeLessThan(report.onTime.overall.checks);
    expect(report.gapRate.gapFlags).toBeGreaterThan(0);
    expect(report.responseTimes[0].toFirstAction.count).toBeGreaterThan(0);
    expect(report.skinToSkin.sessions).toBe(1);
    expect(tables.map((t: { name: string }) => t.name)).toEqual(['on-time-by-shift', 'on-time-by-day', 'gap-rate', 'response-times', 'skin-to-skin']);
    const csv = await get('/api/reports/tables/on-time-by-shift.csv?unitId=unit-north&from=2026-11-13&to=2026-11-16', educator);
    expect(csv.status).toBe(200);
    expect(parseCsv(csv.text).map((r) => r.shift)).toEqual(['day', 'night', 'all']);
    expect((await get('/api/reports/tables/nope.csv?unitId=unit-north&from=2026-11-13&to=2026-11-16', educator)).status).toBe(400);
    expect((await get('/api/reports?unitId=unit-north&from=2026-11-13', educator)).body.error.fields.to).toBeDefined();
    expect((await get('/api/reports?unitId=unit-north&from=2026-11-13&to=2026-11-16', nurse)).status).toBe(403);
    expect((await get('/api/reports?unitId=unit-north&from=2026-11-13&to=2026-11-16', null)).status).toBe(401);
  });
});

describe('FHIR R4 bundle per infant', () => {
  let bundle: Bundle;
  beforeAll(async () => {
    const res = await get('/api/exports/infants/inf-ashgrove/fhir', educator);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/application\/fhir\+json/);
    bundle = JSON.parse(res.text) as Bundle;
  });

  it('is a collection of one Patient and Observations about them', () => {
    expect(bundle.resourceType).toBe('Bundle');
    expect(fhirpath.evaluate(bundle, "entry.resource.where(resourceType = 'Patient').count()")).toEqual([1]);
    const patientUrl = fhirpath.evaluate(bundle, "entry.where(resource.resourceType = 'Patient').fullUrl");
    expect(patientUrl).toEqual([expect.stringMatching(/^urn:uuid:/)]);
    expect(fhirpath.evaluate(bundle, "entry.resource.where(resourceType = 'Observation').subject.reference.distinct()")).toEqual(patientUrl);
  });

  it('remote-site readings are body temperatures in Cel with the axillary code and body site', () => {
    const temps = fhirpath.evaluate(
      bundle,
      "entry.resource.where(resourceType = 'Observation' and code.coding.where(system = 'http://loinc.org' and code = '8310-5').exists())",
    ) as Observation[];
    expect(temps.length).toBeGreaterThan(5);
    for (const o of temps) {
      expect(fhirpath.evaluate(o, "code.coding.where(system = 'http://loinc.org').code")).toEqual(['8310-5', '8328-7']);
      expect(fhirpath.evaluate(o, 'valueQuantity.system')).toEqual(['http://unitsofmeasure.org']);
      expect(fhirpath.evaluate(o, 'valueQuantity.code')).toEqual(['Cel']);
      expect(fhirpath.evaluate(o, "bodySite.coding.where(system = 'http://snomed.info/sct').code")).toEqual(['91470000']);
      expect(fhirpath.evaluate(o, 'category.coding.code')).toEqual(['vital-signs']);
    }
    // The open gap of the demo: remote site 36.20 °C.
    expect(fhirpath.evaluate(bundle, "entry.resource.where(resourceType = 'Observation' and code.coding.code contains '8310-5').valueQuantity.value")).toContain(36.2);
  });

  it('probe readings are their own observation by method, never a body temperature', () => {
    const probes = fhirpath.evaluate(bundle, "entry.resource.where(resourceType = 'Observation' and method.text.contains('Skin probe'))") as Observation[];
    expect(probes.length).toBeGreaterThan(5);
    for (const o of probes) {
      expect(fhirpath.evaluate(o, "code.coding.where(system = 'http://loinc.org').exists()")).toEqual([false]);
      expect(fhirpath.evaluate(o, 'valueQuantity.code')).toEqual(['Cel']);
    }
    expect(probes.map((p) => p.valueQuantity?.value)).toContain(36.9);
  });

  it('heart rate is LOINC 8867-4 in /min', () => {
    const hr = fhirpath.evaluate(bundle, "entry.resource.where(resourceType = 'Observation' and code.coding.code = '8867-4')") as Observation[];
    expect(hr.length).toBeGreaterThan(5);
    expect(fhirpath.evaluate(hr[0], 'valueQuantity.code')).toEqual(['/min']);
  });

  it('a rectal reading carries 8332-9 and the rectum body site', async () => {
    env.database.sqlite
      .prepare(
        "INSERT INTO readings (id, infant_id, unit_id, taken_at, recorded_at, recorded_by, probe_centi, remote_centi, remote_site, heat_signs, entered_unit) VALUES ('r-rectal', 'inf-ashgrove', 'unit-north', ?, ?, 'u-nurse', NULL, 3710, 'rectal', '[]', 'C')",
      )
      .run(Date.parse('2026-11-16T09:55:00Z'), Date.parse('2026-11-16T09:55:00Z'));
    const b = JSON.parse((await get('/api/exports/infants/inf-ashgrove/fhir', educator)).text) as Bundle;
    const o = fhirpath.evaluate(b, "entry.resource.where(id = 'r-rectal-remote')")[0];
    expect(fhirpath.evaluate(o, 'code.coding.code')).toEqual(['8310-5', '8332-9']);
    expect(fhirpath.evaluate(o, 'bodySite.coding.code')).toEqual(['34402009']);
  });

  it('404 for an unknown infant, 403 for another unit or role, 401 signed out', async () => {
    expect((await get('/api/exports/infants/nobody/fhir', educator)).status).toBe(404);
    expect((await get('/api/exports/infants/inf-ashgrove/fhir', nurse)).status).toBe(403);
    expect((await get('/api/exports/infants/inf-ashgrove/fhir', null)).status).toBe(401);
    env.database.sqlite.prepare("DELETE FROM user_units WHERE user_id = 'u-educator' AND unit_id = 'unit-south'").run();
    try {
      expect((await get('/api/exports/infants/inf-hartsease/fhir', educator)).status).toBe(403);
    } finally {
      env.database.sqlite.prepare("INSERT INTO user_units (user_id, unit_id) VALUES ('u-educator', 'unit-south')").run();
    }
  });
});

describe('exports a spreadsheet reads as written', () => {
  const raw = (path: string) =>
    get(path, educator)
      .buffer(true)
      .parse((res, cb) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => cb(null, Buffer.concat(chunks)));
      });

  it('starts with the UTF-8 byte-order mark (EF BB BF, Unicode §23.8) and quotes every cell with a comma, semicolon, quote or line break (RFC 4180 §2)', async () => {
    const charge = await env.signIn(DEMO.charge);
    const note = 'Skin "pink"; warm, Inês\nrechecked';
    const res = await request(env.app)
      .post('/api/infants/inf-glimmerton/readings')
      .set('Authorization', `Bearer ${charge}`)
      .send({ id: '0b0f7f4e-8c1d-4a7e-9d51-3f2a4c6e8b10', unit: 'C', probe: 36.6, note, heatSigns: [] });
    expect(res.status).toBe(201);
    const body = (await raw('/api/exports/readings.csv?unitId=unit-north&from=2026-11-16&to=2026-11-16&infantId=inf-glimmerton')).body as Buffer;
    expect([...body.subarray(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    const text = body.toString('utf8');
    expect(text).toContain('"Skin ""pink""; warm, Inês\nrechecked"');
    const rows = parseCsv(text.slice(1));
    expect(rows.find((r) => r.reading_id === '0b0f7f4e-8c1d-4a7e-9d51-3f2a4c6e8b10')?.note).toBe(note);
    for (const r of rows) expect(r.infant_id).toBe('inf-glimmerton');
  });

  it('gives each row the bed at its time, from the bed stays', async () => {
    const charge = await env.signIn(DEMO.charge);
    const before = Date.parse('2026-11-16T10:00:00Z');
    env.clock.set(new Date(before + 60_000));
    try {
      expect((await request(env.app).post('/api/infants/inf-glimmerton-b/move').set('Authorization', `Bearer ${charge}`).send({ bedId: 'bed-N12' })).status).toBe(200);
      env.clock.set(new Date(before + 5 * 60_000));
      expect(
        (
          await request(env.app)
            .post('/api/infants/inf-glimmerton-b/readings')
            .set('Authorization', `Bearer ${charge}`)
            .send({ id: '5d1c2b3a-4e5f-4a6b-8c7d-9e0f1a2b3c4d', unit: 'C', probe: 36.7, heatSigns: [] })
        ).status,
      ).toBe(201);
      const rows = parseCsv((await get('/api/exports/readings.csv?unitId=unit-north&from=2026-11-13&to=2026-11-16&infantId=inf-glimmerton-b', educator)).text.slice(1));
      const beds = new Set(rows.filter((r) => Date.parse(r.taken_at!) < before).map((r) => r.bed));
      expect(beds).toEqual(new Set(['N08']));
      expect(rows.find((r) => r.reading_id === '5d1c2b3a-4e5f-4a6b-8c7d-9e0f1a2b3c4d')?.bed).toBe('N12');
      const stays = env.database.sqlite.prepare("SELECT event FROM bed_stays WHERE infant_id = 'inf-glimmerton-b' ORDER BY at").all();
      expect(stays).toEqual([{ event: 'admitted' }, { event: 'moved' }]);
      expect(() => env.database.sqlite.prepare("UPDATE bed_stays SET bed_id = NULL WHERE infant_id = 'inf-glimmerton-b'").run()).toThrow(/append-only/);
    } finally {
      env.clock.set(new Date(before));
    }
  });

  it('exports every matching flag whatever the page size, with the teaching notes written out', async () => {
    const stored = (
      env.database.sqlite
        .prepare("SELECT COUNT(*) AS n FROM flags WHERE kind IN ('gap', 'overdue-check', 'heat-stress', 'manual-mode', 'cold-stress', 'fever', 'skin-to-skin-deviation')")
        .get() as { n: number }
    ).n;
    const queue = await get('/api/review/queue?status=all&limit=1', educator);
    const flagId = queue.body.items[0].flagId as string;
    expect(
      (
        await request(env.app)
          .post(`/api/review/items/${flagId}/notes`)
          .set('Authorization', `Bearer ${educator}`)
          .send({ note: 'Good catch; recheck within 30 minutes, as the unit policy says.' })
      ).status,
    ).toBe(201);
    const res = await get('/api/exports/flags.csv?limit=1&status=all', educator);
    const rows = parseCsv(res.text.slice(1));
    expect(rows.length).toBe(stored);
    const row = rows.find((r) => r.flag_id === flagId)!;
    expect(row.teaching_note_count).toBe('1');
    expect(row.teaching_notes).toMatch(/Priya Raman: Good catch; recheck within 30 minutes, as the unit policy says\.$/);
  });
});
