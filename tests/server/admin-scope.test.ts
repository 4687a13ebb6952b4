import request from 'supertest';
import { DEMO, makeEnv, type TestEnv } from './helpers';

/**
 * An administrator acts only inside their units (OWASP ASVS 4.0.3 V4.1.3, least privilege;
 * OWASP API Security Top 10 2023 API5, broken function-level authorisation). The demo's educator
 * works in North and South; a North-only administrator may see her (they share North) but may not
 * change her, since a new role, unit set or status, or a reset link, would act in South too.
 */

let env: TestEnv;
let northAdmin: string;
let bothAdmin: string;
const NORTH_ADMIN = 'halvard.brenn@warmfold.test';

beforeAll(async () => {
  env = await makeEnv();
  const { sqlite } = env.database;
  // A North-only administrator with the demo password (the hash is copied from a demo account).
  const hash = (sqlite.prepare("SELECT password_hash AS h FROM users WHERE id = 'u-admin'").get() as { h: string }).h;
  sqlite
    .prepare(
      "INSERT INTO users (id, email, name, role, password_hash, temp_unit, active, session_version, created_at, updated_at) VALUES ('u-admin-north', ?, 'Halvard Brenn', 'admin', ?, 'C', 1, 1, 0, 0)",
    )
    .run(NORTH_ADMIN, hash);
  sqlite.prepare("INSERT INTO user_units (user_id, unit_id) VALUES ('u-admin-north', 'unit-north')").run();
  [northAdmin, bothAdmin] = await Promise.all([env.signIn(NORTH_ADMIN), env.signIn(DEMO.admin)]);
});
afterAll(() => env.close());

const as = (token: string, method: 'get' | 'post' | 'patch', path: string, body?: object) => {
  const r = request(env.app)[method](path).set('Authorization', `Bearer ${token}`);
  return body ? r.send(body) : r;
};
const userRow = (id: string) =>
  env.database.sqlite.prepare('SELECT role, active, name, session_version FROM users WHERE id = ?').get(id) as {
    role: string;
    active: number;
    name: string;
    session_version: number;
  };
const unitsOf = (id: string) =>
  (env.database.sqlite.prepare('SELECT unit_id FROM user_units WHERE user_id = ? ORDER BY unit_id').all(id) as { unit_id: string }[]).map((r) => r.unit_id);
const events = (action: string, entityId: string) =>
  env.database.sqlite.prepare('SELECT actor_id, before, after FROM audit_events WHERE action = ? AND entity_id = ? ORDER BY id').all(action, entityId) as {
    actor_id: string;
    before: string | null;
    after: string | null;
  }[];
const tokens = (userId: string) => (env.database.sqlite.prepare('SELECT COUNT(*) AS n FROM email_tokens WHERE user_id = ?').get(userId) as { n: number }).n;

describe('a North-only administrator and a North+South educator', () => {
  it('sees the educator, marked as someone they cannot change', async () => {
    const res = await as(northAdmin, 'get', '/api/admin/users');
    expect(res.status).toBe(200);
    const priya = res.body.users.find((u: { id: string }) => u.id === 'u-educator');
    expect(priya).toEqual(expect.objectContaining({ unitIds: ['unit-north', 'unit-south'], manageable: false }));
    expect(res.body.users.find((u: { id: string }) => u.id === 'u-nurse-2')).toEqual(expect.objectContaining({ manageable: true }));
    // South-only people are not listed at all.
    expect(res.body.users.some((u: { id: string }) => u.id === 'u-nurse-3')).toBe(false);
    // The administrator of both units may change her.
    const both = await as(bothAdmin, 'get', '/api/admin/users');
    expect(both.body.users.find((u: { id: string }) => u.id === 'u-educator').manageable).toBe(true);
  });

  it('cannot make her an administrator, so she can never change South settings through it', async () => {
    const before = userRow('u-educator');
    const res = await as(northAdmin, 'patch', '/api/admin/users/u-educator', { role: 'admin' });
    expect(res.status).toBe(403);
    expect(res.body.error.message).toMatch(/Priya Raman also works in Special Care South, which you do not administer/);
    expect(userRow('u-educator')).toEqual(before);
    expect(events('user-updated', 'u-educator')).toHaveLength(0);
    // She is still an educator: South's settings stay out of her reach.
    const priya = await env.signIn(DEMO.educator);
    const settings = await as(priya, 'patch', '/api/admin/units/unit-south', { checkIntervalMinutes: 240 });
    expect(settings.status).toBe(403);
    const south = env.database.sqlite.prepare("SELECT check_interval_minutes AS m FROM units WHERE id = 'unit-south'").get() as { m: number };
    expect(south.m).not.toBe(240);
  });

  it('cannot change her units, name or status, nor send her a link; the refusal comes before validation', async () => {
    const before = userRow('u-educator');
    const links = tokens('u-educator');
    const attempts = [
      as(northAdmin, 'patch', '/api/admin/users/u-educator', { unitIds: ['unit-north'] }),
      as(northAdmin, 'patch', '/api/admin/users/u-educator', { name: 'Priya R.' }),
      as(northAdmin, 'patch', '/api/admin/users/u-educator', { role: 'wizard' }),
      as(northAdmin, 'post', '/api/admin/users/u-educator/deactivate'),
      as(northAdmin, 'post', '/api/admin/users/u-educator/password-reset'),
      as(northAdmin, 'post', '/api/admin/users/u-educator/invitation'),
    ];
    for (const res of await Promise.all(attempts)) {
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('forbidden');
      expect(res.body.error.message).toMatch(/Special Care South/);
    }
    expect(userRow('u-educator')).toEqual(before);
    expect(unitsOf('u-educator')).toEqual(['unit-north', 'unit-south']);
    expect(tokens('u-educator')).toBe(links);
  });

  it('a South-only person answers 403 without naming their unit', async () => {
    const res = await as(northAdmin, 'post', '/api/admin/users/u-nurse-3/deactivate');
    expect(res.status).toBe(403);
    expect(res.body.error.message).not.toMatch(/South/);
    expect(userRow('u-nurse-3').active).toBe(1);
  });

  it('cannot place anyone in South, nor move a North nurse there', async () => {
    const created = await as(northAdmin, 'post', '/api/admin/users', {
      name: 'Odile Marsh',
      email: 'odile.marsh@warmfold.test',
      role: 'nurse',
      unitIds: ['unit-north', 'unit-south'],
    });
    expect(created.status).toBe(403);
    const moved = await as(northAdmin, 'patch', '/api/admin/users/u-nurse-2', { unitIds: ['unit-south'] });
    expect(moved.status).toBe(403);
    expect(unitsOf('u-nurse-2')).toEqual(['unit-north']);
  });
});

