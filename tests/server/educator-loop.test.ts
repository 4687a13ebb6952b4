/**
 * The educator's loop after the note: the nurse acknowledges it and the educator sees when;
 * amendments and withdrawal are append-only versions; "no teaching point" closes an item
 * without a note and leaves the flag's own lifecycle alone; per-nurse summary, trends by week
 * or month and a comparison of two periods, with the conventional median.
 */
import request from 'supertest';
import { median as referenceMedian } from 'simple-statistics';
import { median, periodsOf } from '../../shared/reports';
import { digestTime, sendWeeklyDigests } from '../../server/services/digest';
import { count, DEMO, makeEnv, type TestEnv } from './helpers';

let env: TestEnv;
let educator: string;
let nurse: string;
let charge: string;
beforeAll(async () => {
  env = await makeEnv();
  [educator, nurse, charge] = await Promise.all([env.signIn(DEMO.educator), env.signIn(DEMO.nurse), env.signIn(DEMO.charge)]);
});
afterAll(() => env.close());

const get = (path: string, token: string) => request(env.app).get(path).set('Authorization', `Bearer ${token}`);
const post = (path: string, token: string, body: object = {}) => request(env.app).post(path).set('Authorization', `Bearer ${token}`).send(body);

interface Item {
  flagId: string;
  kind: string;
  nurse: { id: string; name: string } | null;
  reviewState: string;
  closedAt: string | null;
  minutesToFirstAction: number | null;
  withdrawn?: boolean;
  summary: string;
}

async function queue(query = ''): Promise<Item[]> {
  const res = await get(`/api/review/queue?unitId=unit-north&limit=500${query}`, educator);
  expect(res.status).toBe(200);
  return res.body.items;
}

describe('the conventional median', () => {
  it('is the mean of the two middle values for an even count (NIST/SEMATECH e-Handbook of Statistical Methods, 1.3.5.1; a spreadsheet MEDIAN)', () => {
    expect(median([6, 7, 8, 9])).toBe(7.5);
    expect(median([9, 6, 8, 7])).toBe(7.5);
    expect(median([3, 1, 2])).toBe(2);
    expect(median([])).toBeNull();
  });

  it('agrees with simple-statistics (an independent implementation) on assorted samples', () => {
    const samples = [[1], [4, 1], [10, 2, 38, 23, 38, 23, 21], [0, 0, 5, 5], [1.5, 2.25, 90, 3, 7, 12]];
    for (const s of samples) expect(median(s)).toBeCloseTo(referenceMedian(s), 10);
  });
});

describe('weeks and months of a range', () => {
  it('cuts at Mondays and at the first of the month, each period inside the range (calendar: 1 Nov 2026 is a Sunday)', () => {
    expect(periodsOf('2026-11-01', '2026-11-16', 'week')).toEqual([
      { label: 'week of 2026-10-26', from: '2026-11-01', to: '2026-11-01' },
      { label: 'week of 2026-11-02', from: '2026-11-02', to: '2026-11-08' },
      { label: 'week of 2026-11-09', from: '2026-11-09', to: '2026-11-15' },
      { label: 'week of 2026-11-16', from: '2026-11-16', to: '2026-11-16' },
    ]);
    expect(periodsOf('2026-10-20', '2026-12-05', 'month')).toEqual([
      { label: '2026-10', from: '2026-10-20', to: '2026-10-31' },
      { label: '2026-11', from: '2026-11-01', to: '2026-11-30' },
      { label: '2026-12', from: '2026-12-01', to: '2026-12-05' },
    ]);
  });
});

