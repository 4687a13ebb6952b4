import request from 'supertest';
import { runEscalations } from '../../server/services/escalations';
import type { BoardResponse } from '../../shared/types/board';
import { count, DEMO, makeEnv, type TestEnv } from './helpers';

const SOUTH_CHARGE = 'dawit.bekele@warmfold.test';

let env: TestEnv;
const tokens: Record<string, string> = {};
const auth = (who: keyof typeof tokens) => ({ Authorization: `Bearer ${tokens[who]}` });

beforeAll(async () => {
  env = await makeEnv();
  tokens.charge = await env.signIn(DEMO.charge);
  tokens.nurse = await env.signIn(DEMO.nurse);
  tokens.educator = await env.signIn(DEMO.educator);
  tokens.admin = await env.signIn(DEMO.admin);
  tokens.southNurse = await env.signIn(DEMO.southNurse);
  tokens.southCharge = await env.signIn(SOUTH_CHARGE);
});
afterAll(() => env.close());

const board = async (who = 'charge') => {
  const res = await request(env.app).get('/api/units/unit-north/board').set(auth(who));
  expect(res.status).toBe(200);
  return res.body as BoardResponse;
};

const admitBody = (over: Record<string, unknown> = {}) => ({
  bedId: 'bed-N09',
  displayName: 'Baby Quillfeather',
  birthAt: '2026-11-15T22:40:00Z',
  gestationWeeks: 32,
  gestationDays: 3,
  birthWeightGrams: 1720,
  heatSource: 'incubator',
  controlMode: 'air-servo',
  setTemperature: 33.5,
  ...over,
});

describe('GET /api/units/:unitId/board', () => {
  it('answers every active bed, the most urgent first, in one request', async () => {
    const body = await board();
    expect(body.beds).toHaveLength(14);
    expect(body.beds[0]!.label).toBe('N02');
    expect(body.beds[0]!.infant!.displayName).toBe('Baby Brightwater');
    expect(body.beds[0]!.tier).toBe(0);
    expect(body.beds[0]!.infant!.nextCheck.status).toBe('overdue');
    expect(body.beds[1]!.label).toBe('N01');
    expect(body.beds[1]!.infant!.openFlags.map((f) => f.kind)).toContain('gap');
    const empty = body.beds.filter((b) => b.infant === null);
    expect(empty).toHaveLength(6);
    expect(empty.every((b) => b.tier === 3)).toBe(true);
    expect(body.beds.slice(-6).every((b) => b.infant === null)).toBe(true);
    const tiers = body.beds.map((b) => b.tier);
    expect([...tiers].sort((a, b) => a - b)).toEqual(tiers);
    expect(body.beds.find((b) => b.label === 'N04')!.infant!.skinToSkin).not.toBeNull();
    expect(body.beds.find((b) => b.label === 'N02')!.infant!.assignedNurse!.name).toBe('Nia Okafor');
    expect(body.unit.escalationDelayMinutes).toBe(30);
    expect(body.serverTime).toBe(env.clock.now().toISOString());
    expect(body.nurses.map((n) => n.name)).toEqual(expect.arrayContaining(['Nia Okafor', 'Kofi Mensah', 'Marta Lindqvist']));
  });

  it('is open to the nurse and educator of the unit, and audits the read', async () => {
    const before = count(env.database, 'audit_events');
    await board('nurse');
    await board('educator');
    expect(count(env.database, 'audit_events')).toBe(before + 2);
  });

  it('refuses no token (401), an admin and a nurse of another unit (403)', async () => {
    expect((await request(env.app).get('/api/units/unit-north/board')).status).toBe(401);
    expect((await request(env.app).get('/api/units/unit-north/board').set(auth('admin'))).status).toBe(403);
    const other = await request(env.app).get('/api/units/unit-north/board').set(auth('southNurse'));
    expect(other.status).toBe(403);
    expect(other.body.error.code).toBe('forbidden');
  });
});

