/**
 * A weight charted on a reading becomes the infant's current weight: over HTTP against the real
 * app on a real SQLite file.
 *
 * Checks and their sources:
 * - the current weight is the latest one weighed, by the time of weighing, not by the time it was
 *   typed in: a late entry of an earlier weighing does not replace a later one (common practice:
 *   the chart orders entries by clinical time);
 * - a corrected weight replaces the mistaken one, and a reading entered in error no longer counts,
 *   so the weight before it counts again (common practice, as for any corrected entry);
 * - weights 300–8000 g (common practice).
 */
import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { verifyRecord } from '../../server/record-verify';
import { DEMO, makeEnv, type TestEnv } from './helpers';

let env: TestEnv;
let nurse: string;
let charge: string;
let infantId: string;
beforeAll(async () => {
  env = await makeEnv();
  [nurse, charge] = await Promise.all([env.signIn(DEMO.nurse), env.signIn(DEMO.charge)]);
  const res = await post(
    '/units/unit-north/infants',
    {
      bedId: 'bed-N09',
      displayName: 'Baby Weigh',
      birthAt: '2026-11-15T22:40:00Z',
      gestationWeeks: 32,
      gestationDays: 3,
      birthWeightGrams: 1720,
      heatSource: 'incubator',
      controlMode: 'skin-servo',
      setTemperature: 36.5,
    },
    charge,
  );
  expect(res.status).toBe(201);
  infantId = res.body.infant.id as string;
});
afterAll(() => env.close());

const auth = (token: string) => ({ Authorization: `Bearer ${token}` });
const get = (path: string, token = nurse) => request(env.app).get(`/api${path}`).set(auth(token));
const post = (path: string, body: object, token = nurse) => request(env.app).post(`/api${path}`).set(auth(token)).send(body);
const tick = (minutes = 1) => env.clock.set(new Date(env.clock.now().getTime() + minutes * 60_000));

const currentWeight = async () => {
  const res = await get(`/infants/${infantId}`);
  expect(res.status).toBe(200);
  return res.body.infant.weightGrams as number;
};

describe('the current weight follows the weight charted on readings', () => {
  let latestId: string;

  it('starts at the birth weight given on admission', async () => {
    expect(await currentWeight()).toBe(1720);
  });

  it('takes the weight of a new reading, and shows it on the board', async () => {
    tick(30);
    const res = await post(`/infants/${infantId}/readings`, { id: randomUUID(), unit: 'C', probe: 36.6, weightGrams: 1690 });
    expect(res.status).toBe(201);
    latestId = res.body.reading.id;
    expect(await currentWeight()).toBe(1690);
    const board = await get('/units/unit-north/board', charge);
    expect(board.body.beds.find((b: { label: string }) => b.label === 'N09').infant.weightGrams).toBe(1690);
  });

  it('keeps it when a reading charts no weight', async () => {
    tick();
    expect((await post(`/infants/${infantId}/readings`, { id: randomUUID(), unit: 'C', probe: 36.7 })).status).toBe(201);
    expect(await currentWeight()).toBe(1690);
  });

  it('keeps the later weighing when an earlier one is charted late', async () => {
    tick(30);
    const takenAt = new Date(env.clock.now().getTime() - 45 * 60_000).toISOString();
    const res = await post(`/infants/${infantId}/readings`, { id: randomUUID(), unit: 'C', probe: 36.5, weightGrams: 1600, takenAt, lateReason: 'Charted after the feed.' });
    expect(res.status).toBe(201);
    expect(await currentWeight()).toBe(1690);
  });

  it('takes a corrected weight, and the weight before it once the reading is marked entered in error', async () => {
    tick();
    const corrected = await post(`/readings/${latestId}/corrections`, {
      id: randomUUID(),
      reason: 'corrected-value',
      note: 'Misread the scale.',
      values: { unit: 'C', probe: 36.6, weightGrams: 1695 },
    });
    expect(corrected.status).toBe(201);
    expect(await currentWeight()).toBe(1695);
    tick();
    const error = await post(`/readings/${corrected.body.reading.id}/corrections`, { id: randomUUID(), reason: 'entered-in-error', note: 'Wrong infant.' });
    expect(error.status).toBe(201);
    // The late entry's 1600 g is the only weighing left on the chart.
    expect(await currentWeight()).toBe(1600);
  });

  it('leaves the record verifying (the weight changes through the row ledger)', () => {
    expect(verifyRecord(env.database.sqlite).findings).toEqual([]);
  });
});
