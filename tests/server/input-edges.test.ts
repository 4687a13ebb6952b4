import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import request from 'supertest';
import { safeNote, safeText, unsafeTextReason } from '../../shared/schemas/safe-text';
import { count, DEMO, makeEnv, type TestEnv } from './helpers';

/**
 * Input edges: text that cannot be stored faithfully or that misleads a reader, bodies that are
 * not JSON, and multipart bodies that cannot be parsed. Each is refused with the field named and
 * nothing written.
 */

let env: TestEnv;
let nurse: string;
let charge: string;
let educator: string;
let admin: string;
beforeAll(async () => {
  env = await makeEnv();
  [nurse, charge, educator, admin] = await Promise.all([env.signIn(DEMO.nurse), env.signIn(DEMO.charge), env.signIn(DEMO.educator), env.signIn(DEMO.admin)]);
});
afterAll(() => env.close());

const TABLES = ['readings', 'actions', 'infants', 'users', 'reviews', 'skin_to_skin_sessions', 'beds', 'uploads', 'audit_events'];
const snapshot = () => Object.fromEntries(TABLES.map((t) => [t, count(env.database, t)]));
const as = (token: string, method: 'post' | 'patch', url: string) => request(env.app)[method](url).set('Authorization', `Bearer ${token}`);
const openFlag = (infantId: string) =>
  (
    env.database.sqlite
      .prepare('SELECT f.id FROM flags f LEFT JOIN flag_resolutions r ON r.flag_id = f.id WHERE f.infant_id = ? AND r.flag_id IS NULL ORDER BY f.raised_at LIMIT 1')
      .get(infantId) as { id: string }
  ).id;
const aReading = (infantId: string) =>
  (env.database.sqlite.prepare('SELECT id FROM readings WHERE infant_id = ? ORDER BY taken_at DESC LIMIT 1').get(infantId) as { id: string }).id;

// Bad strings, each with where the rule comes from.
const LONE_HIGH = 'Probe re-sited \uD83D'; // RFC 8259 §8.2: an unpaired surrogate has no UTF-8 form
const LONE_LOW = '\uDC00 probe re-sited';
const BIDI_OVERRIDE = 'Set 36.5\u202E0.83'; // U+202E RIGHT-TO-LEFT OVERRIDE (Unicode UAX #9; CVE-2021-42574)
const BIDI_ISOLATE = 'Cover \u2066checked\u2069'; // U+2066..U+2069 isolates (UAX #9)
const NUL = 'Probe\u0000contact'; // C0 control NUL (ISO/IEC 6429)
const BELL = 'Probe\u0007contact';

describe('the shared safe-text rule', () => {
  it('refuses lone surrogates, bidi controls and C0 controls; keeps tab and newline only in multi-line text', () => {
    for (const bad of [LONE_HIGH, LONE_LOW, BIDI_OVERRIDE, BIDI_ISOLATE, NUL, BELL, 'a\u202Ab', 'a\u202Db', 'a\u2068b', 'a\u007Fb', 'a\u001Bb']) {
      expect(unsafeTextReason(bad, { multiline: true })).not.toBeNull();
      expect(unsafeTextReason(bad)).not.toBeNull();
    }
    // Multi-line notes keep tab, LF and CRLF (common practice for free-text notes); one-line fields do not.
    expect(unsafeTextReason('Skin dry.\r\nCover on\tagain', { multiline: true })).toBeNull();
    expect(unsafeTextReason('Baby\nAshgrove')).not.toBeNull();
    // Real text passes: a surrogate pair (U+1F476), accents, right-to-left letters without overrides.
    for (const good of ['Inês 👶', 'Zoë Ødegård', 'نور', 'Çağrı — 36,5 °C']) expect(unsafeTextReason(good)).toBeNull();
  });

  it('names the field through zod and trims after checking', () => {
    expect(safeText().max(5).safeParse('  ab  ').data).toBe('ab');
    const res = safeNote().safeParse(NUL);
    expect(res.success).toBe(false);
    expect(res.error!.issues[0]!.message).toMatch(/control character/);
  });
});

