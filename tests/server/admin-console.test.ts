import request from 'supertest';
import { DEMO, makeEnv, type TestEnv } from './helpers';

/**
 * The administrator's console through the real app over HTTP: unit memberships one at a time,
 * unit settings checked together, beds, new units, the people search and the audit-log viewer.
 * Least privilege (OWASP ASVS 4.0.3 V4.1.3): a North-only administrator sees and changes nothing
 * of South. Time zones: the IANA tz database's canonical names (IANA tz, "Zone" lines; links
 * such as "GB" and lower-case spellings are not canonical).
 */

let env: TestEnv;
let admin: string;
let northAdmin: string;
const NORTH_ADMIN = 'ines.varga@warmfold.test';

beforeAll(async () => {
  env = await makeEnv();
  const { sqlite } = env.database;
  const hash = (sqlite.prepare("SELECT password_hash AS h FROM users WHERE id = 'u-admin'").get() as { h: string }).h;
  sqlite
    .prepare(
      "INSERT INTO users (id, email, name, role, password_hash, temp_unit, active, session_version, created_at, updated_at) VALUES ('u-admin-north', ?, 'Ines Varga', 'admin', ?, 'C', 1, 1, 0, 0)",
    )
    .run(NORTH_ADMIN, hash);
  sqlite.prepare("INSERT INTO user_units (user_id, unit_id) VALUES ('u-admin-north', 'unit-north')").run();
  [admin, northAdmin] = await Promise.all([env.signIn(DEMO.admin), env.signIn(NORTH_ADMIN)]);
});
afterAll(() => env.close());

const as = (token: string, method: 'get' | 'post' | 'patch' | 'delete', path: string, body?: object) => {
  const r = request(env.app)[method](path).set('Authorization', `Bearer ${token}`);
  return body ? r.send(body) : r;
};
const unitsOf = (id: string) =>
  (env.database.sqlite.prepare('SELECT unit_id FROM user_units WHERE user_id = ? ORDER BY unit_id').all(id) as { unit_id: string }[]).map((r) => r.unit_id);
const events = (action: string, entityId: string) =>
  env.database.sqlite.prepare('SELECT actor_id, unit_id, before, after FROM audit_events WHERE action = ? AND entity_id = ? ORDER BY id').all(action, entityId) as {
    actor_id: string;
    unit_id: string | null;
    before: string | null;
    after: string | null;
  }[];
const unitRow = (id: string) => env.database.sqlite.prepare('SELECT * FROM units WHERE id = ?').get(id);

describe('memberships, one unit at a time', () => {
  it('adds South to a North nurse and keeps North, audited before and after', async () => {
    expect(unitsOf('u-nurse-2')).toEqual(['unit-north']);
    const res = await as(admin, 'post', '/api/admin/users/u-nurse-2/units', { unitId: 'unit-south' });
    expect(res.status).toBe(201);
    expect(res.body.unitIds).toEqual(['unit-north', 'unit-south']);
    expect(unitsOf('u-nurse-2')).toEqual(['unit-north', 'unit-south']);
    const [e] = events('membership-added', 'u-nurse-2');
    expect(e).toEqual(expect.objectContaining({ actor_id: 'u-admin', unit_id: 'unit-south' }));
    expect(JSON.parse(e!.before!)).toEqual({ unitIds: ['unit-north'] });
    expect(JSON.parse(e!.after!)).toEqual({ unitIds: ['unit-north', 'unit-south'] });
  });

  it('refuses a second membership of the same unit, and an unknown unit', async () => {
    const again = await as(admin, 'post', '/api/admin/users/u-nurse-2/units', { unitId: 'unit-south' });
    expect(again.status).toBe(409);
    expect(again.body.error.fields.unitId).toMatch(/Already/);
    const unknown = await as(admin, 'post', '/api/admin/users/u-nurse-2/units', { unitId: 'unit-nowhere' });
    expect(unknown.status).toBe(404);
    expect(unitsOf('u-nurse-2')).toEqual(['unit-north', 'unit-south']);
  });

  it('removes North only, leaving South; the last unit cannot be removed', async () => {
    const res = await as(admin, 'delete', '/api/admin/users/u-nurse-2/units/unit-north');
    expect(res.status).toBe(200);
    expect(unitsOf('u-nurse-2')).toEqual(['unit-south']);
    const [e] = events('membership-removed', 'u-nurse-2');
    expect(JSON.parse(e!.before!)).toEqual({ unitIds: ['unit-north', 'unit-south'] });
    expect(JSON.parse(e!.after!)).toEqual({ unitIds: ['unit-south'] });
    const last = await as(admin, 'delete', '/api/admin/users/u-nurse-2/units/unit-south');
    expect(last.status).toBe(409);
    expect(last.body.error.message).toMatch(/only unit/);
    expect(unitsOf('u-nurse-2')).toEqual(['unit-south']);
    // Put her back in North for the tests below.
    expect((await as(admin, 'post', '/api/admin/users/u-nurse-2/units', { unitId: 'unit-north' })).status).toBe(201);
  });

  it('a North-only administrator cannot add South, nor touch someone who also works in South', async () => {
    const south = await as(northAdmin, 'post', '/api/admin/users/u-nurse/units', { unitId: 'unit-south' });
    expect(south.status).toBe(403);
    const educator = await as(northAdmin, 'delete', '/api/admin/users/u-educator/units/unit-north');
    expect(educator.status).toBe(403);
    expect(unitsOf('u-educator')).toEqual(['unit-north', 'unit-south']);
    expect(unitsOf('u-nurse')).toEqual(['unit-north']);
  });

  it('an administrator cannot change their own units', async () => {
    const res = await as(admin, 'delete', '/api/admin/users/u-admin/units/unit-south');
    expect(res.status).toBe(400);
    expect(unitsOf('u-admin')).toEqual(['unit-north', 'unit-south']);
  });
});

