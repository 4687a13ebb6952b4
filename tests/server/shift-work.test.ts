import request from 'supertest';
import { count, DEMO, makeEnv, type TestEnv } from './helpers';

// Shift change (common practice on a neonatal unit): the charge nurse gives each nurse her
// infants for the next shift in one step, and the handover carries a written plan per infant.

let env: TestEnv;
const tokens: Record<string, string> = {};
const auth = (who: string) => ({ Authorization: `Bearer ${tokens[who]}` });

beforeAll(async () => {
  env = await makeEnv();
  tokens.charge = await env.signIn(DEMO.charge);
  tokens.nurse = await env.signIn(DEMO.nurse);
  tokens.educator = await env.signIn(DEMO.educator);
  tokens.admin = await env.signIn(DEMO.admin);
  tokens.southNurse = await env.signIn(DEMO.southNurse);
});
afterAll(() => env.close());

describe('the handover plan per infant and shift', () => {
  it('a nurse writes the plan; a new version replaces what is shown and the old one stays', async () => {
    expect((await request(env.app).get('/api/infants/inf-ashgrove/handover-plan').set(auth('nurse'))).body.plan).toBeNull();
    const first = await request(env.app)
      .post('/api/infants/inf-ashgrove/handover-plan')
      .set(auth('nurse'))
      .send({ plan: 'Wean set temperature by 0.2 °C if two remote readings are above 37.2.' });
    expect(first.status).toBe(201);
    expect(first.body.plan).toMatchObject({ infantId: 'inf-ashgrove', writtenBy: 'Nia Okafor' });
    expect(['day', 'night']).toContain(first.body.plan.shift);
    const second = await request(env.app).post('/api/infants/inf-ashgrove/handover-plan').set(auth('charge')).send({ plan: 'Line 1\nLine 2: recheck the probe site at 02:00.' });
    expect(second.status).toBe(201);
    const now = await request(env.app).get('/api/infants/inf-ashgrove/handover-plan').set(auth('educator'));
    expect(now.body.plan).toMatchObject({ plan: 'Line 1\nLine 2: recheck the probe site at 02:00.', writtenBy: 'Marta Lindqvist' });
    expect(count(env.database, 'handover_plans')).toBe(2);
    expect(() => env.database.sqlite.prepare("UPDATE handover_plans SET plan = 'x'").run()).toThrow(/append-only/);
    const unit = await request(env.app).get('/api/units/unit-north/handover-plans').set(auth('charge'));
    expect(unit.body.plans.map((p: { infantId: string }) => p.infantId)).toEqual(['inf-ashgrove']);
  });

  it('refuses an empty plan, hidden control characters, other units and the roles that do not chart', async () => {
    const before = count(env.database, 'handover_plans');
    const empty = await request(env.app).post('/api/infants/inf-ashgrove/handover-plan').set(auth('nurse')).send({ plan: '   ' });
    expect(empty.status).toBe(400);
    expect(empty.body.error.fields).toHaveProperty('plan');
    expect((await request(env.app).post('/api/infants/inf-ashgrove/handover-plan').set(auth('nurse')).send({ plan: 'ok\u0007' })).status).toBe(400);
    expect((await request(env.app).post('/api/infants/inf-ashgrove/handover-plan').set(auth('southNurse')).send({ plan: 'x' })).status).toBe(403);
    expect((await request(env.app).post('/api/infants/inf-ashgrove/handover-plan').set(auth('educator')).send({ plan: 'x' })).status).toBe(403);
    expect(count(env.database, 'handover_plans')).toBe(before);
  });
});

describe('bulk assignment at shift change', () => {
  it('assigns each nurse her infants for the next shift in one step', async () => {
    const res = await request(env.app)
      .post('/api/units/unit-north/assignments/bulk')
      .set(auth('charge'))
      .send({
        shift: 'next',
        assignments: [
          { nurseId: 'u-nurse-2', infantIds: ['inf-ashgrove', 'inf-brightwater'] },
          { nurseId: 'u-nurse-4', infantIds: ['inf-cinderford'] },
        ],
      });
    expect(res.status).toBe(201);
    expect(res.body.assignments).toHaveLength(3);
    const rows = env.database.sqlite
      .prepare('SELECT infant_id, nurse_id, shift_date, shift FROM assignments WHERE id IN (' + res.body.assignments.map(() => '?').join(',') + ') ORDER BY infant_id')
      .all(...res.body.assignments.map((a: { id: string }) => a.id)) as { infant_id: string; nurse_id: string; shift_date: string; shift: string }[];
    expect(rows.map((r) => [r.infant_id, r.nurse_id])).toEqual([
      ['inf-ashgrove', 'u-nurse-2'],
      ['inf-brightwater', 'u-nurse-2'],
      ['inf-cinderford', 'u-nurse-4'],
    ]);
    // One shift for all of them: the next one.
    expect(new Set(rows.map((r) => `${r.shift_date} ${r.shift}`)).size).toBe(1);
  });

  it('is all or nothing: one bad infant or nurse writes no row; an infant given twice is refused', async () => {
    const before = count(env.database, 'assignments');
    const bad = await request(env.app)
      .post('/api/units/unit-north/assignments/bulk')
      .set(auth('charge'))
      .send({
        assignments: [
          { nurseId: 'u-nurse-2', infantIds: ['inf-ashgrove'] },
          { nurseId: 'u-nurse-3', infantIds: ['inf-cinderford'] },
        ],
      });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toHaveProperty('nurseId');
    const twice = await request(env.app)
      .post('/api/units/unit-north/assignments/bulk')
      .set(auth('charge'))
      .send({
        assignments: [
          { nurseId: 'u-nurse-2', infantIds: ['inf-ashgrove'] },
          { nurseId: 'u-nurse-4', infantIds: ['inf-ashgrove'] },
        ],
      });
    expect(twice.status).toBe(400);
    expect(JSON.stringify(twice.body.error.fields)).toMatch(/two nurses/);
    expect((await request(env.app).post('/api/units/unit-north/assignments/bulk').set(auth('nurse')).send({ assignments: [] })).status).toBe(403);
    expect(count(env.database, 'assignments')).toBe(before);
  });

  it('the nurses to choose from are active people of the unit who accepted their invitation', async () => {
    const invited = await request(env.app)
      .post('/api/admin/users')
      .set(auth('admin'))
      .send({ name: 'Rowan Pellew', email: 'rowan.pellew@warmfold.test', role: 'nurse', unitIds: ['unit-north'] });
    expect(invited.status).toBe(201);
    const nurses = await request(env.app).get('/api/units/unit-north/nurses').set(auth('charge'));
    const names = nurses.body.nurses.map((n: { name: string }) => n.name);
    expect(names).toContain('Kofi Mensah');
    expect(names).not.toContain('Rowan Pellew');
    // The board's nurse filter lists the same people.
    env.clock.advanceMinutes(1);
    const board = await request(env.app).get('/api/units/unit-north/board').set(auth('charge'));
    expect(board.body.nurses.map((n: { name: string }) => n.name)).not.toContain('Rowan Pellew');
    expect(board.body.nurses.map((n: { name: string }) => n.name)).toContain('Kofi Mensah');
    // Nor can she be given infants before she has accepted.
    const give = await request(env.app)
      .post('/api/units/unit-north/assignments/bulk')
      .set(auth('charge'))
      .send({ assignments: [{ nurseId: invited.body.user.id, infantIds: ['inf-ashgrove'] }] });
    expect(give.status).toBe(400);
  });
});