describe('POST /api/units/:unitId/infants (admit)', () => {
  it('refuses a nurse, a charge nurse of another unit and no token, writing nothing', async () => {
    const before = count(env.database, 'infants');
    expect((await request(env.app).post('/api/units/unit-north/infants').set(auth('nurse')).send(admitBody())).status).toBe(403);
    expect((await request(env.app).post('/api/units/unit-north/infants').set(auth('southCharge')).send(admitBody())).status).toBe(403);
    expect((await request(env.app).post('/api/units/unit-north/infants').send(admitBody())).status).toBe(401);
    expect(count(env.database, 'infants')).toBe(before);
  });

  it('names the bad fields with 400 and writes nothing', async () => {
    const before = { infants: count(env.database, 'infants'), readings: count(env.database, 'readings'), audit: count(env.database, 'audit_events') };
    const res = await request(env.app)
      .post('/api/units/unit-north/infants')
      .set(auth('charge'))
      .send(admitBody({ displayName: '', gestationDays: 9, setTemperature: 45, extra: 1 }));
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toEqual(expect.arrayContaining(['displayName', 'gestationDays', 'setTemperature', 'extra']));
    expect(count(env.database, 'infants')).toBe(before.infants);
    expect(count(env.database, 'readings')).toBe(before.readings);
    expect(count(env.database, 'audit_events')).toBe(before.audit);
  });

  it('refuses a bed of another unit (400) and a taken bed (409)', async () => {
    const south = await request(env.app)
      .post('/api/units/unit-north/infants')
      .set(auth('charge'))
      .send(admitBody({ bedId: 'bed-S09' }));
    expect(south.status).toBe(400);
    expect(south.body.error.fields).toHaveProperty('bedId');
    const taken = await request(env.app)
      .post('/api/units/unit-north/infants')
      .set(auth('charge'))
      .send(admitBody({ bedId: 'bed-N01' }));
    expect(taken.status).toBe(409);
    expect(taken.body.error.fields).toHaveProperty('bedId');
  });

  it('admits to an empty bed with the initial settings charted', async () => {
    const res = await request(env.app).post('/api/units/unit-north/infants').set(auth('charge')).send(admitBody());
    expect(res.status).toBe(201);
    const tile = (await board()).beds.find((b) => b.label === 'N09')!;
    expect(tile.infant!.displayName).toBe('Baby Quillfeather');
    expect(tile.infant!.controlMode).toBe('air-servo');
    expect(tile.infant!.setCenti).toBe(3350);
    expect(tile.infant!.weightGrams).toBe(1720);
  });
});

describe('move, change and discharge', () => {
  let infantId: string;
  beforeAll(async () => {
    infantId = (await board()).beds.find((b) => b.label === 'N09')!.infant!.id;
  });

  it('moves to an empty bed, refuses a taken bed, an unknown infant and a nurse', async () => {
    expect((await request(env.app).post(`/api/infants/${infantId}/move`).set(auth('nurse')).send({ bedId: 'bed-N10' })).status).toBe(403);
    expect((await request(env.app).post(`/api/infants/${infantId}/move`).send({ bedId: 'bed-N10' })).status).toBe(401);
    expect((await request(env.app).post('/api/infants/no-such-infant/move').set(auth('charge')).send({ bedId: 'bed-N10' })).status).toBe(404);
    const bad = await request(env.app).post(`/api/infants/${infantId}/move`).set(auth('charge')).send({});
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toHaveProperty('bedId');
    expect((await request(env.app).post(`/api/infants/${infantId}/move`).set(auth('charge')).send({ bedId: 'bed-N02' })).status).toBe(409);
    const other = await request(env.app).post('/api/infants/inf-hartsease/move').set(auth('charge')).send({ bedId: 'bed-S09' });
    expect(other.status).toBe(403);
    const ok = await request(env.app).post(`/api/infants/${infantId}/move`).set(auth('charge')).send({ bedId: 'bed-N10' });
    expect(ok.status).toBe(200);
    const beds = (await board()).beds;
    expect(beds.find((b) => b.label === 'N10')!.infant!.id).toBe(infantId);
    expect(beds.find((b) => b.label === 'N09')!.infant).toBeNull();
  });

  it('changes the heat source and weight', async () => {
    const empty = await request(env.app).patch(`/api/infants/${infantId}`).set(auth('charge')).send({});
    expect(empty.status).toBe(400);
    expect(empty.body.error.fields).toHaveProperty('heatSource');
    expect((await request(env.app).patch('/api/infants/nope').set(auth('charge')).send({ weightGrams: 1700 })).status).toBe(404);
    expect((await request(env.app).patch(`/api/infants/${infantId}`).set(auth('nurse')).send({ weightGrams: 1700 })).status).toBe(403);
    const res = await request(env.app).patch(`/api/infants/${infantId}`).set(auth('charge')).send({ heatSource: 'convertible', weightGrams: 1735 });
    expect(res.status).toBe(200);
    expect(res.body.infant).toMatchObject({ heatSource: 'convertible', weightGrams: 1735 });
  });

  it('discharges: the bed frees, open flags close as discharged, the record stays', async () => {
    expect((await request(env.app).post('/api/infants/inf-ashgrove/discharge').set(auth('nurse')).send({})).status).toBe(403);
    expect((await request(env.app).post('/api/infants/nope/discharge').set(auth('charge')).send({})).status).toBe(404);
    const bad = await request(env.app)
      .post('/api/infants/inf-ashgrove/discharge')
      .set(auth('charge'))
      .send({ reason: 'home', note: 'x'.repeat(400) });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toHaveProperty('note');
    const res = await request(env.app).post('/api/infants/inf-ashgrove/discharge').set(auth('charge')).send({ reason: 'home', note: 'Home with parents.' });
    expect(res.status).toBe(200);
    expect(res.body.closedFlags).toBeGreaterThan(0);
    const open = env.database.sqlite
      .prepare("SELECT COUNT(*) AS n FROM flags f LEFT JOIN flag_resolutions r ON r.flag_id = f.id WHERE f.infant_id = 'inf-ashgrove' AND r.flag_id IS NULL")
      .get() as { n: number };
    expect(open.n).toBe(0);
    const how = env.database.sqlite
      .prepare("SELECT DISTINCT how FROM flag_resolutions r JOIN flags f ON f.id = r.flag_id WHERE f.infant_id = 'inf-ashgrove' AND r.how = 'discharged'")
      .all();
    expect(how).toHaveLength(1);
    expect((await board()).beds.find((b) => b.label === 'N01')!.infant).toBeNull();
    const row = env.database.sqlite.prepare("SELECT status, bed_id FROM infants WHERE id = 'inf-ashgrove'").get() as { status: string; bed_id: string | null };
    expect(row).toEqual({ status: 'discharged', bed_id: null });
    expect((await request(env.app).post('/api/infants/inf-ashgrove/discharge').set(auth('charge')).send({ reason: 'home' })).status).toBe(409);
  });
});