describe('a teaching note, acknowledged, amended and withdrawn', () => {
  let flagId: string;
  let reviewId: string;
  beforeAll(async () => {
    const item = (await queue('&kind=gap')).find((i) => i.nurse?.id === 'u-nurse' && !i.withdrawn)!;
    flagId = item.flagId;
    const res = await post(`/api/review/items/${flagId}/notes`, educator, { note: 'Check the probe site when the gap widens.' });
    expect(res.status).toBe(201);
    reviewId = res.body.review.id;
    expect(res.body.review).toEqual(expect.objectContaining({ version: 1, acknowledged: null, withdrawn: null }));
  });

  it('only the nurse it is for can acknowledge it; the educator then sees that she did, and when', async () => {
    expect((await post(`/api/reviews/${reviewId}/acknowledge`, charge)).status).toBe(403);
    expect((await post(`/api/reviews/${reviewId}/acknowledge`, educator)).status).toBe(403);
    const mine = await get('/api/reviews/mine', nurse);
    expect(mine.body.notes.find((n: { id: string }) => n.id === reviewId).acknowledged).toBeNull();
    env.clock.set(new Date('2026-11-16T10:20:00Z'));
    const ack = await post(`/api/reviews/${reviewId}/acknowledge`, nurse);
    expect(ack.status).toBe(201);
    const item = await get(`/api/review/items/${flagId}`, educator);
    const note = item.body.reviews.find((n: { id: string }) => n.id === reviewId);
    expect(note.acknowledged).toEqual({ at: '2026-11-16T10:20:00.000Z', by: { id: 'u-nurse', name: expect.any(String) }, version: 1 });
    expect(item.body.item.reviewState).toBe('acknowledged');
  });

  it('an amendment is a new version; the first text stays; the acknowledgement must be given again', async () => {
    const before = count(env.database, 'review_events');
    const res = await post(`/api/reviews/${reviewId}/amend`, educator, { note: 'Check the probe site and the incubator humidity when the gap widens.' });
    expect(res.status).toBe(201);
    expect(res.body.review.version).toBe(2);
    expect(res.body.review.versions.map((v: { note: string }) => v.note)).toEqual([
      'Check the probe site when the gap widens.',
      'Check the probe site and the incubator humidity when the gap widens.',
    ]);
    expect(res.body.review.acknowledged).toBeNull();
    expect(count(env.database, 'review_events')).toBe(before + 1);
    const stored = env.database.sqlite.prepare('SELECT note FROM reviews WHERE id = ?').get(reviewId) as { note: string };
    expect(stored.note).toBe('Check the probe site when the gap widens.');
    const mine = await get('/api/reviews/mine', nurse);
    expect(mine.body.notes.find((n: { id: string }) => n.id === reviewId).note).toContain('humidity');
    expect((await get(`/api/review/items/${flagId}`, educator)).body.item.reviewState).toBe('noted');
    // Unchanged text and an unsafe note are refused with the field named.
    const same = await post(`/api/reviews/${reviewId}/amend`, educator, { note: 'Check the probe site and the incubator humidity when the gap widens.' });
    expect(same.status).toBe(400);
    expect(same.body.error.fields.note).toBeDefined();
  });

  it('review events are append-only in the database', () => {
    expect(() => env.database.sqlite.prepare("UPDATE review_events SET note = 'x'").run()).toThrow(/append-only/);
    expect(() => env.database.sqlite.prepare('DELETE FROM review_events').run()).toThrow(/append-only/);
  });

  it('a withdrawn note leaves the nurse’s list, stays in the record, and cannot be withdrawn twice', async () => {
    const res = await post(`/api/reviews/${reviewId}/withdraw`, educator, { reason: 'Written on the wrong item.' });
    expect(res.status).toBe(201);
    expect(res.body.review.withdrawn).toEqual(expect.objectContaining({ reason: 'Written on the wrong item.' }));
    const mine = await get('/api/reviews/mine', nurse);
    expect(mine.body.notes.some((n: { id: string }) => n.id === reviewId)).toBe(false);
    const item = await get(`/api/review/items/${flagId}`, educator);
    expect(item.body.reviews.find((n: { id: string }) => n.id === reviewId).withdrawn).not.toBeNull();
    expect(item.body.item.reviewState).toBe('unreviewed');
    expect((await post(`/api/reviews/${reviewId}/withdraw`, educator)).status).toBe(409);
    expect((await post(`/api/reviews/${reviewId}/acknowledge`, nurse)).status).toBe(409);
    // The flags CSV keeps the note, marked as amended and withdrawn.
    const csv = await get('/api/exports/flags.csv?unitId=unit-north&kind=gap&status=all', educator);
    expect(csv.text).toContain('humidity when the gap widens. (amended, version 2) (withdrawn)');
  });
});

