/**
 * The probe's place, charted: over HTTP against the real app on a real SQLite file.
 *
 * Clinical checks and their sources:
 * - a probe on the abdomen of an infant lying prone lies between the infant and the mattress and
 *   reads the mattress: move it to the back or flank (Iowa Neonatology Handbook, "Servocontrol":
 *   flank if prone; common practice);
 * - a probe on the axilla leaves the axilla taken: the remote-site check goes elsewhere, rectal
 *   per unit policy (common practice);
 * - current weight 300–8000 g (common practice, as a weight change on the board); humidity is a
 *   relative humidity, 0–100 % by definition;
 * - body weight in FHIR is LOINC 29463-7 in UCUM `g` (LOINC; HL7 FHIR R4 vital signs).
 */
import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { verifyRecord } from '../../server/record-verify';
import { count, DEMO, makeEnv, type TestEnv } from './helpers';

let env: TestEnv;
let nurse: string;
let charge: string;
let educator: string;
let southNurse: string;
beforeAll(async () => {
  env = await makeEnv();
  [nurse, charge, educator, southNurse] = await Promise.all([env.signIn(DEMO.nurse), env.signIn(DEMO.charge), env.signIn(DEMO.educator), env.signIn(DEMO.southNurse)]);
});
afterAll(() => env.close());

const auth = (token: string) => ({ Authorization: `Bearer ${token}` });
const get = (path: string, token = nurse) => request(env.app).get(`/api${path}`).set(auth(token));
const post = (path: string, body: object, token = nurse) => request(env.app).post(`/api${path}`).set(auth(token)).send(body);

/** The clock moves a minute per write, so each write is later than the one before. */
const tick = (minutes = 1) => env.clock.set(new Date(env.clock.now().getTime() + minutes * 60_000));

const PRONE_PROMPT = 'probe-under-prone-infant';

async function admit(bedId: string, over: Record<string, unknown> = {}): Promise<string> {
  const res = await post(
    '/units/unit-north/infants',
    {
      bedId,
      displayName: `Baby ${bedId}`,
      birthAt: '2026-11-15T22:40:00Z',
      gestationWeeks: 32,
      gestationDays: 3,
      birthWeightGrams: 1720,
      heatSource: 'incubator',
      controlMode: 'skin-servo',
      setTemperature: 36.5,
      ...over,
    },
    charge,
  );
  expect(res.status).toBe(201);
  return res.body.infant.id as string;
}

const placementOf = async (infantId: string) => (await get(`/infants/${infantId}`)).body.defaults.placement;
const storedRow = (infantId: string) =>
  env.database.sqlite.prepare('SELECT probe_site, probe_covered, infant_position, prompt FROM infant_placements WHERE infant_id = ?').get(infantId);