describe('free-text fields refuse what cannot be stored faithfully, naming the field, writing nothing', () => {
  it('a flag action whose note ends in a lone surrogate is a 400 on every try, never a stored row or a 409', async () => {
    const flagId = openFlag('inf-ashgrove');
    const body = { id: randomUUID(), kind: 'checked-probe-contact', note: LONE_HIGH };
    const before = snapshot();
    for (let attempt = 0; attempt < 2; attempt++) {
      const res = await as(nurse, 'post', `/api/flags/${flagId}/actions`).send(body);
      expect(res.status).toBe(400);
      expect(Object.keys(res.body.error.fields)).toEqual(['note']);
    }
    expect(snapshot()).toEqual(before);
    expect(env.database.sqlite.prepare('SELECT 1 FROM actions WHERE id = ?').get(body.id)).toBeUndefined();
    // The same note typed properly is stored as sent.
    const ok = await as(nurse, 'post', `/api/flags/${flagId}/actions`).send({ ...body, note: 'Probe re-sited 👶' });
    expect(ok.status).toBe(201);
    expect((env.database.sqlite.prepare('SELECT note FROM actions WHERE id = ?').get(body.id) as { note: string }).note).toBe('Probe re-sited 👶');
  });

  const cases: { what: string; token: () => string; method: 'post' | 'patch'; url: () => string; body: (bad: string) => object; field: string }[] = [
    {
      what: 'reading note',
      token: () => nurse,
      method: 'post',
      url: () => '/api/infants/inf-ashgrove/readings',
      body: (note) => ({ id: randomUUID(), unit: 'C', probe: 36.8, note }),
      field: 'note',
    },
    {
      what: 'late-entry reason',
      token: () => nurse,
      method: 'post',
      url: () => '/api/infants/inf-ashgrove/readings',
      body: (lateReason) => ({ id: randomUUID(), unit: 'C', probe: 36.8, lateReason }),
      field: 'lateReason',
    },
    {
      what: 'correction note',
      token: () => nurse,
      method: 'post',
      url: () => `/api/readings/${aReading('inf-ashgrove')}/corrections`,
      body: (note) => ({ id: randomUUID(), reason: 'corrected-value', note }),
      field: 'note',
    },
    {
      what: 'skin-to-skin carer',
      token: () => nurse,
      method: 'post',
      url: () => '/api/infants/inf-brightwater/skin-to-skin',
      body: (carer) => ({ id: randomUUID(), unit: 'C', reference: 36.7, limitCenti: 50, carer }),
      field: 'carer',
    },
    { what: 'discharge note', token: () => charge, method: 'post', url: () => '/api/infants/inf-elderbrook/discharge', body: (note) => ({ note }), field: 'note' },
    {
      what: 'admission display name',
      token: () => charge,
      method: 'post',
      url: () => '/api/units/unit-north/infants',
      body: (displayName) => ({
        bedId: 'bed-N12',
        displayName,
        birthAt: '2026-11-15T08:00:00Z',
        gestationWeeks: 34,
        gestationDays: 2,
        birthWeightGrams: 2100,
        heatSource: 'incubator',
        controlMode: 'air-servo',
        setTemperature: 33,
      }),
      field: 'displayName',
    },
    { what: 'teaching note', token: () => educator, method: 'post', url: () => `/api/review/items/${openFlag('inf-ashgrove')}/notes`, body: (note) => ({ note }), field: 'note' },
    {
      what: 'person name',
      token: () => admin,
      method: 'post',
      url: () => '/api/admin/users',
      body: (name) => ({ name, email: 'edge.case@warmfold.test', role: 'nurse', unitIds: ['unit-north'] }),
      field: 'name',
    },
    { what: 'unit name', token: () => admin, method: 'patch', url: () => '/api/admin/units/unit-north', body: (name) => ({ name }), field: 'name' },
    { what: 'bed label', token: () => admin, method: 'post', url: () => '/api/admin/units/unit-north/beds', body: (label) => ({ label }), field: 'label' },
  ];

  it.each(cases)('$what', async ({ token, method, url, body, field }) => {
    const before = snapshot();
    for (const bad of [LONE_HIGH, LONE_LOW, BIDI_OVERRIDE, BIDI_ISOLATE, NUL, BELL]) {
      const res = await as(token(), method, url()).send(body(bad));
      expect([res.status, res.body.error?.fields?.[field]]).toEqual([400, expect.any(String)]);
    }
    expect(snapshot()).toEqual(before);
  });

  it('a search typed into the review queue (kept in the audit event of the read) follows the same rule', async () => {
    const res = await request(env.app)
      .get(`/api/review/queue?q=${encodeURIComponent(BIDI_OVERRIDE)}`)
      .set('Authorization', `Bearer ${educator}`);
    expect(res.status).toBe(400);
    expect(res.body.error.fields.q).toEqual(expect.any(String));
  });

  it('a multi-line note keeps its line breaks and tab; a one-line name refuses a line break', async () => {
    const id = randomUUID();
    const note = 'Probe re-sited.\nSkin dry,\tcover on.';
    const res = await as(nurse, 'post', '/api/infants/inf-ashgrove/readings').send({ id, unit: 'C', probe: 36.8, note });
    expect(res.status).toBe(201);
    expect((env.database.sqlite.prepare('SELECT note FROM readings WHERE id = ?').get(id) as { note: string }).note).toBe(note);
    const named = await as(admin, 'post', '/api/admin/users').send({ name: 'Edge\nCase', email: 'edge.case@warmfold.test', role: 'nurse', unitIds: ['unit-north'] });
    expect(named.status).toBe(400);
    expect(named.body.error.fields.name).toMatch(/line break/);
  });
});