describe("changes inside the administrator's units are audited with before and after", () => {
  it('a role change of a North-only nurse', async () => {
    const res = await as(northAdmin, 'patch', '/api/admin/users/u-nurse-4', { role: 'charge' });
    expect(res.status).toBe(200);
    const [event] = events('user-updated', 'u-nurse-4');
    expect(event!.actor_id).toBe('u-admin-north');
    expect(JSON.parse(event!.before!)).toEqual({ name: 'Inês Carvalho', role: 'nurse', unitIds: ['unit-north'] });
    expect(JSON.parse(event!.after!)).toEqual({ name: 'Inês Carvalho', role: 'charge', unitIds: ['unit-north'] });
  });

  it('a deactivation and the reactivation', async () => {
    expect((await as(northAdmin, 'post', '/api/admin/users/u-nurse-4/deactivate')).status).toBe(200);
    expect((await as(northAdmin, 'post', '/api/admin/users/u-nurse-4/reactivate')).status).toBe(200);
    expect(events('user-deactivated', 'u-nurse-4').map((e) => [JSON.parse(e.before!), JSON.parse(e.after!)])).toEqual([[{ active: true }, { active: false }]]);
    expect(events('user-reactivated', 'u-nurse-4').map((e) => [JSON.parse(e.before!), JSON.parse(e.after!)])).toEqual([[{ active: false }, { active: true }]]);
  });

  it('the administrator of both units may change the educator (the refusal is about scope, not the person)', async () => {
    const res = await as(bothAdmin, 'patch', '/api/admin/users/u-educator', { unitIds: ['unit-north'] });
    expect(res.status).toBe(200);
    const [event] = events('user-updated', 'u-educator');
    expect(JSON.parse(event!.before!).unitIds).toEqual(['unit-north', 'unit-south']);
    expect(JSON.parse(event!.after!).unitIds).toEqual(['unit-north']);
    // Now North-only, she is within the North administrator's reach.
    expect((await as(northAdmin, 'patch', '/api/admin/users/u-educator', { role: 'nurse' })).status).toBe(200);
  });
});

describe('the roster preview does not reveal accounts in other units', () => {
  const upload = (csv: string) => as(northAdmin, 'post', '/api/admin/roster/preview').attach('file', Buffer.from(csv), { filename: 'roster.csv', contentType: 'text/csv' });

  it('an address with an account only in South reads like a new address; one in North is shown as existing', async () => {
    const csv = [
      'name,email,role,unit',
      'Sunniva Hale,sunniva.hale@warmfold.test,nurse,unit-north', // a South-only account
      'Brand Newcombe,brand.newcombe@warmfold.test,nurse,unit-north', // nobody
      'Nia Okafor,nia.okafor@warmfold.test,nurse,unit-north', // a North account
    ].join('\n');
    const res = await upload(csv);
    expect(res.status).toBe(201);
    const [south, fresh, north] = res.body.rows as Record<string, unknown>[];
    const shape = (r: Record<string, unknown>) => ({ action: r.action, note: r.note, errors: r.errors });
    expect(shape(south!)).toEqual(shape(fresh!));
    expect(shape(fresh!)).toEqual({ action: 'create', note: undefined, errors: [] });
    expect(north).toEqual(expect.objectContaining({ action: 'skip', note: 'Already has an account' }));

    // Importing leaves the South account as it was: no new unit, no link.
    const linksBefore = tokens('u-nurse-3');
    const imp = await as(northAdmin, 'post', `/api/admin/roster/${res.body.upload.id}/import`);
    expect(imp.status).toBe(200);
    expect(unitsOf('u-nurse-3')).toEqual(['unit-south']);
    expect(tokens('u-nurse-3')).toBe(linksBefore);
    const created = env.database.sqlite.prepare("SELECT COUNT(*) AS n FROM users WHERE email = 'brand.newcombe@warmfold.test'").get() as { n: number };
    expect(created.n).toBe(1);
  });
});
