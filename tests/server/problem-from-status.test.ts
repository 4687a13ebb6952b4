/**
 * How the screens tell failures apart: `problemFromStatus` turns an answer's status, body and
 * Retry-After into one typed problem. Expected kinds are written by hand from the status codes'
 * meanings (RFC 9110 §15: 401 not signed in, 403 not allowed, 404 not found, 409 conflict with
 * the current state, other 4xx the request itself, 5xx the server; RFC 6585 §4 for 429 and
 * RFC 9110 §10.2.3 for Retry-After, "delay-seconds" or an HTTP date). The second half asks the
 * real server over HTTP for each status and reads its answers back through the same function.
 */
import request from 'supertest';
import { problemFromStatus } from '@/components/api/client';
import type { ApiErrorBody } from '@/shared/api';
import { DEMO, makeEnv, type TestEnv } from './helpers';

// The client reads EXPO_PUBLIC_API_URL, which the Expo Babel preset turns into an import of
// Expo's ES-module env file; this project runs plain CommonJS, so it gets the same values here.
jest.mock('expo/virtual/env', () => ({ env: process.env }));

/** An error body; the kind comes from the status alone, so every body here carries the same code. */
const body = (message: string, fields?: Record<string, string>): ApiErrorBody => ({ error: { code: 'bad-request', message, ...(fields ? { fields } : {}) } });

describe('problemFromStatus, status by status', () => {
  it('names each status class by what the person can do about it', () => {
    expect(problemFromStatus(401, body('Sign in again.'), null)).toEqual({ kind: 'unauthorized', message: 'Sign in again.' });
    expect(problemFromStatus(403, body('Not your unit.'), null)).toEqual({ kind: 'forbidden', message: 'Not your unit.' });
    expect(problemFromStatus(404, body('No such infant.'), null)).toEqual({ kind: 'not-found', message: 'No such infant.' });
    expect(problemFromStatus(409, body('Already taken.', { email: 'In use.' }), null)).toEqual({ kind: 'conflict', message: 'Already taken.', fields: { email: 'In use.' } });
    for (const status of [500, 502, 503, 504]) expect(problemFromStatus(status, body('Down.'), null)).toEqual({ kind: 'server-error', message: 'Down.' });
  });

  it('any other 4xx is a problem with the request, with its fields (none when the body names none)', () => {
    expect(problemFromStatus(400, body('Check the form.', { 'values.probe': 'Too high.' }), null)).toEqual({
      kind: 'invalid',
      message: 'Check the form.',
      fields: { 'values.probe': 'Too high.' },
    });
    for (const status of [400, 413, 415, 422]) expect(problemFromStatus(status, body('No.'), null)).toEqual({ kind: 'invalid', message: 'No.', fields: {} });
  });

  it('without a readable body it still says what happened, with the status', () => {
    expect(problemFromStatus(502, null, null)).toEqual({ kind: 'server-error', message: 'The server answered 502.' });
    expect(problemFromStatus(404, {}, null)).toEqual({ kind: 'not-found', message: 'The server answered 404.' });
    expect(problemFromStatus(400, null, null)).toEqual({ kind: 'invalid', message: 'The server answered 400.', fields: {} });
  });

  it('429 carries how long to wait: seconds as given, none when not given, never NaN', () => {
    expect(problemFromStatus(429, body('Too many tries.'), '120')).toEqual({ kind: 'too-many-requests', message: 'Too many tries.', retryAfterSeconds: 120 });
    expect(problemFromStatus(429, body('Too many tries.'), null)).toEqual({ kind: 'too-many-requests', message: 'Too many tries.', retryAfterSeconds: null });
    expect(problemFromStatus(429, body('Too many tries.'), 'soon')).toEqual({ kind: 'too-many-requests', message: 'Too many tries.', retryAfterSeconds: null });
    // An HTTP date (a proxy may send one): the seconds until then, about 90 here.
    const at = new Date(Date.now() + 90_000).toUTCString();
    const wait = problemFromStatus(429, body('Too many tries.'), at);
    expect(wait.kind).toBe('too-many-requests');
    const seconds = wait.kind === 'too-many-requests' ? wait.retryAfterSeconds : null;
    expect(seconds).not.toBeNaN();
    expect(seconds).toBeGreaterThanOrEqual(85);
    expect(seconds).toBeLessThanOrEqual(90);
    // A date already past means no wait, not a negative one.
    expect(problemFromStatus(429, null, new Date(Date.now() - 60_000).toUTCString())).toMatchObject({ retryAfterSeconds: 0 });
  });
});

describe('problemFromStatus on the real server’s answers', () => {
  let env: TestEnv;
  beforeAll(async () => {
    env = await makeEnv();
  });
  afterAll(() => env.close());

  const read = (res: request.Response) => problemFromStatus(res.status, res.body, (res.headers['retry-after'] as string | undefined) ?? null);

  it('no token, another role, no such path, a taken e-mail, bad input and a text body', async () => {
    expect(read(await request(env.app).get('/api/infants/mine'))).toMatchObject({ kind: 'unauthorized' });
    const nurse = await env.signIn(DEMO.nurse);
    expect(read(await request(env.app).get('/api/admin/users').set('Authorization', `Bearer ${nurse}`))).toMatchObject({ kind: 'forbidden' });
    expect(read(await request(env.app).get('/api/no-such-thing').set('Authorization', `Bearer ${nurse}`))).toMatchObject({ kind: 'not-found' });

    const admin = await env.signIn(DEMO.admin);
    const taken = read(
      await request(env.app)
        .post('/api/admin/users')
        .set('Authorization', `Bearer ${admin}`)
        .send({ name: 'Nia Again', email: DEMO.nurse, role: 'nurse', unitIds: ['unit-north'] }),
    );
    expect(taken.kind).toBe('conflict');

    const invalid = read(
      await request(env.app)
        .post('/api/admin/users')
        .set('Authorization', `Bearer ${admin}`)
        .send({ name: 'No Address', email: 'not-an-address', role: 'nurse', unitIds: ['unit-north'] }),
    );
    expect(invalid.kind).toBe('invalid');
    expect(invalid.kind === 'invalid' ? Object.keys(invalid.fields) : []).toContain('email');

    const text = read(await request(env.app).post('/api/admin/users').set('Authorization', `Bearer ${admin}`).set('Content-Type', 'text/plain').send('name=x'));
    expect(text).toMatchObject({ kind: 'invalid' });
  });

  it('too many wrong passwords: 429 with the seconds to wait (at most the 15-minute window, ASVS 2.2.1)', async () => {
    let last: request.Response | undefined;
    for (let i = 0; i < 8; i++) {
      last = await request(env.app).post('/api/auth/sign-in').send({ email: DEMO.educator, password: 'not the password at all' });
      if (last.status === 429) break;
    }
    const problem = read(last!);
    expect(problem.kind).toBe('too-many-requests');
    const seconds = problem.kind === 'too-many-requests' ? problem.retryAfterSeconds : null;
    expect(seconds).toBeGreaterThan(0);
    expect(seconds).toBeLessThanOrEqual(15 * 60);
  });
});
