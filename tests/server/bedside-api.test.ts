import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { count, DEMO, makeEnv, type TestEnv } from './helpers';

let env: TestEnv;
let nurse: string;
let educator: string;
let charge: string;
beforeAll(async () => {
  env = await makeEnv();
  [nurse, educator, charge] = await Promise.all([env.signIn(DEMO.nurse), env.signIn(DEMO.educator), env.signIn(DEMO.charge)]);
});
afterAll(() => env.close());

const auth = (token: string) => ({ Authorization: `Bearer ${token}` });
const get = (path: string, token = nurse) => request(env.app).get(`/api${path}`).set(auth(token));
const post = (path: string, body: object, token = nurse) => request(env.app).post(`/api${path}`).set(auth(token)).send(body);
const reading = (values: Record<string, unknown> = {}) => ({ id: randomUUID(), unit: 'C', probe: 36.8, remote: 36.7, remoteSite: 'axilla', ...values });

describe('GET /api/infants/mine and /api/infants', () => {
  it('needs a signed-in user', async () => {
    expect((await request(env.app).get('/api/infants/mine')).status).toBe(401);
    expect((await request(env.app).get('/api/infants')).status).toBe(401);
  });

  it("lists the nurse's infants for the current shift with their summaries", async () => {
    const res = await get('/infants/mine');
    expect(res.status).toBe(200);
    expect(res.body.infants.map((i: { id: string }) => i.id)).toEqual(['inf-ashgrove', 'inf-brightwater', 'inf-cinderford', 'inf-dunmere']);
    const [ashgrove, brightwater, , dunmere] = res.body.infants;
    expect(ashgrove).toMatchObject({ bedLabel: 'N01', gestationWeeks: 31, correctedWeeks: 31, correctedDays: 6, assignedNurse: { id: 'u-nurse', name: 'Nia Okafor' } });
    expect(ashgrove.openFlags.find((f: { kind: string }) => f.kind === 'gap').id).toEqual(expect.any(String));
    expect(brightwater.nextCheck.status).toBe('overdue');
    expect(dunmere.skinToSkin).toMatchObject({ limitCenti: 50 });
  });

  it('lists the whole unit, and refuses another unit', async () => {
    const res = await get('/infants?unitId=unit-north');
    expect(res.status).toBe(200);
    expect(res.body.infants).toHaveLength(8);
    expect((await get('/infants')).body.infants).toHaveLength(8);
    expect((await get('/infants?unitId=unit-south')).status).toBe(403);
    const bad = await get('/infants?colour=red');
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toHaveProperty('colour');
  });

  it('lets the educator read both units', async () => {
    expect((await get('/infants', educator)).body.infants).toHaveLength(12);
  });
});

describe('GET /api/infants/:id and its flowsheet', () => {
  it('answers one infant with the record defaults, and audits the read', async () => {
    const before = count(env.database, 'audit_events');
    const res = await get('/infants/inf-ashgrove');
    expect(res.status).toBe(200);
    expect(res.body.infant.displayName).toBe('Baby Ashgrove');
    expect(res.body.defaults).toEqual({ controlMode: 'skin-servo', setCenti: 3650, remoteSite: 'axilla', placement: null });
    expect(res.body.timeZone).toBe('Europe/London');
    expect(count(env.database, 'audit_events')).toBe(before + 1);
  });

  it('answers 404 for an unknown infant and 403 for another unit', async () => {
    expect((await get('/infants/inf-nobody')).status).toBe(404);
    expect((await get('/infants/inf-hartsease')).status).toBe(403);
    expect((await get('/infants/inf-hartsease/flowsheet')).status).toBe(403);
    expect((await get('/infants/inf-nobody/flowsheet')).status).toBe(404);
  });

  it('answers the flowsheet for a window, with flags, actions and the policy', async () => {
    const before = count(env.database, 'audit_events');
    const res = await get('/infants/inf-ashgrove/flowsheet?hours=12');
    expect(res.status).toBe(200);
    expect(res.body.hours).toBe(12);
    expect(res.body.readings.length).toBeGreaterThan(3);
    const times = res.body.readings.map((r: { takenAt: string }) => r.takenAt);
    expect([...times].sort().reverse()).toEqual(times);
    const gap = res.body.flags.find((f: { kind: string; status: string }) => f.kind === 'gap' && f.status === 'open');
    expect(gap).toMatchObject({ id: expect.any(String), detail: { gapCenti: 70 } });
    expect(res.body.policy).toMatchObject({ gapLimitCenti: 50, checkIntervalMinutes: 120 });
    expect(res.body.readings[0].recordedBy.name).toBe('Nia Okafor');
    expect(count(env.database, 'audit_events')).toBe(before + 1);
    const week = await get('/infants/inf-ashgrove/flowsheet?hours=72');
    expect(week.body.readings.length).toBeGreaterThan(res.body.readings.length);
  });

  it('refuses a window it does not offer', async () => {
    const res = await get('/infants/inf-ashgrove/flowsheet?hours=5');
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('hours');
  });
});