describe('nurses and assignments', () => {
  it('lists the unit nurses for the charge nurse only', async () => {
    const res = await request(env.app).get('/api/units/unit-north/nurses').set(auth('charge'));
    expect(res.status).toBe(200);
    expect(res.body.nurses.map((n: { id: string }) => n.id)).toEqual(expect.arrayContaining(['u-nurse', 'u-nurse-2', 'u-nurse-4', 'u-charge']));
    expect(res.body.nurses.map((n: { id: string }) => n.id)).not.toContain('u-nurse-3');
    expect((await request(env.app).get('/api/units/unit-north/nurses').set(auth('nurse'))).status).toBe(403);
    expect((await request(env.app).get('/api/units/unit-north/nurses')).status).toBe(401);
  });

  it('validates, then reassigns for this shift; the board and "my" handover follow the latest row', async () => {
    const before = count(env.database, 'assignments');
    const bad = await request(env.app).post('/api/units/unit-north/assignments').set(auth('charge')).send({ nurseId: 'u-nurse-2', shift: 'later' });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields)).toEqual(expect.arrayContaining(['infantId', 'shift']));
    const south = await request(env.app).post('/api/units/unit-north/assignments').set(auth('charge')).send({ infantId: 'inf-brightwater', nurseId: 'u-nurse-3' });
    expect(south.status).toBe(400);
    expect(south.body.error.fields).toHaveProperty('nurseId');
    expect((await request(env.app).post('/api/units/unit-north/assignments').set(auth('nurse')).send({ infantId: 'inf-brightwater', nurseId: 'u-nurse-2' })).status).toBe(403);
    expect((await request(env.app).post('/api/units/unit-north/assignments').set(auth('southCharge')).send({ infantId: 'inf-brightwater', nurseId: 'u-nurse-2' })).status).toBe(
      403,
    );
    expect(count(env.database, 'assignments')).toBe(before);

    env.clock.advanceMinutes(1);
    const res = await request(env.app).post('/api/units/unit-north/assignments').set(auth('charge')).send({ infantId: 'inf-brightwater', nurseId: 'u-nurse-2' });
    expect(res.status).toBe(201);
    expect(res.body.assignment).toMatchObject({ shift: 'day', shiftDate: '2026-11-16', nurse: { id: 'u-nurse-2', name: 'Kofi Mensah' } });
    expect((await board()).beds.find((b) => b.label === 'N02')!.infant!.assignedNurse!.name).toBe('Kofi Mensah');

    const mine = await request(env.app).get('/api/nurses/me/handover').set(auth('nurse'));
    expect(mine.status).toBe(200);
    expect(mine.body.infants.map((h: { infant: { displayName: string } }) => h.infant.displayName)).not.toContain('Baby Brightwater');

    const next = await request(env.app).post('/api/units/unit-north/assignments').set(auth('charge')).send({ infantId: 'inf-brightwater', nurseId: 'u-nurse-4', shift: 'next' });
    expect(next.status).toBe(201);
    expect(next.body.assignment).toMatchObject({ shift: 'night', shiftDate: '2026-11-16' });
    expect((await board()).beds.find((b) => b.label === 'N02')!.infant!.assignedNurse!.name).toBe('Kofi Mensah');
  });
});

