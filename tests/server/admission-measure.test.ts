/**
 * The admission-temperature measure against a hand-computed example. Definition: UK National
 * Neonatal Audit Programme, 2021 Measures Guide, "Promoting normal temperature on admission for
 * very preterm babies": of infants born before 32 weeks, those whose first temperature on
 * admission was both 36.5–37.5 °C and measured within one hour of birth. The first temperature
 * is the first axillary or rectal one (never the skin probe); a corrected reading counts as
 * corrected and one entered in error not at all.
 */
import request from 'supertest';
import { judgeFirstTemperature } from '../../server/services/admission-measure';
import { DEMO, makeEnv, type TestEnv } from './helpers';

let env: TestEnv;
let educator: string;
let charge: string;
let nurse: string;

const BIRTH = Date.parse('2027-01-10T08:00:00Z');
const FEB_BIRTH = Date.parse('2027-02-03T08:00:00Z');
const min = (m: number, from = BIRTH) => from + m * 60_000;

/** One invented infant: gestation, birth, and the readings charted after admission. */
interface Case {
  id: string;
  weeks: number;
  days: number;
  birth: number;
  readings: { id: string; at: number; probe?: number; remote?: number; site?: 'axilla' | 'rectal' | 'other'; replaces?: string; error?: boolean }[];
}

const CASES: Case[] = [
  // January, all born 08:00 UTC, admitted 08:05.
  { id: 'm-a', weeks: 29, days: 3, birth: BIRTH, readings: [{ id: 'r-a1', at: min(40), probe: 3690, remote: 3680, site: 'axilla' }] }, // met
  { id: 'm-b', weeks: 30, days: 0, birth: BIRTH, readings: [{ id: 'r-b1', at: min(30), remote: 3620, site: 'axilla' }] }, // too cold
  { id: 'm-c', weeks: 31, days: 6, birth: BIRTH, readings: [{ id: 'r-c1', at: min(20), remote: 3780, site: 'rectal' }] }, // too warm
  { id: 'm-d', weeks: 27, days: 0, birth: BIRTH, readings: [{ id: 'r-d1', at: min(75), remote: 3700, site: 'axilla' }] }, // too late (75 min)
  { id: 'm-e', weeks: 28, days: 2, birth: BIRTH, readings: [{ id: 'r-e1', at: min(20), probe: 3690 }] }, // probe only: none recorded
  { id: 'm-f', weeks: 32, days: 0, birth: BIRTH, readings: [{ id: 'r-f1', at: min(200), remote: 3500, site: 'axilla' }] }, // 32+0: not eligible
  {
    id: 'm-g',
    weeks: 26,
    days: 5,
    birth: BIRTH,
    readings: [
      { id: 'r-g1', at: min(10), remote: 3690, site: 'other' }, // neither axillary nor rectal: not the measure's
      { id: 'r-g2', at: min(50), remote: 3600, site: 'axilla' }, // the first that counts: too cold
    ],
  },
  { id: 'm-h', weeks: 30, days: 4, birth: BIRTH, readings: [{ id: 'r-h1', at: min(60), remote: 3750, site: 'axilla' }] }, // 37.5 at 60 min: both bounds inclusive, met
  // February.
  {
    id: 'm-i',
    weeks: 29,
    days: 0,
    birth: FEB_BIRTH,
    readings: [
      { id: 'r-i1', at: min(30, FEB_BIRTH), remote: 3650, site: 'axilla' },
      { id: 'r-i2', at: min(30, FEB_BIRTH), remote: 3590, site: 'axilla', replaces: 'r-i1' }, // the correction stands: too cold
    ],
  },
  {
    id: 'm-j',
    weeks: 24,
    days: 6,
    birth: FEB_BIRTH,
    readings: [
      { id: 'r-j1', at: min(10, FEB_BIRTH), remote: 3660, site: 'axilla', error: true }, // entered in error
      { id: 'r-j2', at: min(90, FEB_BIRTH), remote: 3640, site: 'axilla' }, // too cold and too late
    ],
  },
];

beforeAll(async () => {
  // The demo's own infants are admitted in the days before "now" (late May): outside January and February.
  env = await makeEnv({ now: new Date('2027-06-01T10:00:00Z') });
  [educator, charge, nurse] = await Promise.all([env.signIn(DEMO.educator), env.signIn(DEMO.charge), env.signIn(DEMO.nurse)]);
  const { sqlite } = env.database;
  const infant = sqlite.prepare(
    `INSERT INTO infants (id, unit_id, bed_id, display_name, birth_at, gestation_weeks, gestation_days, birth_weight_grams, weight_grams, heat_source, status, admitted_at, discharged_at)
     VALUES (?, 'unit-north', NULL, ?, ?, ?, ?, 1200, 1200, 'incubator', 'discharged', ?, ?)`,
  );
  const reading = sqlite.prepare(
    `INSERT INTO readings (id, infant_id, unit_id, taken_at, recorded_at, recorded_by, probe_centi, remote_centi, remote_site, replaces_id, entered_in_error)
     VALUES (?, ?, 'unit-north', ?, ?, 'u-nurse', ?, ?, ?, ?, ?)`,
  );
  for (const c of CASES) {
    infant.run(c.id, `Baby ${c.id.toUpperCase()}`, c.birth, c.weeks, c.days, c.birth + 5 * 60_000, c.birth + 86_400_000);
    for (const r of c.readings) reading.run(r.id, c.id, r.at, r.at, r.probe ?? null, r.remote ?? null, r.site ?? null, r.replaces ?? null, r.error ? 1 : 0);
  }
});
afterAll(() => env.close());