describe('POST /api/infants/:id/readings', () => {
  it('stores a reading once, and answers a retry with the same reading', async () => {
    const before = count(env.database, 'readings');
    const body = reading();
    const first = await post('/infants/inf-glimmerton/readings', body);
    expect(first.status).toBe(201);
    expect(first.body.reading).toMatchObject({ id: body.id, probeCenti: 3680, remoteCenti: 3670, remoteSite: 'axilla', recordedBy: { id: 'u-nurse' } });
    expect(first.body.created).toBe(true);
    const retry = await post('/infants/inf-glimmerton/readings', body);
    expect(retry.status).toBe(200);
    expect(retry.body.created).toBe(false);
    expect(retry.body.reading).toEqual(first.body.reading);
    expect(count(env.database, 'readings')).toBe(before + 1);
  });

  it('refuses the same id with different content (409)', async () => {
    const body = reading();
    expect((await post('/infants/inf-glimmerton/readings', body)).status).toBe(201);
    const before = count(env.database, 'readings');
    const res = await post('/infants/inf-glimmerton/readings', { ...body, probe: 36.9 });
    expect(res.status).toBe(409);
    expect(res.body.error.fields).toHaveProperty('id');
    expect(count(env.database, 'readings')).toBe(before);
  });

  it.each([
    ['a probe that is not a number', { probe: 'warm' }, 'probe', 400],
    ['a probe outside the hard limits', { probe: 50 }, 'probe', 400],
    ['a °F value read as °C', { probe: 98.6 }, 'probe', 400],
    ['a remote value without its site', { remoteSite: undefined }, 'remoteSite', 400],
    ['no value at all', { probe: null, remote: null, remoteSite: null }, 'probe', 400],
    ['an unknown field', { colour: 'pink' }, 'colour', 400],
    ['a time in the future', { takenAt: '2026-11-16T10:30:00Z' }, 'takenAt', 400],
    ['a late entry without a reason', { takenAt: '2026-11-16T09:30:00Z' }, 'lateReason', 400],
    ['an implausible value not confirmed', { probe: 33.5 }, 'probe', 422],
    ['a heart rate out of range', { heartRate: 400 }, 'heartRate', 400],
    ['a heater output over 100 %', { heaterOutputPct: 120 }, 'heaterOutputPct', 400],
  ])('refuses %s, names the field and writes nothing', async (_name, values, field, status) => {
    const before = [count(env.database, 'readings'), count(env.database, 'audit_events'), count(env.database, 'flags')];
    const res = await post('/infants/inf-glimmerton/readings', reading(values));
    expect(res.status).toBe(status);
    expect(res.body.error.fields).toHaveProperty([field]);
    expect([count(env.database, 'readings'), count(env.database, 'audit_events'), count(env.database, 'flags')]).toEqual(before);
  });

  it('asks for confirmation of an implausible value, then saves it', async () => {
    const body = reading({ probe: 33.5 });
    const ask = await post('/infants/inf-glimmerton/readings', body);
    expect(ask.status).toBe(422);
    expect(ask.body.error.fields.confirmedImplausible).toBe('confirm');
    expect(ask.body.error.fields.probe).toMatch(/usual/);
    const saved = await post('/infants/inf-glimmerton/readings', { ...body, confirmedImplausible: true });
    expect(saved.status).toBe(201);
    expect(saved.body.reading.probeCenti).toBe(3350);
  });

  it('takes a late entry with its reason', async () => {
    const res = await post('/infants/inf-glimmerton/readings', reading({ takenAt: '2026-11-16T09:30:00Z', lateReason: 'Charted after an emergency.' }));
    expect(res.status).toBe(201);
    expect(res.body.reading).toMatchObject({ takenAt: '2026-11-16T09:30:00.000Z', lateReason: 'Charted after an emergency.' });
  });

  it('refuses the educator (403), another unit (403) and an unknown infant (404), writing nothing', async () => {
    const before = count(env.database, 'readings');
    expect((await post('/infants/inf-glimmerton/readings', reading(), educator)).status).toBe(403);
    expect((await post('/infants/inf-hartsease/readings', reading())).status).toBe(403);
    expect((await post('/infants/inf-nobody/readings', reading())).status).toBe(404);
    expect((await request(env.app).post('/api/infants/inf-glimmerton/readings').send(reading())).status).toBe(401);
    expect(count(env.database, 'readings')).toBe(before);
  });

  it('lets the charge nurse chart', async () => {
    expect((await post('/infants/inf-glimmerton/readings', reading(), charge)).status).toBe(201);
  });
});