describe('unit settings checked together', () => {
  it('refuses "utc" and a link name, naming the time-zone field', async () => {
    for (const timeZone of ['utc', 'GB', 'Mars/Olympus']) {
      const res = await as(admin, 'patch', '/api/admin/units/unit-north', { timeZone });
      expect(res.status).toBe(400);
      expect(res.body.error.fields.timeZone).toMatch(/not a canonical time zone/);
    }
    const ok = await as(admin, 'patch', '/api/admin/units/unit-north', { timeZone: 'America/New_York' });
    expect(ok.status).toBe(200);
    expect(ok.body.unit.timeZone).toBe('America/New_York');
    await as(admin, 'patch', '/api/admin/units/unit-north', { timeZone: 'Europe/London' });
  });

  it('names every field at fault at once, and writes nothing', async () => {
    const before = unitRow('unit-north');
    // Due-soon 60 with a 30-minute interval, a night shift before the day shift, and a zone in lower case.
    const res = await as(admin, 'patch', '/api/admin/units/unit-north', {
      checkIntervalMinutes: 30,
      dueSoonMinutes: 60,
      dayShiftStart: '20:00',
      nightShiftStart: '08:00',
      timeZone: 'europe/london',
    });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['dueSoonMinutes', 'nightShiftStart', 'timeZone']);
    expect(res.body.error.fields.dueSoonMinutes).toMatch(/shorter than the check interval \(30 min\)/);
    expect(res.body.error.message).toMatch(/3 settings need attention/);
    expect(unitRow('unit-north')).toEqual(before);
  });

  it('checks a single change against the settings already stored', async () => {
    // The demo unit checks every 120 minutes (common practice: 2-4 hourly observations for a stable preterm infant).
    const res = await as(admin, 'patch', '/api/admin/units/unit-north', { dueSoonMinutes: 120 });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({ dueSoonMinutes: expect.stringMatching(/\(120 min\) must be shorter than the check interval \(120 min\)/) });
    // A field that fails its own check and a field that conflicts are both named.
    const both = await as(admin, 'patch', '/api/admin/units/unit-north', { checkIntervalMinutes: 5, nightShiftStart: '06:00' });
    expect(Object.keys(both.body.error.fields).sort()).toEqual(['checkIntervalMinutes', 'nightShiftStart']);
  });

  it('a bad bed label says which bed and why', async () => {
    const res = await as(admin, 'post', '/api/admin/units/unit-north/beds', { label: 'N1<script>' });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/^Bed "N1<script>": /);
    expect(res.body.error.fields.label).toBeTruthy();
  });
});