describe('POST /api/escalations/:id/acknowledge', () => {
  let escalationId: string;
  beforeAll(async () => {
    await runEscalations(env.app.context, env.clock.now());
    const tile = (await board()).beds.find((b) => b.label === 'N02')!;
    expect(tile.escalations).toHaveLength(1);
    escalationId = tile.escalations[0]!.id;
  });

  it('refuses a nurse, another unit, no token, an unknown id and a bad note', async () => {
    expect((await request(env.app).post(`/api/escalations/${escalationId}/acknowledge`).set(auth('nurse')).send({})).status).toBe(403);
    expect((await request(env.app).post(`/api/escalations/${escalationId}/acknowledge`).set(auth('southCharge')).send({})).status).toBe(403);
    expect((await request(env.app).post(`/api/escalations/${escalationId}/acknowledge`).send({})).status).toBe(401);
    expect((await request(env.app).post('/api/escalations/nope/acknowledge').set(auth('charge')).send({})).status).toBe(404);
    const bad = await request(env.app).post(`/api/escalations/${escalationId}/acknowledge`).set(auth('charge')).send({ note: 5 });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toHaveProperty('note');
    expect((await board()).beds.find((b) => b.label === 'N02')!.escalations[0]!.acknowledgedAt).toBeNull();
  });

  it('records the acknowledgement once; a second is a conflict', async () => {
    const res = await request(env.app).post(`/api/escalations/${escalationId}/acknowledge`).set(auth('charge')).send({ note: 'Kofi is on his way.' });
    expect(res.status).toBe(200);
    const esc = (await board()).beds.find((b) => b.label === 'N02')!.escalations[0]!;
    expect(esc.acknowledgedBy).toEqual({ id: 'u-charge', name: 'Marta Lindqvist' });
    expect(esc.note).toBe('Kofi is on his way.');
    const again = await request(env.app).post(`/api/escalations/${escalationId}/acknowledge`).set(auth('charge')).send({});
    expect(again.status).toBe(409);
    const audit = env.database.sqlite.prepare("SELECT COUNT(*) AS n FROM audit_events WHERE action = 'escalation-acknowledged' AND entity_id = ?").get(escalationId) as {
      n: number;
    };
    expect(audit.n).toBe(1);
  });
});

describe('GET /api/mailbox (the demo)', () => {
  it("lists the caller's own caught mail newest first, and nobody else's", async () => {
    const insert = env.database.sqlite.prepare('INSERT INTO caught_mail (received_at, from_address, to_addresses, subject, text_body) VALUES (?, ?, ?, ?, ?)');
    insert.run(1000, 'a@x.test', DEMO.charge, 'older', 'one');
    insert.run(2000, 'a@x.test', DEMO.charge, 'newer', 'two');
    insert.run(3000, 'a@x.test', 'b@x.test', 'not hers', 'three');
    const res = await request(env.app).get('/api/mailbox').set(auth('charge'));
    expect(res.status).toBe(200);
    expect(res.body.messages.map((m: { subject: string }) => m.subject)).toEqual(['newer', 'older']);
    const admin = await request(env.app).get('/api/mailbox').set(auth('admin'));
    expect(admin.body.messages.map((m: { subject: string }) => m.subject)).not.toContain('newer');
    expect((await request(env.app).get('/api/admin/mailbox').set(auth('admin'))).status).toBe(404);
    expect((await request(env.app).get('/api/mailbox')).status).toBe(401);
  });
});

