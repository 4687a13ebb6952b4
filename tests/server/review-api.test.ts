import request from 'supertest';
import { count, DEMO, makeEnv, type TestEnv } from './helpers';

let env: TestEnv;
let educator: string;
let nurse: string;
let admin: string;
beforeAll(async () => {
  env = await makeEnv();
  [educator, nurse, admin] = await Promise.all([env.signIn(DEMO.educator), env.signIn(DEMO.nurse), env.signIn(DEMO.admin)]);
});
afterAll(() => env.close());

const get = (path: string, token?: string) => {
  const r = request(env.app).get(path);
  return token ? r.set('Authorization', `Bearer ${token}`) : r;
};

describe('review queue', () => {
  it('lists stored gap flags, overdue checks, heat-stress, manual-mode and cold-stress items across both units', async () => {
    const res = await get('/api/review/queue', educator);
    expect(res.status).toBe(200);
    const kinds = new Set(res.body.items.map((i: { kind: string }) => i.kind));
    expect(kinds).toEqual(new Set(['gap', 'overdue-check', 'heat-stress', 'manual-mode', 'cold-stress']));
    expect(res.body.units.map((u: { id: string }) => u.id).sort()).toEqual(['unit-north', 'unit-south']);
    const caught = res.body.items.find((i: { kind: string; firstActionAt: string | null; closedAt: string | null }) => i.kind === 'gap' && i.firstActionAt && i.closedAt);
    expect(caught.minutesToFirstAction).toBeGreaterThanOrEqual(0);
    expect(caught.minutesToResolution).toBeGreaterThanOrEqual(caught.minutesToFirstAction);
    expect(caught.nurse).toEqual(expect.objectContaining({ name: expect.any(String) }));
  });

  it('filters by unit, kind, shift, nurse, dates and review status', async () => {
    const night = await get('/api/review/queue?shift=night&kind=gap&unitId=unit-north', educator);
    expect(night.status).toBe(200);
    expect(night.body.items.length).toBeGreaterThan(0);
    for (const i of night.body.items) expect([i.shift, i.kind, i.unitId]).toEqual(['night', 'gap', 'unit-north']);
    const nurseId = night.body.items[0].nurse.id;
    const byNurse = await get(`/api/review/queue?nurseId=${nurseId}`, educator);
    for (const i of byNurse.body.items) expect(i.nurse.id).toBe(nurseId);
    const future = await get('/api/review/queue?from=2030-01-01&to=2030-01-31', educator);
    expect(future.body.items).toEqual([]);
    const reviewed = await get('/api/review/queue?status=reviewed', educator);
    expect(reviewed.body.items).toEqual([]);
  });

  it('refuses bad filters with the field named', async () => {
    const res = await get('/api/review/queue?shift=evening&from=2026-13-01', educator);
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual(expect.objectContaining({ shift: expect.any(String), from: expect.any(String) }));
    const range = await get('/api/review/queue?from=2026-11-10&to=2026-11-01', educator);
    expect(range.body.error.fields.to).toBeDefined();
  });

  it('needs a signed-in educator', async () => {
    expect((await get('/api/review/queue')).status).toBe(401);
    expect((await get('/api/review/queue', nurse)).status).toBe(403);
    expect((await get('/api/review/queue', admin)).status).toBe(403);
  });
});

