/**
 * A stay from admission (hospital number, sex, the probe's place) to discharge (reason and
 * destination, open flags closed with the discharge as their reason), over HTTP on a real SQLite
 * file. The reasons are plain ones (home, a transfer, a ward, death: common practice); a FHIR
 * Encounter carries them as HL7 discharge-disposition codes (HL7 FHIR R4, Encounter.hospitalization).
 */
import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { verifyRecord } from '../../server/record-verify';
import { count, DEMO, makeEnv, type TestEnv } from './helpers';

const SOUTH_CHARGE = 'dawit.bekele@warmfold.test';

let env: TestEnv;
let nurse: string;
let charge: string;
let educator: string;
let southCharge: string;
beforeAll(async () => {
  env = await makeEnv();
  [nurse, charge, educator, southCharge] = await Promise.all([env.signIn(DEMO.nurse), env.signIn(DEMO.charge), env.signIn(DEMO.educator), env.signIn(SOUTH_CHARGE)]);
});
afterAll(() => env.close());

const auth = (token: string) => ({ Authorization: `Bearer ${token}` });
const get = (path: string, token = charge) => request(env.app).get(`/api${path}`).set(auth(token));
const post = (path: string, body: object, token = charge) => request(env.app).post(`/api${path}`).set(auth(token)).send(body);

const openFlagIds = (infantId: string) =>
  (
    env.database.sqlite
      .prepare('SELECT f.id FROM flags f LEFT JOIN flag_resolutions r ON r.flag_id = f.id WHERE f.infant_id = ? AND r.flag_id IS NULL ORDER BY f.id')
      .all(infantId) as { id: string }[]
  ).map((r) => r.id);

describe('admission takes the hospital number and sex', () => {
  it('stores them and exports them (the Patient identifier and gender)', async () => {
    const res = await post('/units/unit-north/infants', {
      bedId: 'bed-N11',
      displayName: 'Baby Wrenfield',
      birthAt: '2026-11-16T02:10:00Z',
      gestationWeeks: 35,
      gestationDays: 1,
      birthWeightGrams: 2400,
      heatSource: 'incubator',
      controlMode: 'air-servo',
      setTemperature: 32.5,
      hospitalNumber: 'RX-204/7',
      sex: 'female',
    });
    expect(res.status).toBe(201);
    const id = res.body.infant.id as string;
    expect(env.database.sqlite.prepare('SELECT hospital_number, sex FROM infants WHERE id = ?').get(id)).toEqual({ hospital_number: 'RX-204/7', sex: 'female' });
    const fhir = JSON.parse((await get(`/exports/infants/${id}/fhir`, educator)).text) as {
      entry: { resource: { resourceType: string; identifier?: { value: string }[]; gender?: string } }[];
    };
    const patient = fhir.entry.find((e) => e.resource.resourceType === 'Patient')!.resource;
    expect(patient.identifier?.[0]?.value).toBe('RX-204/7');
    expect(patient.gender).toBe('female');
  });

  it('refuses a hospital number with other characters and an unknown sex, naming the fields', async () => {
    const bad = await post('/units/unit-north/infants', {
      bedId: 'bed-N12',
      displayName: 'Baby Thistlewood',
      birthAt: '2026-11-16T02:10:00Z',
      gestationWeeks: 35,
      gestationDays: 1,
      birthWeightGrams: 2400,
      heatSource: 'incubator',
      controlMode: 'air-servo',
      setTemperature: 32.5,
      hospitalNumber: 'RX 204;7',
      sex: 'boy',
    });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toEqual(expect.objectContaining({ hospitalNumber: expect.any(String), sex: expect.any(String) }));
  });
});