describe('bodies that are not JSON', () => {
  it('a text/plain discharge answers 415 and discharges nobody (its note would have been dropped)', async () => {
    const before = snapshot();
    const res = await as(charge, 'post', '/api/infants/inf-elderbrook/discharge').set('Content-Type', 'text/plain').send('{"note":"Home with parents"}');
    // RFC 9110 §15.5.16: 415 Unsupported Media Type for a content type the resource does not take.
    expect(res.status).toBe(415);
    expect(res.body.error.code).toBe('unsupported-media-type');
    expect(snapshot()).toEqual(before);
    expect((env.database.sqlite.prepare("SELECT status FROM infants WHERE id = 'inf-elderbrook'").get() as { status: string }).status).toBe('admitted');
  });

  it('a form-encoded or multipart body on a JSON route is 415 as well; JSON with a charset is fine', async () => {
    const form = await as(charge, 'post', '/api/infants/inf-elderbrook/discharge').type('form').send('note=Home');
    expect(form.status).toBe(415);
    const multipart = await as(charge, 'post', '/api/infants/inf-elderbrook/discharge').field('note', 'Home');
    expect(multipart.status).toBe(415);
    const flagId = openFlag('inf-brightwater');
    const json = await as(nurse, 'post', `/api/flags/${flagId}/actions`)
      .set('Content-Type', 'application/json; charset=utf-8')
      .send(JSON.stringify({ id: randomUUID(), kind: 'checked-probe-contact' }));
    expect(json.status).toBe(201);
  });

  it('an upload route takes multipart, not text/plain; the access rule still comes first', async () => {
    const plain = await as(admin, 'post', '/api/admin/roster/preview').set('Content-Type', 'text/plain').send('name,email,role,unit');
    expect(plain.status).toBe(415);
    const anonymous = await request(env.app).post('/api/infants/inf-elderbrook/discharge').set('Content-Type', 'text/plain').send('note');
    expect(anonymous.status).toBe(401);
  });

  it('a request without a body still works (deactivate, sign-out)', async () => {
    const res = await as(admin, 'post', '/api/admin/users/u-nurse-2/password-reset');
    expect(res.status).toBe(202);
  });
});

describe('multipart uploads (RFC 7578) that cannot be parsed answer 400 naming the file, never 500', () => {
  const BOUNDARY = 'wfBoundary7MA4YWxk';
  const ROSTER = 'name,email,role,unit\nTamsin Hollow,tamsin.hollow@warmfold.test,nurse,unit-north\n';
  const raw = (payload: string) =>
    as(admin, 'post', '/api/admin/roster/preview').set('Content-Type', `multipart/form-data; boundary=${BOUNDARY}`).send(Buffer.from(payload, 'utf8'));
  const filesIn = () => (fs.existsSync(path.join(env.dir, 'uploads')) ? fs.readdirSync(path.join(env.dir, 'uploads')).length : 0);
  const part = (disposition: string) =>
    `--${BOUNDARY}\r\nContent-Disposition: form-data; name="file"; ${disposition}\r\nContent-Type: text/csv\r\n\r\n${ROSTER}\r\n--${BOUNDARY}--\r\n`;

  it.each([
    ['a NUL byte in the file name (RFC 5987 encoded)', part("filename*=utf-8''ro%00ster.csv")],
    ['a NUL byte in the file name (raw)', part('filename="ro\u0000ster.csv"')],
    ['a bidi override in the file name', part("filename*=utf-8''roster%E2%80%AEvsc.csv")],
    ['a part without a Content-Disposition header', `--${BOUNDARY}\r\nGarbage\r\n\r\nx\r\n--${BOUNDARY}--\r\n`],
    ['a body cut short', `--${BOUNDARY}\r\nContent-Disposition: form-data; name="file"; filename="r.csv"\r\nContent-Type: text/csv\r\n\r\nname,email`],
  ])('%s', async (_what, payload) => {
    const before = snapshot();
    const files = filesIn();
    const res = await raw(payload);
    expect(res.status).toBe(400);
    expect(res.body.error.fields.file).toEqual(expect.any(String));
    expect(snapshot()).toEqual(before);
    expect(filesIn()).toBe(files);
  });

  it('a multipart type without a boundary', async () => {
    const res = await as(admin, 'post', '/api/admin/roster/preview').set('Content-Type', 'multipart/form-data').send(Buffer.from('x'));
    expect(res.status).toBe(400);
    expect(res.body.error.fields.file).toEqual(expect.any(String));
  });

  it('the same upload with a plain file name goes through', async () => {
    const res = await raw(part('filename="roster.csv"'));
    expect(res.status).toBe(201);
    expect(res.body.upload.filename).toBe('roster.csv');
  });
});
