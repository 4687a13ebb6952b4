/**
 * Account edges, after OWASP ASVS 4.0.3 (2.1.7, 2.2.1, 2.5.x) and OWASP's "Slow Down Online
 * Guessing Attacks with Device Cookies": reset requests that do not reveal an account, throttles
 * that answer alike for unknown accounts, a throttled current-password check, device cookies that
 * keep the nurse signed in while a guesser is locked out, and password rules.
 */
import bcrypt from 'bcryptjs';
import express from 'express';
import request from 'supertest';
import { drainMailQueue } from '../../server/mail/queue';
import { hashPassword, verifyPassword } from '../../server/services/password-hash';
import { DEMO, makeEnv, type TestEnv } from './helpers';

let env: TestEnv;
beforeEach(async () => {
  env = await makeEnv();
});
afterEach(() => env.close());

const UNKNOWN = 'nobody.here@warmfold.test';
const signInAs = (email: string, password: string, cookie?: string) => {
  const r = request(env.app).post('/api/auth/sign-in');
  if (cookie) r.set('Cookie', cookie);
  return r.send({ email, password });
};
/** The answer without what differs on every request. */
const shape = (res: request.Response) => ({
  status: res.status,
  body: res.body,
  retryAfter: res.headers['retry-after'] !== undefined,
  keys: Object.keys(res.headers)
    .filter((k) => k !== 'date' && k !== 'content-length' && k !== 'etag')
    .sort(),
});

describe('password-reset requests', () => {
  it('answer a known and an unknown address alike, and send the mail only after the answer', async () => {
    // Record the order of the answer and the mail as the server sees them.
    const events: string[] = [];
    env.app.context.mailer = { send: async (m) => void events.push(`mailed ${m.to.join()}`), close() {} };
    const outer = express();
    outer.use((_req, res, next) => {
      res.on('finish', () => events.push('answered'));
      next();
    });
    outer.use(env.app);

    const known = await request(outer).post('/api/auth/password-reset/request').send({ email: DEMO.nurse });
    await drainMailQueue(env.app.context);
    const unknown = await request(outer).post('/api/auth/password-reset/request').send({ email: UNKNOWN });
    await drainMailQueue(env.app.context);

    expect(shape(known)).toEqual(shape(unknown));
    expect(known.status).toBe(202);
    expect(events).toEqual(['answered', `mailed ${DEMO.nurse}`, 'answered']);
  });

  it('are throttled by the e-mail entered, with the same 429 for a known and an unknown account', async () => {
    const answers: Record<string, request.Response[]> = { [DEMO.charge]: [], [UNKNOWN]: [] };
    for (const email of [DEMO.charge, UNKNOWN]) {
      for (let i = 0; i < 4; i++) answers[email]!.push(await request(env.app).post('/api/auth/password-reset/request').send({ email }));
    }
    for (const email of [DEMO.charge, UNKNOWN]) expect(answers[email]!.map((r) => r.status)).toEqual([202, 202, 202, 429]);
    expect(shape(answers[DEMO.charge]![3]!)).toEqual(shape(answers[UNKNOWN]![3]!));
    expect(Number(answers[UNKNOWN]![3]!.headers['retry-after'])).toBeGreaterThan(0);
    await drainMailQueue(env.app.context);
    // Three requests, one mail: at most one reset link per account in five minutes.
    expect(env.mailer.sent.filter((m) => m.to.includes(DEMO.charge))).toHaveLength(1);
  });

  it('are throttled by client address across many e-mails', async () => {
    const statuses: number[] = [];
    for (let i = 0; i < 11; i++)
      statuses.push(
        (
          await request(env.app)
            .post('/api/auth/password-reset/request')
            .send({ email: `someone${i}@warmfold.test` })
        ).status,
      );
    expect(statuses.slice(0, 10).every((s) => s === 202)).toBe(true);
    expect(statuses[10]).toBe(429);
  });
});

