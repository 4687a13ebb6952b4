import request from 'supertest';
import { count, DEMO, makeEnv, type TestEnv } from './helpers';

let env: TestEnv;
beforeAll(async () => {
  env = await makeEnv();
});
afterAll(() => env.close());

describe('health and errors', () => {
  it('answers GET /api/health', async () => {
    const res = await request(env.app).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body.status).toBe('ok');
  });

  it('answers an unknown API route with a JSON 404', async () => {
    const res = await request(env.app).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not-found');
  });

  it('answers malformed JSON with 400 and writes nothing', async () => {
    const before = count(env.database, 'sign_in_attempts');
    const res = await request(env.app).post('/api/auth/sign-in').set('Content-Type', 'application/json').send('{"email": ');
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/JSON/);
    expect(count(env.database, 'sign_in_attempts')).toBe(before);
  });

  it('refuses an oversized body with 413', async () => {
    const res = await request(env.app)
      .post('/api/auth/sign-in')
      .send({ email: DEMO.nurse, password: 'x'.repeat(200_000) });
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('payload-too-large');
  });

  it('names unknown fields and wrong types', async () => {
    const res = await request(env.app).post('/api/auth/sign-in').send({ email: 42, password: 'x', extra: true });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('email');
    expect(res.body.error.fields).toHaveProperty('extra');
  });

  it('sends helmet headers', async () => {
    const res = await request(env.app).get('/api/health');
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['content-security-policy']).toContain("frame-ancestors 'none'");
    expect(res.headers['strict-transport-security']).toContain('max-age');
  });
});

describe('sign-in', () => {
  it.each([
    ['nurse', DEMO.nurse],
    ['charge', DEMO.charge],
    ['educator', DEMO.educator],
    ['admin', DEMO.admin],
  ])('signs in the demo %s', async (role, email) => {
    const res = await request(env.app).post('/api/auth/sign-in').send({ email, password: DEMO.password });
    expect(res.status).toBe(200);
    expect(res.body.user.role).toBe(role);
    expect(typeof res.body.token).toBe('string');
    const me = await request(env.app).get('/api/auth/me').set('Authorization', `Bearer ${res.body.token}`);
    expect(me.status).toBe(200);
    expect(me.body.user.email).toBe(email);
  });

  it('gives the same answer for a wrong password and an unknown account', async () => {
    const wrong = await request(env.app).post('/api/auth/sign-in').send({ email: DEMO.educator, password: 'not-the-password-1' });
    const unknown = await request(env.app).post('/api/auth/sign-in').send({ email: 'nobody@warmfold.test', password: 'not-the-password-1' });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body).toEqual(unknown.body);
  });

  it('refuses a signed-out token with 401', async () => {
    const token = await env.signIn(DEMO.nurse);
    const out = await request(env.app).post('/api/auth/sign-out').set('Authorization', `Bearer ${token}`);
    expect(out.status).toBe(204);
    const me = await request(env.app).get('/api/auth/me').set('Authorization', `Bearer ${token}`);
    expect(me.status).toBe(401);
  });

  it('refuses a missing or forged token', async () => {
    expect((await request(env.app).get('/api/auth/me')).status).toBe(401);
    const forged = await request(env.app).get('/api/auth/me').set('Authorization', 'Bearer abc.def.ghi');
    expect(forged.status).toBe(401);
  });

  it('ends a session after 30 idle minutes', async () => {
    const token = await env.signIn(DEMO.charge);
    env.clock.advanceMinutes(31);
    const me = await request(env.app).get('/api/auth/me').set('Authorization', `Bearer ${token}`);
    expect(me.status).toBe(401);
    env.clock.advanceMinutes(-31);
  });

  it('keeps preferences and validates them', async () => {
    const token = await env.signIn(DEMO.nurse);
    const bad = await request(env.app).patch('/api/auth/me/preferences').set('Authorization', `Bearer ${token}`).send({ tempUnit: 'K' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toHaveProperty('tempUnit');
    const ok = await request(env.app).patch('/api/auth/me/preferences').set('Authorization', `Bearer ${token}`).send({ tempUnit: 'F' });
    expect(ok.status).toBe(200);
    expect(ok.body.user.tempUnit).toBe('F');
    await request(env.app).patch('/api/auth/me/preferences').set('Authorization', `Bearer ${token}`).send({ tempUnit: 'C' });
  });

  it('changes a password, refuses a common one, and ends old sessions', async () => {
    const token = await env.signIn(DEMO.educator);
    const common = await request(env.app)
      .post('/api/auth/me/password')
      .set('Authorization', `Bearer ${token}`)
      .send({ currentPassword: DEMO.password, newPassword: 'password1234' });
    expect(common.status).toBe(400);
    expect(common.body.error.fields).toHaveProperty('newPassword');
    const tooLong = await request(env.app)
      .post('/api/auth/me/password')
      .set('Authorization', `Bearer ${token}`)
      .send({ currentPassword: DEMO.password, newPassword: 'é'.repeat(40) });
    expect(tooLong.status).toBe(400);
    expect(tooLong.body.error.fields.newPassword).toMatch(/72 bytes/);
    const ok = await request(env.app)
      .post('/api/auth/me/password')
      .set('Authorization', `Bearer ${token}`)
      .send({ currentPassword: DEMO.password, newPassword: 'lantern-over-the-quiet-ward' });
    expect(ok.status).toBe(204);
    expect((await request(env.app).get('/api/auth/me').set('Authorization', `Bearer ${token}`)).status).toBe(401);
    await env.signIn(DEMO.educator, 'lantern-over-the-quiet-ward');
  });
});
