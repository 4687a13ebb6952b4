import request from 'supertest';
import { startFakeSmtp } from '../../server/mail/fake-smtp';
import { smtpMailer } from '../../server/mail/mailer';
import { createApp } from '../../server/app';
import { sendWeeklyDigests } from '../../server/services/digest';
import { count, DEMO, makeEnv, type TestEnv } from './helpers';

let env: TestEnv;
let admin: string;
let educator: string;
beforeAll(async () => {
  env = await makeEnv();
  [admin, educator] = await Promise.all([env.signIn(DEMO.admin), env.signIn(DEMO.educator)]);
});
afterAll(() => env.close());

const as = (token: string | null, method: 'get' | 'post' | 'patch', path: string, body?: object) => {
  let r = request(env.app)[method](path);
  if (token) r = r.set('Authorization', `Bearer ${token}`);
  return body ? r.send(body) : r;
};
const tokenFrom = (text: string) => decodeURIComponent(/token=([^\s]+)/.exec(text)![1]!);
const NEW_PASSWORD = 'copper-kettle-lantern-9';

describe('users and invitations', () => {
  it('lists users with their status; only admins may', async () => {
    const res = await as(admin, 'get', '/api/admin/users');
    expect(res.status).toBe(200);
    expect(res.body.users.find((u: { email: string }) => u.email === DEMO.nurse)).toEqual(expect.objectContaining({ role: 'nurse', status: 'active', unitIds: ['unit-north'] }));
    expect((await as(educator, 'get', '/api/admin/users')).status).toBe(403);
    expect((await as(null, 'get', '/api/admin/users')).status).toBe(401);
  });

  it('creates a user without a password and e-mails a single-use invitation that expires after 72 hours', async () => {
    const tokens = count(env.database, 'email_tokens');
    const res = await as(admin, 'post', '/api/admin/users', { name: 'Wren Abernathy', email: 'Wren.Abernathy@warmfold.test', role: 'nurse', unitIds: ['unit-north'] });
    expect(res.status).toBe(201);
    expect(res.body.user).toEqual(expect.objectContaining({ email: 'wren.abernathy@warmfold.test', status: 'invited' }));
    expect(count(env.database, 'email_tokens')).toBe(tokens + 1);
    const mail = env.mailer.sent.at(-1)!;
    expect(mail.to).toEqual(['wren.abernathy@warmfold.test']);
    expect(mail.text).toContain('http://localhost:8080/accept-invite?token=');
    const token = tokenFrom(mail.text);
    // Only a SHA-256 of the token is stored.
    const stored = env.database.sqlite.prepare("SELECT token_hash, expires_at, created_at FROM email_tokens WHERE kind = 'invite' ORDER BY created_at DESC LIMIT 1").get() as {
      token_hash: string;
      expires_at: number;
      created_at: number;
    };
    expect(stored.token_hash).toMatch(/^[0-9a-f]{64}$/);
    expect(stored.token_hash).not.toContain(token);
    expect(stored.expires_at - stored.created_at).toBe(72 * 3600_000);

    const bad = await as(null, 'post', '/api/auth/invitations/accept', { token, password: 'short' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.password).toBeDefined();
    const ok = await as(null, 'post', '/api/auth/invitations/accept', { token, password: NEW_PASSWORD });
    expect(ok.status).toBe(204);
    expect((await env.signIn('wren.abernathy@warmfold.test', NEW_PASSWORD)).length).toBeGreaterThan(20);
    const again = await as(null, 'post', '/api/auth/invitations/accept', { token, password: 'another-long-passphrase-7' });
    expect(again.status).toBe(400);
    expect(again.body.error.fields.token).toMatch(/already used/);
  });

  it('an invitation link stops working after 72 hours', async () => {
    await as(admin, 'post', '/api/admin/users', { name: 'Osric Fenwick', email: 'osric.fenwick@warmfold.test', role: 'charge', unitIds: ['unit-south'] });
    const token = tokenFrom(env.mailer.sent.at(-1)!.text);
    env.clock.advanceMinutes(72 * 60 + 1);
    try {
      const res = await as(null, 'post', '/api/auth/invitations/accept', { token, password: NEW_PASSWORD });
      expect(res.status).toBe(400);
      expect(res.body.error.fields.token).toMatch(/expired/);
    } finally {
      env.clock.advanceMinutes(-(72 * 60 + 1));
    }
    admin = await env.signIn(DEMO.admin);
    educator = await env.signIn(DEMO.educator);
  });

  it('refuses bad input with the field and writes nothing; a taken e-mail is 409; another unit is 403', async () => {
    const users = count(env.database, 'users');
    const res = await as(admin, 'post', '/api/admin/users', { name: 'X', email: 'not-an-email', role: 'surgeon', unitIds: [] });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['email', 'name', 'role', 'unitIds']);
    expect((await as(admin, 'post', '/api/admin/users', { name: 'Nia Again', email: DEMO.nurse, role: 'nurse', unitIds: ['unit-north'] })).status).toBe(409);
    env.database.sqlite.prepare("DELETE FROM user_units WHERE user_id = 'u-admin' AND unit_id = 'unit-south'").run();
    try {
      const other = await as(admin, 'post', '/api/admin/users', { name: 'Far Away', email: 'far.away@warmfold.test', role: 'nurse', unitIds: ['unit-south'] });
      expect(other.status).toBe(403);
      expect((await as(admin, 'patch', '/api/admin/units/unit-south', { checkIntervalMinutes: 60 })).status).toBe(403);
    } finally {
      env.database.sqlite.prepare("INSERT INTO user_units (user_id, unit_id) VALUES ('u-admin', 'unit-south')").run();
    }
    expect(count(env.database, 'users')).toBe(users);
    expect((await as(educator, 'post', '/api/admin/users', { name: 'Sneaky', email: 'sneaky@warmfold.test', role: 'admin', unitIds: ['unit-north'] })).status).toBe(403);
  });

  it('a role change takes effect on the very next request; deactivation ends sessions and sign-in', async () => {
    const kofi = await env.signIn('kofi.mensah@warmfold.test');
    expect((await as(kofi, 'get', '/api/auth/me')).status).toBe(200);
    const res = await as(admin, 'patch', '/api/admin/users/u-nurse-2', { role: 'charge', unitIds: ['unit-north', 'unit-south'] });
    expect(res.status).toBe(200);
    expect(res.body.user).toEqual(expect.objectContaining({ role: 'charge', unitIds: ['unit-north', 'unit-south'] }));
    expect((await as(kofi, 'get', '/api/auth/me')).status).toBe(401);
    const kofi2 = await env.signIn('kofi.mensah@warmfold.test');
    expect((await as(admin, 'post', '/api/admin/users/u-nurse-2/deactivate')).body.user.status).toBe('deactivated');
    expect((await as(kofi2, 'get', '/api/auth/me')).status).toBe(401);
    await expect(env.signIn('kofi.mensah@warmfold.test')).rejects.toThrow(/401/);
    expect(count(env.database, 'users')).toBeGreaterThan(0);
    expect((await as(admin, 'post', '/api/admin/users/u-nurse-2/reactivate')).body.user.status).toBe('active');
    expect((await as(admin, 'post', '/api/admin/users/u-admin/deactivate')).status).toBe(400);
    expect((await as(admin, 'patch', '/api/admin/users/u-nurse-2', { role: 'wizard' })).status).toBe(400);
    expect((await as(admin, 'patch', '/api/admin/users/nobody', { role: 'nurse' })).status).toBe(404);
    expect((await as(admin, 'post', '/api/admin/users/nobody/deactivate')).status).toBe(404);
  });

  it('a password reset is e-mailed, single-use and expires after an hour', async () => {
    const res = await as(admin, 'post', '/api/admin/users/u-nurse-4/password-reset');
    expect(res.status).toBe(202);
    const mail = env.mailer.sent.at(-1)!;
    expect(mail.to).toEqual(['ines.carvalho@warmfold.test']);
    expect(mail.text).toContain('/reset-password?token=');
    const token = tokenFrom(mail.text);
    expect((await as(null, 'post', '/api/auth/invitations/accept', { token, password: NEW_PASSWORD })).status).toBe(400);
    env.clock.advanceMinutes(61);
    expect((await as(null, 'post', '/api/auth/password-reset', { token, password: NEW_PASSWORD })).body.error.fields.token).toMatch(/expired/);
    env.clock.advanceMinutes(-61);
    await as(admin, 'post', '/api/admin/users/u-nurse-4/password-reset');
    const fresh = tokenFrom(env.mailer.sent.at(-1)!.text);
    expect((await as(null, 'post', '/api/auth/password-reset', { token: fresh, password: NEW_PASSWORD })).status).toBe(204);
    expect((await as(null, 'post', '/api/auth/password-reset', { token: fresh, password: NEW_PASSWORD })).status).toBe(400);
    await env.signIn('ines.carvalho@warmfold.test', NEW_PASSWORD);
    // A person who has not accepted the invitation gets the invitation again, not a reset.
    const osric = env.database.sqlite.prepare("SELECT id FROM users WHERE email = 'osric.fenwick@warmfold.test'").get() as { id: string };
    expect((await as(admin, 'post', `/api/admin/users/${osric.id}/password-reset`)).status).toBe(409);
    expect((await as(admin, 'post', `/api/admin/users/${osric.id}/invitation`)).status).toBe(202);
  });

  it('a forgotten-password request answers the same for known and unknown addresses', async () => {
    const sent = env.mailer.sent.length;
    const known = await as(null, 'post', '/api/auth/password-reset/request', { email: DEMO.charge });
    const unknown = await as(null, 'post', '/api/auth/password-reset/request', { email: 'nobody@warmfold.test' });
    expect([known.status, unknown.status]).toEqual([202, 202]);
    expect(known.body).toEqual(unknown.body);
    expect(env.mailer.sent.length).toBe(sent + 1);
    expect((await as(null, 'post', '/api/auth/password-reset/request', { email: 'nope' })).status).toBe(400);
  });
});