describe('the gap story: a gap, actions, a recheck that closes the flag', () => {
  it('works in °C', async () => {
    const first = await post('/infants/inf-glimmerton-b/readings', reading({ probe: 36.9, remote: 36.2 }));
    expect(first.status).toBe(201);
    const gap = first.body.openFlags.find((f: { kind: string }) => f.kind === 'gap');
    expect(gap).toMatchObject({ id: expect.any(String), detail: { gapCenti: 70, direction: 'probe-higher' } });
    expect(first.body.raisedFlagIds).toContain(gap.id);

    env.clock.advanceMinutes(2);
    const contact = { id: randomUUID(), kind: 'checked-probe-contact' };
    const a1 = await post(`/flags/${gap.id}/actions`, contact);
    expect(a1.status).toBe(201);
    expect(a1.body.action).toMatchObject({ kind: 'checked-probe-contact', recordedBy: { name: 'Nia Okafor' } });
    expect(a1.body.flag.recheckDueAt).toBe('2026-11-16T10:32:00.000Z');
    const retry = await post(`/flags/${gap.id}/actions`, contact);
    expect(retry.status).toBe(200);
    expect((await post(`/flags/${gap.id}/actions`, { ...contact, kind: 'moved-probe', probeSite: 'back-or-flank' })).status).toBe(409);
    const a2 = await post(`/flags/${gap.id}/actions`, { id: randomUUID(), kind: 'moved-probe', probeSite: 'back-or-flank', note: 'To the left flank.' });
    expect(a2.status).toBe(201);
    expect(count(env.database, `actions WHERE flag_id = '${gap.id}'`)).toBe(2);

    env.clock.advanceMinutes(15);
    const recheck = await post('/infants/inf-glimmerton-b/readings', reading({ probe: 36.6, remote: 36.3 }));
    expect(recheck.status).toBe(201);
    expect(recheck.body.closedFlagIds).toContain(gap.id);
    expect(recheck.body.openFlags.find((f: { kind: string }) => f.kind === 'gap')).toBeUndefined();

    const sheet = await get('/infants/inf-glimmerton-b/flowsheet?hours=12');
    const flag = sheet.body.flags.find((f: { id: string }) => f.id === gap.id);
    expect(flag).toMatchObject({ status: 'closed', closedByReadingId: recheck.body.reading.id });
    expect(flag.actions.map((a: { kind: string }) => a.kind)).toEqual(['checked-probe-contact', 'moved-probe']);
    expect((await post(`/flags/${gap.id}/actions`, { id: randomUUID(), kind: 'checked-cover' })).status).toBe(409);
  });

  it('works in °F: 98.6 and 97.3 °F are 0.72 °C apart', async () => {
    // 0.9 °F apart is exactly 0.5 °C: no flag.
    const exact = await post('/infants/inf-fernhollow/readings', reading({ unit: 'F', probe: 98.6, remote: 97.7 }));
    expect(exact.status).toBe(201);
    expect(exact.body.openFlags.find((f: { kind: string }) => f.kind === 'gap')).toBeUndefined();
    const res = await post('/infants/inf-fernhollow/readings', reading({ unit: 'F', probe: 98.6, remote: 97.3 }));
    expect(res.status).toBe(201);
    expect(res.body.reading).toMatchObject({ probeCenti: 3700, remoteCenti: 3628, enteredUnit: 'F' });
    expect(res.body.openFlags.find((f: { kind: string }) => f.kind === 'gap').detail.gapCenti).toBe(72);
  });

  it('answers 404 for an unknown flag and 403 for another unit or the educator', async () => {
    expect((await post(`/flags/${randomUUID()}/actions`, { id: randomUUID(), kind: 'checked-cover' })).status).toBe(404);
    const south = env.database.sqlite.prepare("SELECT id FROM flags WHERE unit_id = 'unit-south' LIMIT 1").get() as { id: string };
    expect((await post(`/flags/${south.id}/actions`, { id: randomUUID(), kind: 'checked-cover' })).status).toBe(403);
    const north = (await get('/infants/inf-ashgrove')).body.infant.openFlags[0];
    expect((await post(`/flags/${north.id}/actions`, { id: randomUUID(), kind: 'checked-cover' }, educator)).status).toBe(403);
    const bad = await post(`/flags/${north.id}/actions`, { id: 'not-a-uuid', kind: 'danced' });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['id', 'kind']);
  });
});