describe('no teaching point', () => {
  it('closes the review item without a note and leaves the flag’s lifecycle as it was', async () => {
    const item = (await queue('&status=unreviewed')).find((i) => !i.withdrawn)!;
    const notesBefore = count(env.database, 'reviews');
    const res = await post(`/api/review/items/${item.flagId}/no-teaching-point`, educator, {});
    expect(res.status).toBe(201);
    expect(res.body.reviewState).toBe('no-teaching-point');
    expect(count(env.database, 'reviews')).toBe(notesBefore);
    const detail = await get(`/api/review/items/${item.flagId}`, educator);
    expect(detail.body.item.reviewState).toBe('no-teaching-point');
    expect(detail.body.item.closedAt).toBe(item.closedAt);
    expect(detail.body.noTeachingPoint).toEqual(expect.objectContaining({ by: expect.objectContaining({ name: expect.any(String) }) }));
    expect((await queue('&status=reviewed')).map((i) => i.flagId)).toContain(item.flagId);
    expect((await queue('&status=unreviewed')).map((i) => i.flagId)).not.toContain(item.flagId);
    expect((await post(`/api/review/items/${item.flagId}/no-teaching-point`, educator, {})).status).toBe(409);
  });
});

describe('per-nurse summary, trends and comparison', () => {
  const range = 'unitId=unit-north&from=2026-10-01&to=2026-11-16';

  it('per nurse: flags by kind and review outcomes add up, with the conventional median checked against simple-statistics', async () => {
    const res = await get(`/api/review/nurses?${range}`, educator);
    expect(res.status).toBe(200);
    const items = (await queue('&from=2026-10-01&to=2026-11-16')).filter((i) => !i.withdrawn);
    for (const row of res.body.nurses) {
      const mine = items.filter((i) => i.nurse?.id === row.nurse.id);
      expect(row.flags).toBe(mine.length);
      expect(Object.values(row.byKind as Record<string, number>).reduce((a, b) => a + b, 0)).toBe(row.flags);
      expect(row.noted + row.noTeachingPoint + row.unreviewed).toBe(row.flags);
      const minutes = mine.filter((i) => i.minutesToFirstAction !== null).map((i) => i.minutesToFirstAction!);
      if (minutes.length) expect(row.medianMinutesToAction).toBeCloseTo(referenceMedian(minutes), 10);
      else expect(row.medianMinutesToAction).toBeNull();
    }
    expect(res.body.nurses.reduce((a: number, r: { noTeachingPoint: number }) => a + r.noTeachingPoint, 0)).toBeGreaterThanOrEqual(0);
  });

  it('weekly trends add up to the whole range’s report; a comparison side equals the report of its range', async () => {
    const trends = await get(`/api/reports/trends?${range}&by=week`, educator);
    expect(trends.status).toBe(200);
    expect(trends.body.periods[0].label).toBe('week of 2026-09-28');
    const whole = await get(`/api/reports?${range}`, educator);
    const sum = (k: string) => trends.body.periods.reduce((a: number, p: Record<string, number>) => a + p[k]!, 0);
    expect(sum('checks')).toBe(whole.body.report.onTime.overall.checks);
    expect(sum('onTime')).toBe(whole.body.report.onTime.overall.onTime);
    expect(sum('gapFlags')).toBe(whole.body.report.gapRate.gapFlags);
    const compare = await get('/api/reports/compare?unitId=unit-north&aFrom=2026-11-01&aTo=2026-11-08&bFrom=2026-11-09&bTo=2026-11-16', educator);
    expect(compare.status).toBe(200);
    const b = await get('/api/reports?unitId=unit-north&from=2026-11-09&to=2026-11-16', educator);
    expect(compare.body.b.checks).toBe(b.body.report.onTime.overall.checks);
    expect(compare.body.b.medianMinutesToAction).toBe(b.body.report.responseTimes[0].toFirstAction.medianMinutes);
  });

  it('a reversed range is a 400 naming the field', async () => {
    const trends = await get('/api/reports/trends?unitId=unit-north&from=2026-11-10&to=2026-11-01', educator);
    expect(trends.status).toBe(400);
    expect(trends.body.error.fields.to).toBeDefined();
    const compare = await get('/api/reports/compare?unitId=unit-north&aFrom=2026-11-08&aTo=2026-11-01&bFrom=2026-11-09&bTo=2026-11-16', educator);
    expect(compare.status).toBe(400);
    expect(compare.body.error.fields.aTo).toBeDefined();
    const nurses = await get('/api/review/nurses?unitId=unit-north&from=2026-11-10&to=2026-11-01', educator);
    expect(nurses.body.error.fields.to).toBeDefined();
  });

  it('another unit is refused', async () => {
    expect((await get('/api/review/nurses?unitId=unit-nowhere&from=2026-11-01&to=2026-11-02', educator)).status).toBe(403);
    expect((await get('/api/reports/trends?unitId=unit-nowhere&from=2026-11-01&to=2026-11-02', educator)).status).toBe(403);
  });
});