describe('placement on admission and with each reading', () => {
  let infantId: string;
  beforeAll(async () => {
    infantId = await admit('bed-N09', { probeSite: 'abdomen', probeCovered: true, position: 'supine' });
  });

  it('stores the admission placement and shows it, without a prompt, on every view', async () => {
    expect(await placementOf(infantId)).toEqual({ probeSite: 'abdomen', probeCovered: true, position: 'supine', prompt: null });
    expect(storedRow(infantId)).toEqual({ probe_site: 'abdomen', probe_covered: 1, infant_position: 'supine', prompt: null });
    const board = await get('/units/unit-north/board', charge);
    const tile = board.body.beds.find((b: { label: string }) => b.label === 'N09');
    expect(tile.infant.placement).toMatchObject({ probeSite: 'abdomen', probeCovered: true, position: 'supine', prompt: null });
  });

  it('raises the prompt for a probe on the abdomen of a prone infant, stored at write time and read by every view', async () => {
    tick();
    const res = await post(`/infants/${infantId}/readings`, { id: randomUUID(), unit: 'C', probe: 36.4, probeSite: 'abdomen', probeCovered: true, position: 'prone' });
    expect(res.status).toBe(201);
    expect(res.body.reading).toMatchObject({ probeSite: 'abdomen', probeCovered: true, position: 'prone' });
    // Stored (Iowa handbook: flank if prone; it reads the mattress).
    expect(storedRow(infantId)).toMatchObject({ probe_site: 'abdomen', infant_position: 'prone', prompt: PRONE_PROMPT });
    expect((await placementOf(infantId)).prompt).toBe(PRONE_PROMPT);

    const sheet = await get(`/infants/${infantId}/flowsheet?hours=12`);
    expect(sheet.body.infant.placement.prompt).toEqual({ code: PRONE_PROMPT, text: expect.stringMatching(/back or flank/) });
    expect(sheet.body.readings[0]).toMatchObject({ probeSite: 'abdomen', position: 'prone', probeCovered: true });

    const board = await get('/units/unit-north/board', charge);
    expect(board.body.beds.find((b: { label: string }) => b.label === 'N09').infant.placement.prompt.code).toBe(PRONE_PROMPT);

    const handover = await get(`/infants/${infantId}/handover`);
    expect(handover.body.infants[0].settings.placement).toMatchObject({ probeSite: 'abdomen', position: 'prone', prompt: { code: PRONE_PROMPT } });
    const unitHandover = await get('/units/unit-north/handover', charge);
    const mine = unitHandover.body.infants.find((h: { infant: { id: string } }) => h.infant.id === infantId);
    expect(mine.settings.placement.prompt.code).toBe(PRONE_PROMPT);

    const mineList = await get('/infants?unitId=unit-north');
    expect(mineList.body.infants.find((i: { id: string }) => i.id === infantId).placement.prompt.code).toBe(PRONE_PROMPT);
  });

  it('carries the placement forward when a reading charts none, and a late entry never overrides a later placement', async () => {
    tick();
    expect((await post(`/infants/${infantId}/readings`, { id: randomUUID(), unit: 'C', probe: 36.5 })).status).toBe(201);
    expect(await placementOf(infantId)).toMatchObject({ probeSite: 'abdomen', position: 'prone', prompt: PRONE_PROMPT });
    // Taken half a minute after admission (before the prone reading), charted late, on the back.
    const admittedAt = Date.parse((await get(`/infants/${infantId}`)).body.admittedAt);
    const late = await post(`/infants/${infantId}/readings`, {
      id: randomUUID(),
      unit: 'C',
      probe: 36.5,
      position: 'supine',
      takenAt: new Date(admittedAt + 30_000).toISOString(),
      lateReason: 'Charted after the round.',
    });
    expect(late.status).toBe(201);
    expect((await placementOf(infantId)).position).toBe('prone');
  });

  it('clears the prompt when the nurse charts the probe moved to the back', async () => {
    tick();
    const body = { id: randomUUID(), probeSite: 'back-or-flank' };
    const res = await post(`/infants/${infantId}/placement`, body);
    expect(res.status).toBe(201);
    expect(res.body.placement).toMatchObject({ probeSite: 'back-or-flank', probeCovered: true, position: 'prone', prompt: null });
    expect(storedRow(infantId)).toMatchObject({ probe_site: 'back-or-flank', prompt: null });
    // A retry is stored once; the same id with other content is refused.
    const before = count(env.database, 'placement_changes');
    expect((await post(`/infants/${infantId}/placement`, body)).status).toBe(200);
    expect(count(env.database, 'placement_changes')).toBe(before);
    expect((await post(`/infants/${infantId}/placement`, { ...body, probeSite: 'axilla' })).status).toBe(409);
    const sheet = await get(`/infants/${infantId}/flowsheet?hours=12`);
    expect(sheet.body.infant.placement.prompt).toBeNull();
  });

  it('refuses a bad placement change, naming the field, and writes nothing', async () => {
    const before = count(env.database, 'placement_changes');
    const none = await post(`/infants/${infantId}/placement`, { id: randomUUID() });
    expect([none.status, none.body.error.fields.probeSite]).toEqual([400, expect.any(String)]);
    const site = await post(`/infants/${infantId}/placement`, { id: randomUUID(), probeSite: 'forehead' });
    expect([site.status, site.body.error.fields.probeSite]).toEqual([400, expect.any(String)]);
    const future = await post(`/infants/${infantId}/placement`, { id: randomUUID(), position: 'side', at: new Date(env.clock.now().getTime() + 60 * 60_000).toISOString() });
    expect([future.status, future.body.error.fields.at]).toEqual([400, expect.any(String)]);
    expect((await post(`/infants/${infantId}/placement`, { id: randomUUID(), position: 'side' }, educator)).status).toBe(403);
    expect((await post(`/infants/${infantId}/placement`, { id: randomUUID(), position: 'side' }, southNurse)).status).toBe(403);
    expect((await post('/infants/nobody/placement', { id: randomUUID(), position: 'side' })).status).toBe(404);
    expect(count(env.database, 'placement_changes')).toBe(before);
  });

  it('keeps the placement through a correction unless the correction changes it', async () => {
    tick();
    const turned = await post(`/infants/${infantId}/readings`, { id: randomUUID(), unit: 'C', probe: 36.6, probeSite: 'abdomen', position: 'prone' });
    expect(turned.status).toBe(201);
    expect((await placementOf(infantId)).prompt).toBe(PRONE_PROMPT);
    tick();
    // A corrected value leaves the placement alone...
    const value = await post(`/readings/${turned.body.reading.id}/corrections`, { id: randomUUID(), reason: 'corrected-value', note: 'Typo.', values: { unit: 'C', probe: 36.7 } });
    expect(value.status).toBe(201);
    expect(value.body.reading).toMatchObject({ probeSite: 'abdomen', position: 'prone' });
    expect((await placementOf(infantId)).prompt).toBe(PRONE_PROMPT);
    tick();
    // ...and charting the infant as lying on the side clears the prompt.
    const side = await post(`/readings/${value.body.reading.id}/corrections`, {
      id: randomUUID(),
      reason: 'corrected-value',
      note: 'She was on her side.',
      values: { unit: 'C', probe: 36.7, position: 'side' },
    });
    expect(side.status).toBe(201);
    expect(await placementOf(infantId)).toMatchObject({ probeSite: 'abdomen', position: 'side', prompt: null });
    tick();
    // Entered in error: the placement goes back to what was charted before it.
    const error = await post(`/readings/${side.body.reading.id}/corrections`, { id: randomUUID(), reason: 'entered-in-error', note: 'Wrong infant.' });
    expect(error.status).toBe(201);
    expect(await placementOf(infantId)).toMatchObject({ probeSite: 'back-or-flank', position: 'prone', prompt: null });
  });

  it('keeps every write in the row ledger (audit:verify finds nothing)', () => {
    expect(verifyRecord(env.database.sqlite).findings).toEqual([]);
  });
});

