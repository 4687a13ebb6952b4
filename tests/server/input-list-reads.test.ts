import request from 'supertest';
import { DEMO, makeEnv, type TestEnv } from './helpers';

/**
 * Every answer that shows patient data is an access to the record and is audited, naming the
 * infants shown (HIPAA 45 CFR 164.312(b) audit controls; ASVS 4.0.3 V7.1). A filter naming a unit
 * outside the caller's own is refused (OWASP API Security Top 10 2023 API1), not answered empty.
 * The expected infants come from the demo seed's own list (db/seed.ts), written out by hand.
 */

const NORTH_ADMITTED = ['inf-ashgrove', 'inf-brightwater', 'inf-cinderford', 'inf-dunmere', 'inf-elderbrook', 'inf-fernhollow', 'inf-glimmerton', 'inf-glimmerton-b'];
const SOUTH_ADMITTED = ['inf-hartsease', 'inf-ivybridge', 'inf-juniper', 'inf-kestrel'];
const NIAS_INFANTS = ['inf-ashgrove', 'inf-brightwater', 'inf-cinderford', 'inf-dunmere'];

let env: TestEnv;
let nurse: string;
let educator: string;
let charge: string;
beforeAll(async () => {
  env = await makeEnv();
  // A third unit nobody in the demo belongs to.
  env.database.sqlite.prepare("INSERT INTO units (id, name, hospital_name, created_at) VALUES ('unit-east', 'East Annexe', 'Elsewhere General', 0)").run();
  [nurse, educator, charge] = await Promise.all([env.signIn(DEMO.nurse), env.signIn(DEMO.educator), env.signIn(DEMO.charge)]);
});
afterAll(() => env.close());

interface Event {
  id: number;
  action: string;
  actor_id: string;
  unit_id: string | null;
  after: string | null;
}
const lastId = () => (env.database.sqlite.prepare('SELECT COALESCE(MAX(id), 0) AS n FROM audit_events').get() as { n: number }).n;
const eventsSince = (id: number) => env.database.sqlite.prepare('SELECT id, action, actor_id, unit_id, after FROM audit_events WHERE id > ? ORDER BY id').all(id) as Event[];
const get = (token: string, url: string) => request(env.app).get(url).set('Authorization', `Bearer ${token}`);
const sorted = (ids: string[]) => [...ids].sort();