describe('review text in the viewer’s unit', () => {
  it('an educator who chose °F reads the queue’s summaries in °F, none in °C', async () => {
    expect((await request(env.app).patch('/api/auth/me/preferences').set('Authorization', `Bearer ${educator}`).send({ tempUnit: 'F' })).status).toBe(200);
    const items = await queue('&kind=gap');
    expect(items.length).toBeGreaterThan(0);
    for (const i of items) {
      expect(i.summary).toContain('°F');
      expect(i.summary).not.toContain('°C');
    }
    await request(env.app).patch('/api/auth/me/preferences').set('Authorization', `Bearer ${educator}`).send({ tempUnit: 'C' });
  });
});

describe('the weekly digest in the unit’s zone and the reader’s settings', () => {
  it('formats a time in the unit’s zone on a 12- or 24-hour clock (13:05 UTC on 16 Nov 2026 is 08:05 in New York, EST = UTC−5, IANA tz database)', () => {
    expect(digestTime('2026-11-16T13:05:00Z', 'America/New_York', '24h')).toBe('16 Nov, 08:05');
    expect(digestTime('2026-11-16T13:05:00Z', 'America/New_York', '12h').toLowerCase()).toBe('16 nov, 8:05 am');
    expect(digestTime('2026-07-16T13:05:00Z', 'Europe/London', '24h')).toBe('16 Jul, 14:05'); // BST = UTC+1
  });

  it('the e-mail names the zone, lists no UTC times, and shows °F to an educator who chose it', async () => {
    await request(env.app).patch('/api/auth/me/preferences').set('Authorization', `Bearer ${educator}`).send({ tempUnit: 'F', clock: '12h' });
    env.mailer.sent.length = 0;
    await sendWeeklyDigests(env.app.context, new Date('2026-11-16T10:00:00Z'), { unitIds: ['unit-north'], force: true });
    const mail = env.mailer.sent.find((m) => m.to.includes(DEMO.educator))!;
    expect(mail.text).toContain('time zone, Europe/London');
    expect(mail.text).not.toContain('UTC');
    const itemLines = mail.text.split('\n').filter((l) => l.startsWith('  ') && l.includes(' shift · '));
    expect(itemLines.length).toBeGreaterThan(0);
    for (const l of itemLines) {
      expect(l).toMatch(/^ {2}\d{1,2} \w{3}, \d{1,2}:\d{2} (am|pm|AM|PM) · /);
      expect(l).not.toContain('°C');
    }
    await request(env.app).patch('/api/auth/me/preferences').set('Authorization', `Bearer ${educator}`).send({ tempUnit: 'C', clock: '24h' });
  });
});