describe('a probe on the axilla (common practice: the remote-site check goes elsewhere)', () => {
  let infantId: string;
  beforeAll(async () => {
    infantId = await admit('bed-N10', { probeSite: 'axilla', probeCovered: false, position: 'supine' });
  });

  it('refuses an axillary remote-site temperature charted with the probe on the axilla, naming the remote site', async () => {
    const before = count(env.database, 'readings');
    const same = await post(`/infants/${infantId}/readings`, { id: randomUUID(), unit: 'C', probe: 36.6, remote: 36.8, remoteSite: 'axilla', probeSite: 'axilla' });
    expect([same.status, same.body.error.fields.remoteSite]).toEqual([400, expect.stringMatching(/axilla/)]);
    // The probe's site carried from admission counts too.
    const carried = await post(`/infants/${infantId}/readings`, { id: randomUUID(), unit: 'C', probe: 36.6, remote: 36.8, remoteSite: 'axilla' });
    expect([carried.status, carried.body.error.fields.remoteSite]).toEqual([400, expect.stringMatching(/axilla/)]);
    expect(count(env.database, 'readings')).toBe(before);
  });

  it('takes the remote-site temperature at another site', async () => {
    tick();
    const rectal = await post(`/infants/${infantId}/readings`, { id: randomUUID(), unit: 'C', probe: 36.6, remote: 36.9, remoteSite: 'rectal' });
    expect(rectal.status).toBe(201);
    // With the probe moved to the abdomen, the axilla is free again.
    tick();
    const axilla = await post(`/infants/${infantId}/readings`, { id: randomUUID(), unit: 'C', probe: 36.6, remote: 36.8, remoteSite: 'axilla', probeSite: 'abdomen' });
    expect(axilla.status).toBe(201);
  });
});

