import request from 'supertest';
import { count, DEMO, makeEnv, type TestEnv } from './helpers';

// A bed is pre-warmed before the infant arrives so the infant meets a warm surface (WHO 1997,
// "Thermal protection of the newborn": warm the room and surfaces before birth/admission). The
// charge nurse marks an empty bed as warming; the admission into it carries its settings.

const SOUTH_CHARGE = 'dawit.bekele@warmfold.test';
let env: TestEnv;
const tokens: Record<string, string> = {};
const auth = (who: string) => ({ Authorization: `Bearer ${tokens[who]}` });

beforeAll(async () => {
  env = await makeEnv();
  tokens.charge = await env.signIn(DEMO.charge);
  tokens.nurse = await env.signIn(DEMO.nurse);
  tokens.southCharge = await env.signIn(SOUTH_CHARGE);
});
afterAll(() => env.close());

const warmBody = (over: Record<string, unknown> = {}) => ({
  heatSource: 'incubator',
  controlMode: 'air-servo',
  setTemperature: 34.5,
  since: '2026-11-16T09:40:00Z',
  expectedInfant: 'Twin 1 from delivery suite, 31 weeks',
  ...over,
});

describe('warming an empty bed for the next admission', () => {
  it("only the unit's charge nurse marks a bed, and only an empty one", async () => {
    expect((await request(env.app).post('/api/units/unit-north/beds/bed-N10/warming').set(auth('nurse')).send(warmBody())).status).toBe(403);
    expect((await request(env.app).post('/api/units/unit-north/beds/bed-N10/warming').set(auth('southCharge')).send(warmBody())).status).toBe(403);
    expect((await request(env.app).post('/api/units/unit-north/beds/bed-N10/warming').send(warmBody())).status).toBe(401);
    // N01 holds an infant in the demo.
    const taken = await request(env.app).post('/api/units/unit-north/beds/bed-N01/warming').set(auth('charge')).send(warmBody());
    expect(taken.status).toBe(409);
    // Another unit's bed through this unit's path is not found.
    expect((await request(env.app).post('/api/units/unit-north/beds/bed-S09/warming').set(auth('charge')).send(warmBody())).status).toBe(404);
  });

  it('bad input names each field and writes nothing', async () => {
    const before = count(env.database, 'bed_warmings');
    const res = await request(env.app)
      .post('/api/units/unit-north/beds/bed-N10/warming')
      .set(auth('charge'))
      .send(warmBody({ heatSource: 'blanket', setTemperature: 45, expectedInfant: 'Baby\u202Eevil', since: '2026-11-16T12:00:00Z', extra: 1 }));
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields ?? {})).toEqual(expect.arrayContaining(['heatSource', 'expectedInfant', 'extra']));
    // 45 °C is above any incubator's or warmer's set range (IEC 60601-2-19/-2-21 cap air at 39 °C).
    const hot = await request(env.app)
      .post('/api/units/unit-north/beds/bed-N10/warming')
      .set(auth('charge'))
      .send(warmBody({ setTemperature: 45 }));
    expect(hot.status).toBe(400);
    expect(hot.body.error.fields).toHaveProperty('setTemperature');
    // A start in the future (the test clock is 10:00 UTC) is refused on its own field.
    const future = await request(env.app)
      .post('/api/units/unit-north/beds/bed-N10/warming')
      .set(auth('charge'))
      .send(warmBody({ since: '2026-11-16T12:00:00Z' }));
    expect(future.status).toBe(400);
    expect(future.body.error.fields).toHaveProperty('since');
    expect(count(env.database, 'bed_warmings')).toBe(before);
  });

  it("the board's unit lists the warming bed with its settings; °F input is stored in °C", async () => {
    // 94.1 °F = 34.5 °C ((94.1 − 32) × 5/9 = 34.5; the Fahrenheit–Celsius conversion).
    const res = await request(env.app)
      .post('/api/units/unit-north/beds/bed-N10/warming')
      .set(auth('charge'))
      .send(warmBody({ setTemperature: 94.1, tempUnit: 'F' }));
    expect(res.status).toBe(201);
    expect(res.body.warming).toMatchObject({
      bedId: 'bed-N10',
      heatSource: 'incubator',
      controlMode: 'air-servo',
      setCenti: 3450,
      since: '2026-11-16T09:40:00.000Z',
      expectedInfant: 'Twin 1 from delivery suite, 31 weeks',
      startedBy: 'Marta Lindqvist',
    });
    const list = await request(env.app).get('/api/units/unit-north/warmings').set(auth('nurse'));
    expect(list.status).toBe(200);
    expect(list.body.warmings.map((w: { bedId: string }) => w.bedId)).toEqual(['bed-N10']);
    expect((await request(env.app).get('/api/units/unit-north/warmings').set(auth('southCharge'))).status).toBe(403);
  });

  it('rows are append-only: the database refuses to change or delete one', () => {
    expect(() => env.database.sqlite.prepare("UPDATE bed_warmings SET set_centi = 3000 WHERE bed_id = 'bed-N10'").run()).toThrow(/append-only/);
    expect(() => env.database.sqlite.prepare("DELETE FROM bed_warmings WHERE bed_id = 'bed-N10'").run()).toThrow(/append-only/);
  });

  it('admission into the warmed bed ends the warming and names the infant', async () => {
    const admit = await request(env.app).post('/api/units/unit-north/infants').set(auth('charge')).send({
      bedId: 'bed-N10',
      displayName: 'Baby Quenby',
      birthAt: '2026-11-16T08:10:00Z',
      gestationWeeks: 31,
      gestationDays: 0,
      birthWeightGrams: 1500,
      heatSource: 'incubator',
      controlMode: 'air-servo',
      setTemperature: 34.5,
    });
    expect(admit.status).toBe(201);
    expect((await request(env.app).get('/api/units/unit-north/warmings').set(auth('charge'))).body.warmings).toEqual([]);
    const ended = env.database.sqlite.prepare("SELECT end_reason, infant_id FROM bed_warmings WHERE bed_id = 'bed-N10' AND event = 'ended'").all();
    expect(ended).toEqual([{ end_reason: 'admitted', infant_id: admit.body.infant?.id ?? admit.body.id }]);
  });

  it('a warming can be stopped, once', async () => {
    expect(
      (
        await request(env.app)
          .post('/api/units/unit-north/beds/bed-N11/warming')
          .set(auth('charge'))
          .send(warmBody({ heatSource: 'radiant-warmer', controlMode: 'skin-servo', setTemperature: 36.5 }))
      ).status,
    ).toBe(201);
    expect((await request(env.app).post('/api/units/unit-north/beds/bed-N11/warming/end').set(auth('charge')).send({})).status).toBe(200);
    expect((await request(env.app).post('/api/units/unit-north/beds/bed-N11/warming/end').set(auth('charge')).send({})).status).toBe(409);
    expect((await request(env.app).get('/api/units/unit-north/warmings').set(auth('charge'))).body.warmings).toEqual([]);
  });
});