describe('review item and teaching notes', () => {
  let flagId: string;
  let nurseId: string;
  beforeAll(async () => {
    const res = await get('/api/review/queue?kind=gap&unitId=unit-north', educator);
    const item = res.body.items.find((i: { nurse: { id: string } | null; firstActionAt: string | null }) => i.nurse?.id === 'u-nurse' && i.firstActionAt);
    flagId = item.flagId;
    nurseId = item.nurse.id;
  });

  it('shows the readings around the event, the actions with times, and audits the read', async () => {
    const before = count(env.database, 'audit_events');
    const res = await get(`/api/review/items/${flagId}`, educator);
    expect(res.status).toBe(200);
    expect(res.body.readings.some((r: { raisedFlag: boolean }) => r.raisedFlag)).toBe(true);
    expect(res.body.actions.length).toBeGreaterThanOrEqual(1);
    expect(res.body.actions[0]).toEqual(expect.objectContaining({ kind: expect.any(String), at: expect.any(String) }));
    expect(res.body.detail.gapCenti).toBeGreaterThan(50);
    expect(count(env.database, 'audit_events')).toBe(before + 1);
  });

  it('404 for an unknown item, 403 for another unit', async () => {
    expect((await get('/api/review/items/no-such-flag', educator)).status).toBe(404);
    const southFlag = env.database.sqlite.prepare("SELECT id FROM flags WHERE unit_id = 'unit-south' AND kind IN ('gap','overdue-check') LIMIT 1").get() as { id: string };
    env.database.sqlite.prepare("DELETE FROM user_units WHERE user_id = 'u-educator' AND unit_id = 'unit-south'").run();
    try {
      expect((await get(`/api/review/items/${southFlag.id}`, educator)).status).toBe(403);
      const post = await request(env.app).post(`/api/review/items/${southFlag.id}/notes`).set('Authorization', `Bearer ${educator}`).send({ note: 'Good catch on the cover.' });
      expect(post.status).toBe(403);
    } finally {
      env.database.sqlite.prepare("INSERT INTO user_units (user_id, unit_id) VALUES ('u-educator', 'unit-south')").run();
    }
  });

  it('a teaching note is appended, audited, marks the item reviewed and reaches the nurse concerned', async () => {
    const reviews = count(env.database, 'reviews');
    const res = await request(env.app)
      .post(`/api/review/items/${flagId}/notes`)
      .set('Authorization', `Bearer ${educator}`)
      .send({ note: 'Good catch: recheck within 30 minutes next time.' });
    expect(res.status).toBe(201);
    expect(res.body.review).toEqual(
      expect.objectContaining({ flagId, note: 'Good catch: recheck within 30 minutes next time.', reviewer: { id: 'u-educator', name: 'Priya Raman' } }),
    );
    expect(count(env.database, 'reviews')).toBe(reviews + 1);
    env.clock.advanceMinutes(1);
    const second = await request(env.app).post(`/api/review/items/${flagId}/notes`).set('Authorization', `Bearer ${educator}`).send({ note: 'Discussed at handover.' });
    expect(second.status).toBe(201);
    const detail = await get(`/api/review/items/${flagId}`, educator);
    expect(detail.body.reviews.map((r: { note: string }) => r.note)).toEqual(['Good catch: recheck within 30 minutes next time.', 'Discussed at handover.']);
    const reviewed = await get('/api/review/queue?status=reviewed', educator);
    expect(reviewed.body.items.map((i: { flagId: string }) => i.flagId)).toEqual([flagId]);

    expect(nurseId).toBe('u-nurse');
    const mine = await get('/api/reviews/mine', nurse);
    expect(mine.status).toBe(200);
    expect(mine.body.notes.map((n: { note: string }) => n.note)).toEqual(['Discussed at handover.', 'Good catch: recheck within 30 minutes next time.']);
    const other = await get('/api/reviews/mine', await env.signIn(DEMO.southNurse));
    expect(other.body.notes).toEqual([]);
    expect((await get('/api/reviews/mine')).status).toBe(401);
  });

  it('refuses an empty note with the field, writing nothing; nurses and admins cannot write notes', async () => {
    const reviews = count(env.database, 'reviews');
    const res = await request(env.app).post(`/api/review/items/${flagId}/notes`).set('Authorization', `Bearer ${educator}`).send({ note: '  ' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.note).toBeDefined();
    const extra = await request(env.app).post(`/api/review/items/${flagId}/notes`).set('Authorization', `Bearer ${educator}`).send({ note: 'Fine note', reviewerId: 'x' });
    expect(extra.status).toBe(400);
    expect((await request(env.app).post(`/api/review/items/${flagId}/notes`).set('Authorization', `Bearer ${nurse}`).send({ note: 'Self review' })).status).toBe(403);
    expect((await request(env.app).post(`/api/review/items/${flagId}/notes`).set('Authorization', `Bearer ${admin}`).send({ note: 'Admin note' })).status).toBe(403);
    expect((await request(env.app).post(`/api/review/items/${flagId}/notes`).send({ note: 'Anon note' })).status).toBe(401);
    expect((await request(env.app).post('/api/review/items/nope/notes').set('Authorization', `Bearer ${educator}`).send({ note: 'Lost note' })).status).toBe(404);
    expect(count(env.database, 'reviews')).toBe(reviews);
  });

  it('educators never chart', async () => {
    const res = await request(env.app).post('/api/infants/inf-ashgrove/readings').set('Authorization', `Bearer ${educator}`).send({});
    expect([403, 404]).toContain(res.status);
    expect(res.status).not.toBe(201);
  });
});

describe('review queue page cap (OWASP API4:2023)', () => {
  it('returns at most `limit` items with the full count, and refuses a limit over the cap', async () => {
    const all = await get('/api/review/queue', educator);
    expect(all.body.total).toBe(all.body.items.length);
    const one = await get('/api/review/queue?limit=1', educator);
    expect(one.status).toBe(200);
    expect(one.body.items).toHaveLength(1);
    expect(one.body.total).toBe(all.body.total);
    const tooMany = await get('/api/review/queue?limit=501', educator);
    expect(tooMany.status).toBe(400);
    expect(tooMany.body.error.fields).toHaveProperty('limit');
  });
});

describe('the demo for the educator', () => {
  // The demo is laid down relative to the hour it is seeded; an educator trying the review queue
  // at any hour must find caught gaps on night shifts as well as day shifts to filter and open.
  it.each(['2026-12-02T00:20:00Z', '2026-12-02T08:03:00Z', '2026-12-02T13:40:00Z', '2026-12-02T19:10:00Z'])('has gap flags on both shifts when seeded at %s', async (iso) => {
    const demo = await makeEnv({ now: new Date(iso) });
    try {
      const token = await demo.signIn(DEMO.educator);
      for (const shift of ['night', 'day']) {
        const res = await request(demo.app).get(`/api/review/queue?shift=${shift}&kind=gap`).set('Authorization', `Bearer ${token}`);
        expect(res.status).toBe(200);
        expect(res.body.total).toBeGreaterThan(0);
      }
    } finally {
      demo.close();
    }
  });
});

describe('review queue paging and search', () => {
  /** The queue's flags counted straight from the tables (the review kinds, both units). */
  const storedFlags = () =>
    (
      env.database.sqlite
        .prepare("SELECT COUNT(*) AS n FROM flags WHERE kind IN ('gap', 'overdue-check', 'heat-stress', 'manual-mode', 'cold-stress', 'fever', 'skin-to-skin-deviation')")
        .get() as { n: number }
    ).n;

  it('walks every item page by page with nextCursor: none twice, none left out, newest first', async () => {
    const seen: string[] = [];
    const raised: string[] = [];
    let cursor: string | null = null;
    let pages = 0;
    do {
      const res = await get(`/api/review/queue?status=all&limit=7${cursor ? `&cursor=${cursor}` : ''}`, educator);
      expect(res.status).toBe(200);
      expect(res.body.items.length).toBeLessThanOrEqual(7);
      expect(res.body.total).toBe(storedFlags());
      for (const i of res.body.items) {
        seen.push(i.flagId);
        raised.push(i.raisedAt);
      }
      cursor = res.body.nextCursor;
      pages += 1;
    } while (cursor && pages < 100);
    expect(pages).toBe(Math.ceil(storedFlags() / 7));
    expect(new Set(seen).size).toBe(seen.length);
    expect(seen.length).toBe(storedFlags());
    expect([...raised].sort().reverse()).toEqual(raised);
    expect((await get('/api/review/queue?cursor=not*valid', educator)).status).toBe(400);
  });

  it('searches by infant name, bed label or hospital number', async () => {
    const byName = await get('/api/review/queue?status=all&q=ashgrove', educator);
    expect(byName.body.items.length).toBeGreaterThan(0);
    for (const i of byName.body.items) expect(i.infantName).toBe('Baby Ashgrove');
    const byBed = await get('/api/review/queue?status=all&q=N03', educator);
    expect(byBed.body.items.length).toBeGreaterThan(0);
    for (const i of byBed.body.items) expect(i.bedLabel).toBe('N03');
    const number = (env.database.sqlite.prepare("SELECT hospital_number FROM infants WHERE id = 'inf-ashgrove'").get() as { hospital_number: string }).hospital_number;
    const byNumber = await get(`/api/review/queue?status=all&q=${number}`, educator);
    expect(byNumber.body.items.map((i: { infantId: string }) => i.infantId)).toEqual(byName.body.items.map((i: { infantId: string }) => i.infantId));
    expect((await get('/api/review/queue?status=all&q=nobody-here', educator)).body.items).toEqual([]);
  });
});