const measure = (token: string, q = 'unitId=unit-north&from=2027-01-01&to=2027-02-28') =>
  request(env.app).get(`/api/reports/admission-measure?${q}`).set('Authorization', `Bearer ${token}`);

describe('admission-temperature measure (NNAP 2021 Measures Guide), hand-computed', () => {
  it('January 2 of 7 (A, H met), February 0 of 2; overall 2 of 9', async () => {
    const res = await measure(educator);
    expect(res.status).toBe(200);
    const m = res.body.measure;
    expect(m.byMonth).toEqual([
      { month: '2027-01', eligible: 7, met: 2, rate: 2 / 7 },
      { month: '2027-02', eligible: 2, met: 0, rate: 0 },
    ]);
    expect([m.eligible, m.met]).toEqual([9, 2]);
    expect(m.rate).toBeCloseTo(2 / 9, 10);
  });

  it('lists each infant that missed it and why', async () => {
    const m = (await measure(charge)).body.measure;
    const why = Object.fromEntries(m.missed.map((x: { infantId: string; reasons: string[] }) => [x.infantId, x.reasons]));
    expect(why).toEqual({
      'm-b': ['too-cold'],
      'm-c': ['too-warm'],
      'm-d': ['too-late'],
      'm-e': ['none-recorded'],
      'm-g': ['too-cold'],
      'm-i': ['too-cold'],
      'm-j': ['too-cold', 'too-late'],
    });
    const g = m.missed.find((x: { infantId: string }) => x.infantId === 'm-g');
    expect(g.first).toEqual({ takenAt: '2027-01-10T08:50:00.000Z', centi: 3600, site: 'axilla', minutesAfterBirth: 50 });
  });

  it('boundaries: 36.5 and 37.5 °C and exactly 60 minutes are inside; 36.49, 37.51 and 61 minutes are not', () => {
    const birth = new Date(BIRTH);
    const at = (m: number) => new Date(min(m));
    expect(judgeFirstTemperature(birth, { takenAt: at(60), centi: 3650 }).met).toBe(true);
    expect(judgeFirstTemperature(birth, { takenAt: at(60), centi: 3750 }).met).toBe(true);
    expect(judgeFirstTemperature(birth, { takenAt: at(10), centi: 3649 }).reasons).toEqual(['too-cold']);
    expect(judgeFirstTemperature(birth, { takenAt: at(10), centi: 3751 }).reasons).toEqual(['too-warm']);
    expect(judgeFirstTemperature(birth, { takenAt: at(61), centi: 3700 }).reasons).toEqual(['too-late']);
    expect(judgeFirstTemperature(birth, null).reasons).toEqual(['none-recorded']);
  });

  it('the educator and the charge nurse only; another unit refused; a reversed range a 400 naming the field', async () => {
    expect((await measure(nurse)).status).toBe(403);
    expect((await measure(charge, 'unitId=unit-nowhere&from=2027-01-01&to=2027-01-31')).status).toBe(403);
    const reversed = await measure(educator, 'unitId=unit-north&from=2027-02-01&to=2027-01-01');
    expect(reversed.status).toBe(400);
    expect(reversed.body.error.fields.to).toBeDefined();
  });
});

describe('admission data validated on admission', () => {
  const admit = (over: Record<string, unknown>) =>
    request(env.app)
      .post('/api/units/unit-north/infants')
      .set('Authorization', `Bearer ${charge}`)
      .send({
        bedId: 'bed-N09',
        displayName: 'Baby Merrow',
        birthAt: '2027-06-01T08:00:00Z',
        gestationWeeks: 30,
        gestationDays: 2,
        birthWeightGrams: 1400,
        heatSource: 'incubator',
        controlMode: 'air-servo',
        setTemperature: 34,
        ...over,
      });

  it('a birth in the future, after admission, or more than a year before is refused on birthAt', async () => {
    const future = await admit({ birthAt: '2027-06-01T12:00:00Z' });
    expect(future.status).toBe(400);
    expect(future.body.error.fields.birthAt).toMatch(/future/);
    const old = await admit({ birthAt: '2026-05-01T08:00:00Z' });
    expect(old.status).toBe(400);
    expect(old.body.error.fields.birthAt).toMatch(/year/);
  });

  it('gestation outside 22+0 to 44+6 weeks is refused on its field (common practice: the limits of viability and post-term)', async () => {
    const early = await admit({ gestationWeeks: 21 });
    expect(early.status).toBe(400);
    expect(early.body.error.fields.gestationWeeks).toBeDefined();
    const days = await admit({ gestationDays: 7 });
    expect(days.body.error.fields.gestationDays).toBeDefined();
    expect((await admit({})).status).toBe(201);
  });
});
