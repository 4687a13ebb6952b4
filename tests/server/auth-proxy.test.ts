/**
 * Behind a proxy: X-Forwarded-For is believed only from a proxy the configuration names
 * (Express's `trust proxy`, off by default), so a client reaching the port directly cannot
 * choose the address its throttling counts against. Common practice (OWASP ASVS 4.0.3 7.1.x:
 * log the real source; Express's "behind proxies" guide).
 */
import request from 'supertest';
import { createApp } from '../../server/app';
import { ConfigError, loadConfig } from '../../server/config';
import { makeEnv, type TestEnv } from './helpers';

let envs: TestEnv[] = [];
afterEach(() => {
  for (const e of envs) e.close();
  envs = [];
});
async function envWith(trustProxy: false | string[]) {
  const env = await makeEnv({ config: { trustProxy } });
  envs.push(env);
  return env;
}

const lastAddress = (env: TestEnv) => (env.database.sqlite.prepare('SELECT address FROM sign_in_attempts ORDER BY id DESC LIMIT 1').get() as { address: string }).address;
const tryWith = (env: TestEnv, forwardedFor: string, email = 'someone@warmfold.test') =>
  request(env.app).post('/api/auth/sign-in').set('X-Forwarded-For', forwardedFor).send({ email, password: 'not-the-password-at-all' });

it('by default a direct client cannot choose its address with X-Forwarded-For', async () => {
  const env = await envWith(false);
  await tryWith(env, '203.0.113.7');
  expect(lastAddress(env)).toMatch(/127\.0\.0\.1$/);
  // Thirty failures from "thirty addresses" are thirty from one: the address budget runs out.
  for (let i = 0; i < 29; i++) await tryWith(env, `198.51.100.${i}`, `person${i}@warmfold.test`);
  const blocked = await tryWith(env, '192.0.2.200', 'fresh.person@warmfold.test');
  expect(blocked.status).toBe(429);
});

it('a named proxy (here loopback) passes on the client address it saw', async () => {
  const env = await envWith(['loopback']);
  await tryWith(env, '203.0.113.7');
  expect(lastAddress(env)).toBe('203.0.113.7');
});

it('a proxy that is not named is not believed, even when another proxy is', async () => {
  const env = await envWith(['10.20.30.40']);
  await tryWith(env, '203.0.113.7');
  expect(lastAddress(env)).toMatch(/127\.0\.0\.1$/);
});

it('the request log names the address the throttle used, never one the client chose', async () => {
  const env = await envWith(false);
  for (const trustProxy of [false, ['loopback']] as const) {
    const lines: string[] = [];
    const app = createApp({
      db: env.database,
      mailer: env.mailer,
      clock: env.clock,
      config: { ...env.config, trustProxy: trustProxy === false ? false : [...trustProxy], logRequests: true },
      log: (l) => lines.push(l),
    });
    await request(app).get('/api/ping').set('X-Forwarded-For', '203.0.113.7');
    const line = lines.find((l) => l.includes('/api/ping'))!;
    if (trustProxy === false) {
      expect(line).not.toContain('203.0.113.7');
      expect(line).toMatch(/127\.0\.0\.1 GET \/api\/ping 200/);
    } else expect(line).toContain(' 203.0.113.7 GET /api/ping 200');
  }
});

it('TRUST_PROXY takes addresses, ranges and names, and refuses "true" or a hop count', () => {
  const base = { DATA_DIR: 'data/test-proxy-config', JWT_SECRET: 'x'.repeat(40) };
  expect(loadConfig({ ...base }).trustProxy).toBe(false);
  expect(loadConfig({ ...base, TRUST_PROXY: '10.0.0.0/8, loopback, ::1' }).trustProxy).toEqual(['10.0.0.0/8', 'loopback', '::1']);
  for (const bad of ['true', '1', '10.0.0.0/33', 'proxy.example.test']) {
    expect(() => loadConfig({ ...base, TRUST_PROXY: bad })).toThrow(ConfigError);
  }
});