describe('beds and units', () => {
  const bedsOf = (unitId: string) =>
    env.database.sqlite.prepare('SELECT id, label, active FROM beds WHERE unit_id = ? ORDER BY sort_order, label').all(unitId) as { id: string; label: string; active: number }[];

  it('renames a bed, refusing a label another bed has', async () => {
    const [first, second] = bedsOf('unit-north');
    const taken = await as(admin, 'patch', `/api/admin/beds/${first!.id}`, { label: second!.label });
    expect(taken.status).toBe(409);
    expect(taken.body.error.message).toContain(`Bed ${second!.label}:`);
    expect(taken.body.error.fields.label).toMatch(/already has a bed/);
    const res = await as(admin, 'patch', `/api/admin/beds/${first!.id}`, { label: 'N-Window' });
    expect(res.status).toBe(200);
    expect(bedsOf('unit-north')[0]!.label).toBe('N-Window');
    const [e] = events('bed-updated', first!.id);
    expect(JSON.parse(e!.before!).label).toBe(first!.label);
    expect(JSON.parse(e!.after!).label).toBe('N-Window');
  });

  it('moves a bed down one place and up again; the first bed cannot move up', async () => {
    const before = bedsOf('unit-north').map((b) => b.id);
    expect((await as(admin, 'patch', `/api/admin/beds/${before[0]}`, { move: 'down' })).status).toBe(200);
    expect(bedsOf('unit-north').map((b) => b.id)).toEqual([before[1], before[0], ...before.slice(2)]);
    expect((await as(admin, 'patch', `/api/admin/beds/${before[0]}`, { move: 'up' })).status).toBe(200);
    expect(bedsOf('unit-north').map((b) => b.id)).toEqual(before);
    const top = await as(admin, 'patch', `/api/admin/beds/${before[0]}`, { move: 'up' });
    expect(top.status).toBe(400);
    expect(top.body.error.fields.move).toMatch(/already first/);
  });

  it('deactivates an empty bed, not an occupied one', async () => {
    const occupied = env.database.sqlite.prepare("SELECT bed_id AS id FROM infants WHERE unit_id = 'unit-north' AND status = 'admitted' LIMIT 1").get() as { id: string };
    const res = await as(admin, 'patch', `/api/admin/beds/${occupied.id}`, { active: false });
    expect(res.status).toBe(409);
    const empty = env.database.sqlite
      .prepare("SELECT id FROM beds WHERE unit_id = 'unit-north' AND id NOT IN (SELECT bed_id FROM infants WHERE status = 'admitted' AND bed_id IS NOT NULL) LIMIT 1")
      .get() as { id: string };
    expect((await as(admin, 'patch', `/api/admin/beds/${empty.id}`, { active: false })).body.bed.active).toBe(false);
    expect((await as(admin, 'patch', `/api/admin/beds/${empty.id}`, { active: true })).body.bed.active).toBe(true);
  });

  it('a North-only administrator cannot change a South bed', async () => {
    const south = bedsOf('unit-south')[0]!;
    const res = await as(northAdmin, 'patch', `/api/admin/beds/${south.id}`, { label: 'Mine' });
    expect(res.status).toBe(403);
    expect(bedsOf('unit-south')[0]!.label).toBe(south.label);
  });

  it('creates a unit the creator then administers; a non-canonical zone is refused', async () => {
    const bad = await as(admin, 'post', '/api/admin/units', { name: 'Transitional Care', hospitalName: 'Riverside General', timeZone: 'utc' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.timeZone).toBeTruthy();
    const res = await as(admin, 'post', '/api/admin/units', { name: 'Transitional Care', hospitalName: 'Riverside General', timeZone: 'Europe/Dublin' });
    expect(res.status).toBe(201);
    expect(res.body.unit).toEqual(expect.objectContaining({ name: 'Transitional Care', timeZone: 'Europe/Dublin', beds: [] }));
    expect(unitsOf('u-admin')).toContain(res.body.unit.id);
    const list = await as(admin, 'get', '/api/admin/units');
    expect(list.body.units.map((u: { name: string }) => u.name)).toContain('Transitional Care');
    const dup = await as(admin, 'post', '/api/admin/units', { name: 'Transitional Care', hospitalName: 'Riverside General', timeZone: 'Europe/Dublin' });
    expect(dup.status).toBe(409);
  });
});

describe('people: search and last sign-in', () => {
  it('finds people by part of a name or an e-mail, any case', async () => {
    const byName = await as(admin, 'get', '/api/admin/users?q=KOFI');
    expect(byName.body.users.map((u: { id: string }) => u.id)).toEqual(['u-nurse-2']);
    const byEmail = await as(admin, 'get', '/api/admin/users?q=priya.raman@');
    expect(byEmail.body.users.map((u: { id: string }) => u.id)).toEqual(['u-educator']);
    const none = await as(admin, 'get', '/api/admin/users?q=nobody-here');
    expect(none.body.users).toEqual([]);
  });

  it('shows when each person last signed in, and null for someone who never has', async () => {
    const res = await as(admin, 'get', '/api/admin/users');
    const me = res.body.users.find((u: { id: string }) => u.id === 'u-admin');
    expect(me.lastSignInAt).toBe(env.clock.now().toISOString());
    const kofi = res.body.users.find((u: { id: string }) => u.id === 'u-nurse-2');
    expect(kofi.lastSignInAt).toBeNull();
  });
});

describe('audit-log viewer', () => {
  it('lists who changed what with before and after, newest first, and pages by cursor', async () => {
    const first = await as(admin, 'get', '/api/admin/audit?limit=2');
    expect(first.status).toBe(200);
    expect(first.body.events).toHaveLength(2);
    expect(first.body.events[0].id).toBeGreaterThan(first.body.events[1].id);
    expect(first.body.nextCursor).toBe(first.body.events[1].id);
    const second = await as(admin, 'get', `/api/admin/audit?limit=2&cursor=${first.body.nextCursor}`);
    expect(second.body.events[0].id).toBeLessThan(first.body.events[1].id);
    const all = await as(admin, 'get', '/api/admin/audit?actorId=u-admin&limit=200');
    const added = all.body.events.find((e: { action: string }) => e.action === 'membership-added');
    expect(added).toEqual(
      expect.objectContaining({ actorName: 'Tomás Vidal', entityId: 'u-nurse-2', before: { unitIds: expect.any(Array) }, after: { unitIds: expect.any(Array) } }),
    );
    expect(all.body.events.every((e: { actorId: string }) => e.actorId === 'u-admin')).toBe(true);
    expect(all.body.events.some((e: { action: string }) => e.action.startsWith('row-'))).toBe(false);
  });

  it('filters by date range and refuses a reversed one', async () => {
    const now = env.clock.now().getTime();
    const later = await as(admin, 'get', `/api/admin/audit?from=${new Date(now + 60_000).toISOString()}`);
    expect(later.body.events).toEqual([]);
    const around = await as(admin, 'get', `/api/admin/audit?from=${new Date(now - 60_000).toISOString()}&to=${new Date(now + 60_000).toISOString()}&limit=200`);
    expect(around.body.events.length).toBeGreaterThan(0);
    expect(around.body.events.every((e: { at: string }) => Math.abs(Date.parse(e.at) - now) <= 60_000)).toBe(true);
    const reversed = await as(admin, 'get', `/api/admin/audit?from=${new Date(now).toISOString()}&to=${new Date(now - 1).toISOString()}`);
    expect(reversed.status).toBe(400);
    expect(reversed.body.error.fields.to).toMatch(/before its start/);
  });

  it("never shows South's events to a North-only administrator, nor any secret", async () => {
    const res = await as(northAdmin, 'get', '/api/admin/audit?limit=200');
    expect(res.status).toBe(200);
    expect(res.body.events.length).toBeGreaterThan(0);
    for (const e of res.body.events) {
      expect(e.unitId === 'unit-north' || (e.entityType === 'user' && e.unitId === null)).toBe(true);
      // The educator works in South too: her changes are not shown to a North-only administrator.
      expect(e.entityId).not.toBe('u-educator');
    }
    expect(res.body.events.some((e: { unitId: string }) => e.unitId === 'unit-south')).toBe(false);
    const everything = JSON.stringify((await as(admin, 'get', '/api/admin/audit?limit=200')).body);
    expect(everything).not.toMatch(/password|token|hash/i);
    expect(everything).not.toMatch(/\$argon2|\$scrypt|\$2[aby]\$/);
  });

  it('is for administrators only', async () => {
    const charge = await env.signIn(DEMO.charge);
    expect((await as(charge, 'get', '/api/admin/audit')).status).toBe(403);
  });
});