describe('"Moved the probe to another site" asks where to', () => {
  const gapOf = async (infantId: string) => {
    const sheet = await get(`/infants/${infantId}/flowsheet?hours=24`);
    return sheet.body.flags.find((f: { kind: string; status: string }) => f.kind === 'gap' && f.status === 'open') as { id: string };
  };

  it('refuses the move without a site, and a site with another action', async () => {
    const gap = await gapOf('inf-ashgrove');
    const before = count(env.database, 'actions');
    const bare = await post(`/flags/${gap.id}/actions`, { id: randomUUID(), kind: 'moved-probe' });
    expect([bare.status, bare.body.error.fields.probeSite]).toEqual([400, expect.any(String)]);
    const other = await post(`/flags/${gap.id}/actions`, { id: randomUUID(), kind: 'checked-cover', probeSite: 'abdomen' });
    expect([other.status, other.body.error.fields.probeSite]).toEqual([400, expect.any(String)]);
    expect(count(env.database, 'actions')).toBe(before);
  });

  it('records the new site as the current placement, and an undo takes it back', async () => {
    expect(await placementOf('inf-ashgrove')).toBeNull();
    tick();
    const gap = await gapOf('inf-ashgrove');
    const moved = await post(`/flags/${gap.id}/actions`, { id: randomUUID(), kind: 'moved-probe', probeSite: 'back-or-flank' });
    expect(moved.status).toBe(201);
    expect(moved.body.action.probeSite).toBe('back-or-flank');
    expect(await placementOf('inf-ashgrove')).toMatchObject({ probeSite: 'back-or-flank' });
    // Moved again to another site within a minute: another action, not a repeated tap.
    tick(0.5);
    const again = await post(`/flags/${gap.id}/actions`, { id: randomUUID(), kind: 'moved-probe', probeSite: 'other' });
    expect(again.status).toBe(201);
    expect(again.body.action.id).not.toBe(moved.body.action.id);
    expect((await placementOf('inf-ashgrove')).probeSite).toBe('other');
    tick();
    const undo = await post(`/flags/${gap.id}/actions/${again.body.action.id}/undo`, { id: randomUUID() });
    expect(undo.status).toBe(201);
    expect((await placementOf('inf-ashgrove')).probeSite).toBe('back-or-flank');
  });
});

describe('current weight and incubator humidity', () => {
  it('stores them with the reading and shows them on the flowsheet', async () => {
    tick();
    const res = await post('/infants/inf-brightwater/readings', { id: randomUUID(), unit: 'C', probe: 36.6, weightGrams: 1085, humidityPct: 70 });
    expect(res.status).toBe(201);
    expect(res.body.reading).toMatchObject({ weightGrams: 1085, humidityPct: 70 });
    const sheet = await get('/infants/inf-brightwater/flowsheet?hours=12');
    expect(sheet.body.readings.find((r: { id: string }) => r.id === res.body.reading.id)).toMatchObject({ weightGrams: 1085, humidityPct: 70 });
  });

  it.each([
    ['weightGrams', 299, 'below 300 g (common practice)'],
    ['weightGrams', 8001, 'above 8000 g (common practice)'],
    ['weightGrams', 1200.5, 'not whole grams'],
    ['humidityPct', -1, 'below 0 % (by definition)'],
    ['humidityPct', 101, 'above 100 % (by definition)'],
    ['humidityPct', 60.5, 'not a whole percentage'],
  ])('refuses %s = %s (%s), naming the field and writing nothing', async (field, value) => {
    const before = count(env.database, 'readings');
    const res = await post('/infants/inf-brightwater/readings', { id: randomUUID(), unit: 'C', probe: 36.6, [field]: value });
    expect([res.status, res.body.error.fields[field]]).toEqual([400, expect.any(String)]);
    expect(count(env.database, 'readings')).toBe(before);
  });

  it('takes the bounds themselves (300 g, 8000 g, 0 %, 100 %)', async () => {
    for (const body of [
      { weightGrams: 300, humidityPct: 0 },
      { weightGrams: 8000, humidityPct: 100 },
    ]) {
      tick();
      expect((await post('/infants/inf-brightwater/readings', { id: randomUUID(), unit: 'C', probe: 36.6, ...body })).status).toBe(201);
    }
  });

  it('exports the weight to FHIR as LOINC 29463-7 in g, and no humidity', async () => {
    const res = await get('/exports/infants/inf-brightwater/fhir', educator);
    expect(res.status).toBe(200);
    const bundle = JSON.parse(res.text) as {
      entry: {
        resource: { resourceType: string; code?: { coding?: { system: string; code: string }[] }; valueQuantity?: { value: number; code: string; system: string } };
      }[];
    };
    const weights = bundle.entry.map((e) => e.resource).filter((r) => r.code?.coding?.some((c) => c.system === 'http://loinc.org' && c.code === '29463-7'));
    expect(weights.map((w) => w.valueQuantity)).toEqual(expect.arrayContaining([{ value: 1085, unit: 'g', system: 'http://unitsofmeasure.org', code: 'g' }]));
    expect(res.text).not.toMatch(/humidity/i);
  });
});