describe('POST /api/readings/:id/corrections', () => {
  it('keeps every version and shows the current value with its history', async () => {
    const created = await post('/infants/inf-glimmerton/readings', reading({ probe: 36.4, remote: 36.5 }));
    const id = created.body.reading.id;
    const before = count(env.database, 'readings');
    const correction = {
      id: randomUUID(),
      reason: 'corrected-value',
      note: 'Typed the wrong probe value.',
      values: { unit: 'C', probe: 36.6, remote: 36.5, remoteSite: 'axilla', controlMode: 'skin-servo', set: 36.5 },
    };
    const res = await post(`/readings/${id}/corrections`, correction);
    expect(res.status).toBe(201);
    expect(res.body.reading).toMatchObject({ replacesId: id, probeCenti: 3660, correctionReason: 'corrected-value', takenAt: created.body.reading.takenAt });
    expect((await post(`/readings/${id}/corrections`, correction)).status).toBe(200);
    expect(count(env.database, 'readings')).toBe(before + 1);

    const again = await post(`/readings/${id}/corrections`, { ...correction, id: randomUUID() });
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/latest version/);

    const sheet = await get('/infants/inf-glimmerton/flowsheet?hours=12');
    const row = sheet.body.readings.find((r: { rootId: string }) => r.rootId === id);
    expect(row).toMatchObject({ id: correction.id, corrected: true, probeCenti: 3660, correctionNote: 'Typed the wrong probe value.' });
    expect(row.history).toHaveLength(1);
    expect(row.history[0]).toMatchObject({ id, probeCenti: 3640, recordedBy: { name: 'Nia Okafor' } });

    const error = await post(`/readings/${correction.id}/corrections`, { id: randomUUID(), reason: 'entered-in-error', note: 'Wrong infant.' });
    expect(error.status).toBe(201);
    const after = await get('/infants/inf-glimmerton/flowsheet?hours=12');
    expect(after.body.readings.find((r: { rootId: string }) => r.rootId === id)).toBeUndefined();
    expect(after.body.removed.find((r: { rootId: string }) => r.rootId === id).history).toHaveLength(2);
  });

  it('refuses bad input, naming the field, and writes nothing', async () => {
    const created = await post('/infants/inf-glimmerton/readings', reading());
    const id = created.body.reading.id;
    const before = count(env.database, 'readings');
    const noValues = await post(`/readings/${id}/corrections`, { id: randomUUID(), reason: 'corrected-value', note: 'x' });
    expect(noValues.status).toBe(400);
    expect(noValues.body.error.fields).toHaveProperty('values');
    const noNote = await post(`/readings/${id}/corrections`, { id: randomUUID(), reason: 'entered-in-error', note: '' });
    expect(noNote.body.error.fields).toHaveProperty('note');
    const tooHot = await post(`/readings/${id}/corrections`, { id: randomUUID(), reason: 'corrected-value', note: 'x', values: { unit: 'C', probe: 47 } });
    expect(tooHot.status).toBe(400);
    expect(tooHot.body.error.fields).toHaveProperty(['values.probe']);
    expect(count(env.database, 'readings')).toBe(before);
  });

  it('answers 404, 403 (another unit, educator) and 401', async () => {
    const body = { id: randomUUID(), reason: 'entered-in-error', note: 'x' };
    expect((await post(`/readings/${randomUUID()}/corrections`, body)).status).toBe(404);
    const south = env.database.sqlite.prepare("SELECT id FROM readings WHERE unit_id = 'unit-south' LIMIT 1").get() as { id: string };
    expect((await post(`/readings/${south.id}/corrections`, body)).status).toBe(403);
    const north = env.database.sqlite
      .prepare("SELECT id FROM readings r WHERE unit_id = 'unit-north' AND NOT EXISTS (SELECT 1 FROM readings y WHERE y.replaces_id = r.id) LIMIT 1")
      .get() as { id: string };
    expect((await post(`/readings/${north.id}/corrections`, body, educator)).status).toBe(403);
    expect((await request(env.app).post(`/api/readings/${north.id}/corrections`).send(body)).status).toBe(401);
  });
});