describe('sign-in throttling with device cookies', () => {
  it('a guesser locks out unknown devices only; the nurse’s own browser still signs her in', async () => {
    const first = await signInAs(DEMO.nurse, DEMO.password);
    expect(first.status).toBe(200);
    const setCookie = ([] as string[]).concat(first.headers['set-cookie'] ?? []);
    expect(setCookie).toHaveLength(1);
    expect(setCookie[0]).toMatch(/HttpOnly/i);
    expect(setCookie[0]).toMatch(/SameSite=Strict/i);
    expect(setCookie[0]).toMatch(/Path=\/api\/auth\/sign-in/);
    const cookie = setCookie[0]!.split(';')[0]!;

    for (let i = 0; i < 5; i++) expect((await signInAs(DEMO.nurse, `guess-number-${i}-wrong`)).status).toBe(401);
    expect((await signInAs(DEMO.nurse, DEMO.password)).status).toBe(429);
    expect((await signInAs(DEMO.nurse, DEMO.password, cookie)).status).toBe(200);
    // The cookie is hers alone: it gives another account no budget.
    for (let i = 0; i < 5; i++) await signInAs(DEMO.charge, `guess-number-${i}-wrong`);
    expect((await signInAs(DEMO.charge, DEMO.password, cookie)).status).toBe(429);
  });

  it('a device cookie that is forged, or that ran out its own budget, counts as an unknown device', async () => {
    const cookie = ([] as string[]).concat((await signInAs(DEMO.educator, DEMO.password)).headers['set-cookie'] ?? [])[0]!.split(';')[0]!;
    const [name, value] = cookie.split('=');
    const forged = `${name}=${value!.split('.')[0]}.AAAA${value!.split('.')[1]!.slice(4)}`;
    for (let i = 0; i < 5; i++) expect((await signInAs(DEMO.educator, `guess-number-${i}-wrong`, forged)).status).toBe(401);
    expect((await signInAs(DEMO.educator, DEMO.password, forged)).status).toBe(429);
    expect((await signInAs(DEMO.educator, DEMO.password, cookie)).status).toBe(200);
    // Now spend the real cookie's own budget: it falls back to the (exhausted) unknown-device budget.
    for (let i = 0; i < 5; i++) expect((await signInAs(DEMO.educator, `guess-number-${i}-wrong`, cookie)).status).toBe(401);
    expect((await signInAs(DEMO.educator, DEMO.password, cookie)).status).toBe(429);
    env.clock.advanceMinutes(16);
    expect((await signInAs(DEMO.educator, DEMO.password, cookie)).status).toBe(200);
  });

  it('an unknown account is throttled exactly as a known one (a 429 reveals nothing)', async () => {
    const known: request.Response[] = [];
    const unknown: request.Response[] = [];
    for (let i = 0; i < 6; i++) known.push(await signInAs(DEMO.admin, `guess-number-${i}-wrong`));
    for (let i = 0; i < 6; i++) unknown.push(await signInAs(UNKNOWN, `guess-number-${i}-wrong`));
    expect(known.map((r) => r.status)).toEqual([401, 401, 401, 401, 401, 429]);
    expect(unknown.map((r) => r.status)).toEqual(known.map((r) => r.status));
    for (let i = 0; i < 6; i++) expect(shape(unknown[i]!)).toEqual(shape(known[i]!));
  });
});

describe('changing a password', () => {
  const change = (token: string, currentPassword: string, newPassword = 'a-fresh-lantern-over-the-ward') =>
    request(env.app).post('/api/auth/me/password').set('Authorization', `Bearer ${token}`).send({ currentPassword, newPassword });

  it('throttles the current-password check: five wrong ones, then 429 even for the right one, until the window passes', async () => {
    const token = await env.signIn(DEMO.charge);
    for (let i = 0; i < 5; i++) expect((await change(token, `not-my-password-${i}`)).status).toBe(400);
    const blocked = await change(token, DEMO.password);
    expect(blocked.status).toBe(429);
    expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
    env.clock.advanceMinutes(16);
    const fresh = await env.signIn(DEMO.charge);
    expect((await change(fresh, DEMO.password)).status).toBe(204);
  });

  it('refuses a password of spaces only, or one containing the person’s name, with a field error', async () => {
    const token = await env.signIn(DEMO.nurse);
    for (const bad of [' '.repeat(16), '\u00a0'.repeat(14), 'Okafor-warms-the-ward', 'warm-NIA-OKAFOR-hands', 'the.nia.okafor.lantern']) {
      const res = await change(token, DEMO.password, bad);
      expect(res.status).toBe(400);
      expect(Object.keys(res.body.error.fields)).toEqual(['newPassword']);
    }
    const admin = await env.signIn(DEMO.admin);
    // Accents do not hide a name: Tomás Vidal.
    const accented = await change(admin, DEMO.password, 'tomas-keeps-the-ward-warm');
    expect(accented.status).toBe(400);
    expect(accented.body.error.fields.newPassword).toMatch(/name/);
  });
});

describe('password hashing in the worker pool', () => {
  it('makes bcrypt hashes that bcryptjs (the registry library) verifies, and verifies bcryptjs hashes', async () => {
    const hash = await hashPassword('lantern-over-the-quiet-ward', 10);
    expect(hash).toMatch(/^\$2[aby]\$10\$/);
    expect(bcrypt.compareSync('lantern-over-the-quiet-ward', hash)).toBe(true);
    const theirs = bcrypt.hashSync('a-password-from-elsewhere', 10);
    expect(await verifyPassword('a-password-from-elsewhere', theirs)).toBe(true);
    expect(await verifyPassword('a-password-from-elsewhere!', theirs)).toBe(false);
  });
});
