/**
 * The server refuses what the bedside form refuses: a time ahead of the clock (beyond the
 * tolerance for a phone's drifting clock) and a temperature typed to more than one decimal,
 * each with the field and the reason, writing nothing.
 */
import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { count, DEMO, makeEnv, type TestEnv } from './helpers';

let env: TestEnv;
let nurse: string;
beforeAll(async () => {
  // The demo's clock: 2026-11-16 10:00 UTC (10:00 in London, the unit's zone).
  env = await makeEnv();
  nurse = await env.signIn(DEMO.nurse);
});
afterAll(() => env.close());

const INFANT = 'inf-glimmerton';
const post = (path: string, body: object) =>
  request(env.app)
    .post(`/api${path}`)
    .set({ Authorization: `Bearer ${nurse}` })
    .send(body);
const reading = (values: Record<string, unknown> = {}) => ({ id: randomUUID(), unit: 'C', probe: 36.8, remote: 36.7, remoteSite: 'axilla', ...values });
const written = () => [count(env.database, 'readings'), count(env.database, 'audit_events'), count(env.database, 'flags')];

describe('a reading time ahead of the clock', () => {
  it('is refused 30 minutes ahead (the issue: 21:18 typed at 20:48), naming takenAt and why', async () => {
    const before = written();
    const res = await post(`/infants/${INFANT}/readings`, reading({ takenAt: '2026-11-16T10:30:00Z' }));
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({ takenAt: 'The time cannot be in the future.' });
    expect(written()).toEqual(before);
  });

  it('is refused just past the 2-minute tolerance, accepted within it', async () => {
    const ahead = await post(`/infants/${INFANT}/readings`, reading({ takenAt: '2026-11-16T10:02:01Z' }));
    expect(ahead.status).toBe(400);
    expect(ahead.body.error.fields.takenAt).toBe('The time cannot be in the future.');
    const within = await post(`/infants/${INFANT}/readings`, reading({ takenAt: '2026-11-16T10:02:00Z' }));
    expect(within.status).toBe(201);
  });

  it("is refused for a correction too, on the correction's field", async () => {
    const made = await post(`/infants/${INFANT}/readings`, reading());
    expect(made.status).toBe(201);
    const before = written();
    const res = await post(`/readings/${made.body.reading.id}/corrections`, {
      id: randomUUID(),
      reason: 'corrected-value',
      note: 'Wrong time.',
      values: { unit: 'C', probe: 36.8, remote: 36.7, remoteSite: 'axilla', takenAt: '2026-11-16T11:00:00Z' },
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields['values.takenAt']).toBe('The time cannot be in the future.');
    expect(written()).toEqual(before);
  });
});

describe('temperatures typed to one decimal place', () => {
  // °C = (°F − 32) × 5/9 (NIST SP 811, appendix B.8). 97.71 °F = 36.5056 °C → 3651 hundredths;
  // 98.62 °F = 37.0111 °C → 3701: exactly 0.50 °C apart in hundredths though 0.91 °F apart, so the
  // 0.5 °C gap limit would not be crossed. A second decimal is refused in the unit she typed.
  it.each([
    ['97.71 °F as the probe', { unit: 'F', probe: 97.71, remote: 98.6 }, 'probe', 'Probe temperature: enter one decimal place, e.g. 98.2.'],
    ['98.62 °F as the remote site', { unit: 'F', probe: 97.7, remote: 98.62 }, 'remote', 'Remote-site temperature: enter one decimal place, e.g. 98.2.'],
    ['36.85 °C as the air', { unit: 'C', air: 36.85 }, 'air', 'Air temperature: enter one decimal place, e.g. 36.8.'],
    ['36.55 °C as the set point', { unit: 'C', set: 36.55, controlMode: 'skin-servo' }, 'set', 'Set temperature: enter one decimal place, e.g. 36.8.'],
  ])('refuses %s with the field and the reason, writing nothing', async (_name, values, field, reason) => {
    const before = written();
    const res = await post(`/infants/${INFANT}/readings`, reading(values));
    expect(res.status).toBe(400);
    expect(res.body.error.fields[field]).toBe(reason);
    expect(written()).toEqual(before);
  });

  it('takes 97.7 °F and 98.6 °F (36.50 °C and 37.00 °C: a 0.50 °C gap, at the limit)', async () => {
    const res = await post(`/infants/${INFANT}/readings`, reading({ unit: 'F', probe: 97.7, remote: 98.6 }));
    expect(res.status).toBe(201);
    expect(res.body.reading).toMatchObject({ probeCenti: 3650, remoteCenti: 3700, enteredUnit: 'F' });
  });

  it('takes whole degrees, and a sum with a binary last-digit error (36.7 + 0.1)', async () => {
    expect((await post(`/infants/${INFANT}/readings`, reading({ probe: 37, remote: 36.7 + 0.1 }))).status).toBe(201);
  });

  it("refuses a second decimal in a correction's new values", async () => {
    const made = await post(`/infants/${INFANT}/readings`, reading());
    const before = written();
    const res = await post(`/readings/${made.body.reading.id}/corrections`, {
      id: randomUUID(),
      reason: 'corrected-value',
      note: 'Typed it wrong.',
      values: { unit: 'F', probe: 98.24, remote: 98.2, remoteSite: 'axilla' },
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields['values.probe']).toBe('Probe temperature: enter one decimal place, e.g. 98.2.');
    expect(written()).toEqual(before);
  });
});