describe('skin-to-skin sessions', () => {
  const start = (values: Record<string, unknown> = {}) => ({ id: randomUUID(), unit: 'C', reference: 36.8, limitCenti: 50, carer: 'Parent', ...values });

  it('allows one running session at a time, charts readings in it, and ends it', async () => {
    const running = (await get('/infants/inf-dunmere')).body.infant.skinToSkin;
    expect((await post('/infants/inf-dunmere/skin-to-skin', start())).status).toBe(409);

    const body = start();
    const res = await post('/infants/inf-elderbrook/skin-to-skin', body);
    expect(res.status).toBe(201);
    expect(res.body.session).toMatchObject({ id: body.id, referenceCenti: 3680, limitCenti: 50, endedAt: null, startedBy: { name: 'Nia Okafor' } });
    expect((await post('/infants/inf-elderbrook/skin-to-skin', body)).status).toBe(200);

    env.clock.advanceMinutes(10);
    const during = await post('/infants/inf-elderbrook/readings', reading({ probe: 37.5, remote: 37.4 }));
    expect(during.body.reading.sessionId).toBe(body.id);
    expect(during.body.openFlags.some((f: { kind: string }) => f.kind === 'skin-to-skin-deviation')).toBe(true);

    expect((await post(`/skin-to-skin/${body.id}/end`, {}, educator)).status).toBe(403);
    const end = await post(`/skin-to-skin/${body.id}/end`, {});
    expect(end.status).toBe(200);
    expect(end.body.session.endedAt).toBe(env.clock.now().toISOString());
    expect((await post(`/skin-to-skin/${body.id}/end`, {})).body.session.endedAt).toBe(end.body.session.endedAt);
    expect((await get('/infants/inf-elderbrook')).body.infant.skinToSkin).toBeNull();

    expect((await post(`/skin-to-skin/${running.id}/end`, {})).status).toBe(200);
  });

  it('refuses bad input and other units', async () => {
    const before = count(env.database, 'skin_to_skin_sessions');
    const bad = await post('/infants/inf-glimmerton/skin-to-skin', start({ limitCenti: 70 }));
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toHaveProperty('limitCenti');
    const hot = await post('/infants/inf-glimmerton/skin-to-skin', start({ reference: 46 }));
    expect(hot.body.error.fields).toHaveProperty('reference');
    expect((await post('/infants/inf-hartsease/skin-to-skin', start())).status).toBe(403);
    expect((await post('/infants/inf-glimmerton/skin-to-skin', start(), educator)).status).toBe(403);
    expect((await post(`/skin-to-skin/${randomUUID()}/end`, {})).status).toBe(404);
    expect(count(env.database, 'skin_to_skin_sessions')).toBe(before);
  });
});