describe('units, beds and settings', () => {
  it('reads and changes unit settings, refusing bad values with the field', async () => {
    const list = await as(admin, 'get', '/api/admin/units');
    expect(list.status).toBe(200);
    expect(list.body.units[0]).toEqual(expect.objectContaining({ checkIntervalMinutes: 120, dayShiftStart: '07:00', beds: expect.any(Array) }));
    const ok = await as(admin, 'patch', '/api/admin/units/unit-south', { checkIntervalMinutes: 60, dueSoonMinutes: 10, timeZone: 'Europe/Dublin' });
    expect(ok.status).toBe(200);
    expect(ok.body.unit).toEqual(expect.objectContaining({ checkIntervalMinutes: 60, timeZone: 'Europe/Dublin' }));
    const bad = await as(admin, 'patch', '/api/admin/units/unit-south', { checkIntervalMinutes: 5, timeZone: 'Mars/Olympus' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toEqual(expect.objectContaining({ checkIntervalMinutes: expect.any(String), timeZone: expect.any(String) }));
    const shifts = await as(admin, 'patch', '/api/admin/units/unit-south', { dayShiftStart: '20:00' });
    expect(shifts.body.error.fields.nightShiftStart).toBeDefined();
    expect((await as(admin, 'patch', '/api/admin/units/nowhere', { checkIntervalMinutes: 60 })).status).toBe(404);
    expect((await as(educator, 'patch', '/api/admin/units/unit-south', { checkIntervalMinutes: 60 })).status).toBe(403);
  });

  it('adds a bed and takes an empty one out of use; a bed with an infant stays', async () => {
    const res = await as(admin, 'post', '/api/admin/units/unit-south/beds', { label: 'S11' });
    expect(res.status).toBe(201);
    expect((await as(admin, 'post', '/api/admin/units/unit-south/beds', { label: 'S11' })).status).toBe(409);
    expect((await as(admin, 'post', '/api/admin/units/unit-south/beds', { label: '' })).body.error.fields.label).toBeDefined();
    expect((await as(admin, 'patch', `/api/admin/beds/${res.body.bed.id}`, { active: false })).body.bed.active).toBe(false);
    expect((await as(admin, 'patch', '/api/admin/beds/bed-S01', { active: false })).status).toBe(409);
    expect((await as(admin, 'patch', '/api/admin/beds/nope', { active: false })).status).toBe(404);
  });
});

describe('weekly digest', () => {
  it('an admin sends it now to each educator, with the figures and open review items', async () => {
    const sent = env.mailer.sent.length;
    const res = await as(admin, 'post', '/api/admin/digest/send');
    expect(res.status).toBe(200);
    expect(res.body.sent).toBe(2);
    const mails = env.mailer.sent.slice(sent);
    expect(mails.every((m) => m.to[0] === DEMO.educator)).toBe(true);
    expect(mails[0]!.text).toMatch(/On-time remote-site checks: \d+\.\d %/);
    expect(mails[0]!.text).toMatch(/Review items not yet reviewed: \d+/);
    expect((await as(educator, 'post', '/api/admin/digest/send')).status).toBe(403);
  });

  it("the scheduled run sends only in the unit's Monday 07:00 hour, once", async () => {
    const ctx = env.app.context;
    // 16 Nov 2026 is a Monday; London is on GMT.
    expect((await sendWeeklyDigests(ctx, new Date('2026-11-16T10:00:00Z'))).units).toEqual([]);
    const first = await sendWeeklyDigests(ctx, new Date('2026-11-16T07:00:00Z'));
    expect(first.units.length).toBeGreaterThan(0);
    expect((await sendWeeklyDigests(ctx, new Date('2026-11-16T07:30:00Z'))).units).toEqual([]);
  });
});

describe('through the real local SMTP server', () => {
  it('an invitation is caught by the fake SMTP server; the admin sees it in his mailbox without its link', async () => {
    const smtp = await startFakeSmtp(env.database, 0);
    const mailer = smtpMailer({ host: '127.0.0.1', port: smtp.port, from: 'Warmfold <warmfold@localhost>', markSender: true });
    const app = createApp({ db: env.database, mailer, clock: env.clock, config: env.config, log: () => {} });
    try {
      const res = await request(app)
        .post('/api/admin/users')
        .set('Authorization', `Bearer ${admin}`)
        .send({ name: 'Linnea Marsh', email: 'linnea.marsh@warmfold.test', role: 'educator', unitIds: ['unit-north'] });
      expect(res.status).toBe(201);
      expect(res.body.mailed).toBe(true);
      let caught: { to_addresses: string; subject: string; text_body: string } | undefined;
      for (let i = 0; i < 50 && !caught; i++) {
        caught = env.database.sqlite.prepare("SELECT * FROM caught_mail WHERE to_addresses LIKE '%linnea.marsh%'").get() as typeof caught;
        if (!caught) await new Promise((r) => setTimeout(r, 50));
      }
      expect(caught!.subject).toBe('You are invited to Warmfold');
      const mailbox = await request(app).get('/api/mailbox').set('Authorization', `Bearer ${admin}`);
      const message = mailbox.body.messages.find((m: { to: string }) => m.to.includes('linnea.marsh'));
      expect(message.text).not.toContain('token=');
      // The invitee opens the link from her own inbox (the caught message itself).
      const token = tokenFrom(caught!.text_body);
      expect((await request(app).post('/api/auth/invitations/accept').send({ token, password: NEW_PASSWORD })).status).toBe(204);
      await env.signIn('linnea.marsh@warmfold.test', NEW_PASSWORD);
    } finally {
      mailer.close();
      await smtp.close();
    }
  });
});
