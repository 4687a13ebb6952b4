/** Sign-in and session rules, after OWASP ASVS 4.0.3 chapters 2 and 3. */
import jwt from 'jsonwebtoken';
import request from 'supertest';
import { assertPasswordAllowed } from '../../server/services/passwords';
import { newPasswordSchema } from '../../shared/schemas/auth';
import { DEMO, makeEnv, type TestEnv } from './helpers';

let env: TestEnv;
beforeAll(async () => {
  env = await makeEnv();
});
afterAll(() => env.close());

const me = (token: string) => request(env.app).get('/api/auth/me').set('Authorization', `Bearer ${token}`);

describe('tokens', () => {
  it('carry jti and exp, signed HS256', async () => {
    const token = await env.signIn(DEMO.nurse);
    const decoded = jwt.decode(token, { complete: true }) as jwt.Jwt & { payload: jwt.JwtPayload };
    expect(decoded.header.alg).toBe('HS256');
    expect(typeof decoded.payload.jti).toBe('string');
    expect(decoded.payload.exp! - decoded.payload.iat!).toBe(12 * 3600);
  });

  it('refuses alg "none"', async () => {
    const token = await env.signIn(DEMO.nurse);
    const { payload } = jwt.decode(token, { complete: true }) as { payload: jwt.JwtPayload };
    const b64 = (o: object) => Buffer.from(JSON.stringify(o)).toString('base64url');
    const unsigned = `${b64({ alg: 'none', typ: 'JWT' })}.${b64(payload)}.`;
    expect((await me(unsigned)).status).toBe(401);
  });

  it('refuses a token signed with another secret, or with another algorithm', async () => {
    const token = await env.signIn(DEMO.nurse);
    const { payload } = jwt.decode(token, { complete: true }) as { payload: jwt.JwtPayload };
    const forged = jwt.sign(payload, 'another-secret-that-is-also-long-enough-here');
    expect((await me(forged)).status).toBe(401);
    const hs512 = jwt.sign(payload, env.config.jwtSecret, { algorithm: 'HS512' });
    expect((await me(hs512)).status).toBe(401);
  });

  it('ends after 12 hours in all even when active', async () => {
    const token = await env.signIn(DEMO.charge);
    for (let i = 0; i < 25; i++) {
      env.clock.advanceMinutes(29);
      if ((await me(token)).status !== 200) break;
    }
    expect((await me(token)).status).toBe(401);
    env.clock.advanceMinutes(-29 * 25);
  });

  it('a token used before is refused from its expiry second on (RFC 7519 §4.1.4)', async () => {
    const token = await env.signIn(DEMO.educator);
    expect((await me(token)).status).toBe(200);
    const { exp, iat } = jwt.decode(token) as jwt.JwtPayload;
    env.clock.advanceMinutes((exp! - iat!) / 60);
    const late = await me(token);
    expect(late.status).toBe(401);
    // The token's own expiry answers, as for a token never seen, before the session row is read.
    expect(late.body.error.message).toBe('Your session has ended. Please sign in again.');
    env.clock.advanceMinutes(-(exp! - iat!) / 60);
    expect((await me(token)).status).toBe(200);
  });
});

describe('throttling', () => {
  it('answers 429 with Retry-After after five failures for one account', async () => {
    const email = DEMO.admin;
    for (let i = 0; i < 5; i++) {
      const res = await request(env.app)
        .post('/api/auth/sign-in')
        .send({ email, password: `wrong-password-${i}` });
      expect(res.status).toBe(401);
    }
    const blocked = await request(env.app).post('/api/auth/sign-in').send({ email, password: DEMO.password });
    expect(blocked.status).toBe(429);
    expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
    env.clock.advanceMinutes(16);
    const after = await request(env.app).post('/api/auth/sign-in').send({ email, password: DEMO.password });
    expect(after.status).toBe(200);
  });

  it('takes about as long for an unknown account as for a wrong password', async () => {
    const time = async (email: string) => {
      const start = process.hrtime.bigint();
      await request(env.app).post('/api/auth/sign-in').send({ email, password: 'wrong-password-x' });
      return Number(process.hrtime.bigint() - start) / 1e6;
    };
    await time('warmup@warmfold.test');
    const known = await time(DEMO.educator);
    const unknown = await time('nobody-here@warmfold.test');
    // Both pay for one bcrypt comparison; a missing account must not answer in a fraction of the time.
    expect(unknown).toBeGreaterThan(known * 0.3);
  });
});

describe('demo passwords follow the same rules', () => {
  it('meets the length, byte and common-list rules', async () => {
    expect(newPasswordSchema.safeParse(DEMO.password).success).toBe(true);
    expect(() => assertPasswordAllowed(DEMO.password, 'password')).not.toThrow();
  });
});

describe('CORS', () => {
  it('allows only configured origins', async () => {
    const withCors = await makeEnv({ seed: false, config: { corsOrigins: ['https://ward.example'] } });
    const allowed = await request(withCors.app).get('/api/health').set('Origin', 'https://ward.example');
    expect(allowed.headers['access-control-allow-origin']).toBe('https://ward.example');
    const other = await request(withCors.app).get('/api/health').set('Origin', 'https://elsewhere.example');
    expect(other.headers['access-control-allow-origin']).toBeUndefined();
    withCors.close();
  });
});

describe('account changes take effect on the very next request (ASVS 3.3.x)', () => {
  it('a role change ends the person’s sessions', async () => {
    const admin = await env.signIn(DEMO.admin);
    const nurse = await env.signIn('kofi.mensah@warmfold.test');
    expect((await me(nurse)).status).toBe(200);
    const change = await request(env.app).patch('/api/admin/users/u-nurse-2').set('Authorization', `Bearer ${admin}`).send({ role: 'charge' });
    expect(change.status).toBe(200);
    expect((await me(nurse)).status).toBe(401);
    const again = await env.signIn('kofi.mensah@warmfold.test');
    expect((await me(again)).body.user.role).toBe('charge');
  });

  it('deactivation ends the person’s sessions and refuses sign-in', async () => {
    const admin = await env.signIn(DEMO.admin);
    const nurse = await env.signIn('ines.carvalho@warmfold.test');
    const off = await request(env.app).post('/api/admin/users/u-nurse-4/deactivate').set('Authorization', `Bearer ${admin}`).send({});
    expect(off.status).toBe(200);
    expect((await me(nurse)).status).toBe(401);
    const res = await request(env.app).post('/api/auth/sign-in').send({ email: 'ines.carvalho@warmfold.test', password: DEMO.password });
    expect(res.status).toBe(401);
  });
});