describe('list answers name the infants they returned', () => {
  it('/api/infants: one event per unit with exactly the infants listed', async () => {
    const mark = lastId();
    const res = await get(educator, '/api/infants');
    expect(res.status).toBe(200);
    const events = eventsSince(mark).filter((e) => e.action === 'list-read');
    expect(events.map((e) => e.unit_id).sort()).toEqual(['unit-north', 'unit-south']);
    for (const e of events) {
      const after = JSON.parse(e.after!);
      expect(e.actor_id).toBe('u-educator');
      expect(after.view).toBe('unit-infants');
      expect(sorted(after.infantIds)).toEqual(sorted(e.unit_id === 'unit-north' ? NORTH_ADMITTED : SOUTH_ADMITTED));
    }
    expect(sorted(res.body.infants.map((i: { id: string }) => i.id))).toEqual(sorted([...NORTH_ADMITTED, ...SOUTH_ADMITTED]));
  });

  it("/api/infants/mine names the nurse's own infants", async () => {
    const mark = lastId();
    const res = await get(nurse, '/api/infants/mine');
    expect(res.status).toBe(200);
    const [event, ...more] = eventsSince(mark).filter((e) => e.action === 'list-read');
    expect(more).toHaveLength(0);
    expect(event!.actor_id).toBe('u-nurse');
    expect(JSON.parse(event!.after!)).toEqual(expect.objectContaining({ view: 'my-infants' }));
    expect(sorted(JSON.parse(event!.after!).infantIds)).toEqual(sorted(NIAS_INFANTS));
  });

  it('the unit board names the infants on it', async () => {
    const mark = lastId();
    const res = await get(charge, '/api/units/unit-north/board');
    expect(res.status).toBe(200);
    const [event] = eventsSince(mark).filter((e) => e.action === 'board-read');
    expect(sorted(JSON.parse(event!.after!).infantIds)).toEqual(sorted(NORTH_ADMITTED));
  });

  it('/api/review/queue names the infants of the items on the page', async () => {
    const mark = lastId();
    const res = await get(educator, '/api/review/queue?unitId=unit-north&limit=3');
    expect(res.status).toBe(200);
    expect(res.body.items.length).toBeGreaterThan(0);
    const events = eventsSince(mark).filter((e) => e.action === 'list-read');
    expect(events).toHaveLength(1);
    const after = JSON.parse(events[0]!.after!);
    expect(after.view).toBe('review-queue');
    expect(sorted(after.infantIds)).toEqual(sorted([...new Set<string>(res.body.items.map((i: { infantId: string }) => i.infantId))]));
    for (const id of after.infantIds) expect(NORTH_ADMITTED).toContain(id);
  });

  it("a nurse's review notes name the infants they are about", async () => {
    const queue = await get(educator, '/api/review/queue?unitId=unit-north');
    const item = (queue.body.items as { flagId: string; infantId: string; nurse: { id: string } | null }[]).find((i) => i.nurse?.id === 'u-nurse');
    expect(item).toBeDefined();
    const noted = await request(env.app).post(`/api/review/items/${item!.flagId}/notes`).set('Authorization', `Bearer ${educator}`).send({ note: 'Good recheck within the hour.' });
    expect(noted.status).toBe(201);
    const mark = lastId();
    const res = await get(nurse, '/api/reviews/mine');
    expect(res.status).toBe(200);
    expect(res.body.notes.length).toBeGreaterThan(0);
    const [event, ...more] = eventsSince(mark).filter((e) => e.action === 'list-read');
    expect(more).toHaveLength(0);
    const after = JSON.parse(event!.after!);
    expect(after.view).toBe('my-review-notes');
    expect(after.infantIds).toContain(item!.infantId);
    for (const id of after.infantIds) expect(NIAS_INFANTS).toContain(id);
  });

  it('the exports name the infants whose rows they wrote', async () => {
    const mark = lastId();
    const res = await get(educator, '/api/exports/readings.csv?unitId=unit-north&from=2026-11-01&to=2026-11-16');
    expect(res.status).toBe(200);
    const [event] = eventsSince(mark).filter((e) => e.action === 'export-readings-csv');
    // Every admitted North infant of the demo has readings in this range.
    expect(sorted(JSON.parse(event!.after!).infantIds)).toEqual(sorted(NORTH_ADMITTED));
    const flags = await get(educator, '/api/exports/flags.csv?unitId=unit-north');
    expect(flags.status).toBe(200);
    const [flagEvent] = eventsSince(mark).filter((e) => e.action === 'export-flags-csv');
    for (const id of JSON.parse(flagEvent!.after!).infantIds) expect(NORTH_ADMITTED).toContain(id);
    expect(JSON.parse(flagEvent!.after!).infantIds.length).toBeGreaterThan(0);
    const fhir = await get(educator, '/api/exports/fhir?unitId=unit-north&from=2026-11-01&to=2026-11-16');
    expect(fhir.status).toBe(200);
    const [fhirEvent] = eventsSince(mark).filter((e) => e.action === 'export-fhir');
    expect(sorted(JSON.parse(fhirEvent!.after!).infantIds)).toEqual(sorted(NORTH_ADMITTED));
  });

  it("the unit's handover plans name their infants", async () => {
    const written = await request(env.app)
      .post('/api/infants/inf-ashgrove/handover-plan')
      .set('Authorization', `Bearer ${charge}`)
      .send({ plan: 'Recheck the probe site at 14:00.' });
    expect(written.status).toBe(201);
    const mark = lastId();
    const res = await get(charge, '/api/units/unit-north/handover-plans');
    expect(res.status).toBe(200);
    const [event] = eventsSince(mark).filter((e) => e.action === 'list-read');
    expect(JSON.parse(event!.after!)).toEqual({ view: 'handover-plans', infantIds: ['inf-ashgrove'] });
  });

  it('an answer that shows no infant writes no event', async () => {
    const mark = lastId();
    // The charge nurse has no infants assigned to herself in the demo.
    const res = await get(charge, '/api/infants/mine');
    expect(res.status).toBe(200);
    expect(res.body.infants).toEqual([]);
    expect(eventsSince(mark).filter((e) => e.action === 'list-read')).toHaveLength(0);
  });
});

describe("a unit filter outside the caller's own is refused, not answered empty", () => {
  it.each([
    ['/api/infants?unitId=unit-south', () => nurse],
    ['/api/infants?unitId=unit-east', () => educator],
    ['/api/review/queue?unitId=unit-east', () => educator],
    ['/api/exports/flags.csv?unitId=unit-east', () => educator],
  ])('%s', async (url, token) => {
    const mark = lastId();
    const res = await get(token(), url);
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('forbidden');
    expect(eventsSince(mark).filter((e) => e.action === 'list-read')).toHaveLength(0);
  });
});