describe('discharge with a reason and a destination', () => {
  it('is the charge nurse of the unit only', async () => {
    expect((await post('/infants/inf-ashgrove/discharge', { reason: 'home' }, nurse)).status).toBe(403);
    expect((await post('/infants/inf-ashgrove/discharge', { reason: 'home' }, southCharge)).status).toBe(403);
    expect((await post('/infants/nobody/discharge', { reason: 'home' })).status).toBe(404);
  });

  it('refuses a discharge without a reason, a transfer without a destination, and a destination for going home, writing nothing', async () => {
    const before = { stays: count(env.database, 'bed_stays'), resolutions: count(env.database, 'flag_resolutions') };
    const none = await post('/infants/inf-ashgrove/discharge', { note: 'Going.' });
    expect([none.status, none.body.error.fields.reason]).toEqual([400, expect.any(String)]);
    const unknown = await post('/infants/inf-ashgrove/discharge', { reason: 'elsewhere' });
    expect([unknown.status, unknown.body.error.fields.reason]).toEqual([400, expect.any(String)]);
    const nowhere = await post('/infants/inf-ashgrove/discharge', { reason: 'transfer' });
    expect([nowhere.status, nowhere.body.error.fields.destination]).toEqual([400, expect.any(String)]);
    const blank = await post('/infants/inf-ashgrove/discharge', { reason: 'transfer', destination: '   ' });
    expect([blank.status, blank.body.error.fields.destination]).toEqual([400, expect.any(String)]);
    const home = await post('/infants/inf-ashgrove/discharge', { reason: 'home', destination: 'Ward 4' });
    expect([home.status, home.body.error.fields.destination]).toEqual([400, expect.any(String)]);
    expect({ stays: count(env.database, 'bed_stays'), resolutions: count(env.database, 'flag_resolutions') }).toEqual(before);
    expect((env.database.sqlite.prepare("SELECT status FROM infants WHERE id = 'inf-ashgrove'").get() as { status: string }).status).toBe('admitted');
  });

  it('closes every open flag with the discharge as the stated reason, and keeps why and where to', async () => {
    // The seeded Baby Ashgrove has an open gap flag.
    const open = openFlagIds('inf-ashgrove');
    expect(open.length).toBeGreaterThan(0);
    env.clock.advanceMinutes(5);
    const res = await post('/infants/inf-ashgrove/discharge', { reason: 'transfer', destination: 'Riverside Children’s Hospital, NICU', note: 'Surgical review.' });
    expect(res.status).toBe(200);
    expect(res.body.closedFlags).toBe(open.length);
    expect(res.body.closed.map((f: { id: string }) => f.id).sort()).toEqual(open);
    expect(res.body.discharge).toEqual({ at: env.clock.now().toISOString(), reason: 'transfer', destination: 'Riverside Children’s Hospital, NICU' });

    expect(openFlagIds('inf-ashgrove')).toEqual([]);
    for (const flagId of open) {
      const resolution = env.database.sqlite.prepare('SELECT how FROM flag_resolutions WHERE flag_id = ?').get(flagId) as { how: string };
      expect(resolution.how).toBe('discharged');
      const closed = env.database.sqlite.prepare("SELECT detail FROM flag_events WHERE flag_id = ? AND event = 'closed'").all(flagId) as { detail: string }[];
      expect(closed).toHaveLength(1);
      expect(JSON.parse(closed[0]!.detail)).toMatchObject({ how: 'discharged', reason: 'discharged' });
      const history = await get(`/flags/${flagId}/history`, nurse);
      expect(history.body.events.at(-1).text).toMatch(/discharge/i);
    }
    expect(env.database.sqlite.prepare("SELECT status, bed_id, discharge_reason, discharge_destination, discharge_note FROM infants WHERE id = 'inf-ashgrove'").get()).toEqual({
      status: 'discharged',
      bed_id: null,
      discharge_reason: 'transfer',
      discharge_destination: 'Riverside Children’s Hospital, NICU',
      discharge_note: 'Surgical review.',
    });
  });

  it('shows the discharge with the stay, refuses charting after it, and answers a second discharge with 409', async () => {
    const detail = await get('/infants/inf-ashgrove', nurse);
    expect(detail.status).toBe(200);
    expect(detail.body.discharge).toEqual({ at: expect.any(String), reason: 'transfer', destination: 'Riverside Children’s Hospital, NICU' });
    // The flowsheet, the stay's record, ends with it.
    const sheet = await get('/infants/inf-ashgrove/flowsheet?hours=24', nurse);
    expect(sheet.status).toBe(200);
    expect(sheet.body.discharge).toEqual(detail.body.discharge);
    expect((await post('/infants/inf-ashgrove/readings', { id: randomUUID(), unit: 'C', probe: 36.6 }, nurse)).status).toBe(409);
    expect((await post('/infants/inf-ashgrove/placement', { id: randomUUID(), position: 'side' }, nurse)).status).toBe(409);
    expect((await post('/infants/inf-ashgrove/discharge', { reason: 'home' })).status).toBe(409);
    const fhir = JSON.parse((await get('/exports/infants/inf-ashgrove/fhir', educator)).text) as {
      entry: { resource: { resourceType: string; status?: string; hospitalization?: { dischargeDisposition?: { coding: { code: string }[]; text: string } } } }[];
    };
    const encounter = fhir.entry.find((e) => e.resource.resourceType === 'Encounter')!.resource;
    expect(encounter.status).toBe('finished');
    expect(encounter.hospitalization?.dischargeDisposition?.coding[0]?.code).toBe('other-hcf');
    expect(encounter.hospitalization?.dischargeDisposition?.text).toMatch(/Riverside/);
  });

  it('takes a discharge home (no destination) and to a ward (named)', async () => {
    const home = await post('/infants/inf-glimmerton/discharge', { reason: 'home' });
    expect(home.status).toBe(200);
    expect(home.body.discharge).toMatchObject({ reason: 'home', destination: null });
    const ward = await post('/infants/inf-glimmerton-b/discharge', { reason: 'ward', destination: 'Ward 4 (postnatal)' });
    expect(ward.status).toBe(200);
    expect(ward.body.discharge).toMatchObject({ reason: 'ward', destination: 'Ward 4 (postnatal)' });
  });

  it('keeps every write in the row ledger (audit:verify finds nothing)', () => {
    expect(verifyRecord(env.database.sqlite).findings).toEqual([]);
  });
});