describe('handover', () => {
  it("answers one infant's last 12 hours", async () => {
    const res = await request(env.app).get('/api/infants/inf-brightwater/handover').set(auth('nurse'));
    expect(res.status).toBe(200);
    const [h] = res.body.infants;
    expect(h.infant).toMatchObject({ displayName: 'Baby Brightwater', bedLabel: 'N02' });
    expect(h.readings.length).toBeGreaterThan(2);
    const from = Date.parse(h.from);
    expect(h.readings.every((r: { takenAt: string }) => Date.parse(r.takenAt) >= from)).toBe(true);
    expect(h.nextCheck.status).toBe('overdue');
    expect(h.flags.some((f: { kind: string; escalatedAt: string | null }) => f.kind === 'overdue-check' && f.escalatedAt)).toBe(true);
    expect(h.settings.controlMode).toBe('air-servo');
  });

  it('refuses another unit (403), an admin (403), no token (401) and an unknown infant (404)', async () => {
    expect((await request(env.app).get('/api/infants/inf-brightwater/handover').set(auth('southNurse'))).status).toBe(403);
    expect((await request(env.app).get('/api/infants/inf-brightwater/handover').set(auth('admin'))).status).toBe(403);
    expect((await request(env.app).get('/api/infants/inf-brightwater/handover')).status).toBe(401);
    expect((await request(env.app).get('/api/infants/nope/handover').set(auth('nurse'))).status).toBe(404);
    expect((await request(env.app).get('/api/nurses/me/handover').set(auth('admin'))).status).toBe(403);
    expect((await request(env.app).get('/api/nurses/me/handover')).status).toBe(401);
    expect((await request(env.app).get('/api/infants/nope/handover.csv').set(auth('nurse'))).status).toBe(404);
    expect((await request(env.app).get('/api/infants/inf-brightwater/handover.csv').set(auth('southNurse'))).status).toBe(403);
  });

  it('gives all of my infants', async () => {
    const res = await request(env.app).get('/api/nurses/me/handover').set(auth('nurse'));
    expect(res.status).toBe(200);
    expect(res.body.infants.map((h: { infant: { bedLabel: string } }) => h.infant.bedLabel)).toEqual(['N03', 'N04']);
  });

  it("gives the charge nurse the whole unit's handover, bed by bed, and refuses anyone else", async () => {
    const res = await request(env.app).get('/api/units/unit-north/handover').set(auth('charge'));
    expect(res.status).toBe(200);
    const beds = res.body.infants.map((h: { infant: { bedLabel: string } }) => h.infant.bedLabel);
    const admitted = env.database.sqlite
      .prepare("SELECT b.label FROM infants i JOIN beds b ON b.id = i.bed_id WHERE i.unit_id = 'unit-north' AND i.status = 'admitted' ORDER BY b.label")
      .all()
      .map((r) => (r as { label: string }).label);
    expect(admitted.length).toBeGreaterThan(2);
    expect(beds).toEqual(admitted);
    const before = count(env.database, 'audit_events');
    await request(env.app).get('/api/units/unit-north/handover').set(auth('charge'));
    expect(count(env.database, 'audit_events') - before).toBe(admitted.length);
    expect((await request(env.app).get('/api/units/unit-north/handover').set(auth('nurse'))).status).toBe(403);
    expect((await request(env.app).get('/api/units/unit-north/handover').set(auth('southCharge'))).status).toBe(403);
    expect((await request(env.app).get('/api/units/unit-north/handover')).status).toBe(401);
  });

  it('downloads the same readings as CSV', async () => {
    const json = await request(env.app).get('/api/infants/inf-brightwater/handover').set(auth('nurse'));
    const res = await request(env.app).get('/api/infants/inf-brightwater/handover.csv').set(auth('nurse'));
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    expect(res.headers['content-disposition']).toMatch(/attachment; filename="handover-Baby-Brightwater-/);
    const lines = res.text.trim().split(/\r?\n/);
    expect(lines[0]).toMatch(/^taken_at_utc,taken_at_local,bed,infant,probe_C,remote_C/);
    expect(lines).toHaveLength(json.body.infants[0].readings.length + 1);
    expect(lines[1]).toContain('Baby Brightwater');
  });
});
