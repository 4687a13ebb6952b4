import request from 'supertest';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import zlib from 'node:zlib';
import type { Request, Response } from 'express';
import { compressibleAnswer } from '../../server/app';
import type { BoardResponse } from '../../shared/types/board';
import { DEMO, makeEnv, type TestEnv } from './helpers';

// The board and the flowsheet are served from caches as bytes compressed once per build
// (server/compressed-body.ts); the API's other answers over 1 KB are compressed per request by
// the `compression` middleware, except under /auth. Decoding is checked with Node's own zlib.

let env: TestEnv;
let charge: string;
let nurse: string;

beforeAll(async () => {
  env = await makeEnv();
  charge = await env.signIn(DEMO.charge);
  nurse = await env.signIn(DEMO.nurse);
});
afterAll(() => env.close());

/** The raw bytes of an answer, undecoded (plain node:http: supertest would decode them), with its headers. */
function raw(path: string, token: string, acceptEncoding: string) {
  return new Promise<{ bytes: Buffer; encoding?: string; vary?: string; type?: string }>((resolve, reject) => {
    const server = env.app.listen(0, '127.0.0.1', () => {
      const { port } = server.address() as AddressInfo;
      http
        .get({ host: '127.0.0.1', port, path, headers: { Authorization: `Bearer ${token}`, 'Accept-Encoding': acceptEncoding } }, (res) => {
          const chunks: Buffer[] = [];
          res.on('data', (c: Buffer) => chunks.push(c));
          res.on('end', () => {
            server.close();
            expect(res.statusCode).toBe(200);
            resolve({ bytes: Buffer.concat(chunks), encoding: res.headers['content-encoding'], vary: res.headers.vary, type: res.headers['content-type'] });
          });
        })
        .on('error', (e) => {
          server.close();
          reject(e);
        });
    });
  });
}

const BOARD = '/api/units/unit-north/board';
const FLOWSHEET = '/api/infants/inf-ashgrove/flowsheet?hours=72';

describe.each([
  ['the board', BOARD, () => charge],
  ['a flowsheet', FLOWSHEET, () => nurse],
])('%s', (_name, path, token) => {
  it('goes out brotli- or gzip-compressed as asked, and decodes to the same JSON as the plain answer', async () => {
    const plain = await raw(path, token(), 'identity');
    const br = await raw(path, token(), 'gzip, deflate, br');
    const gz = await raw(path, token(), 'gzip, deflate');
    expect(plain.encoding).toBeUndefined();
    expect(br.encoding).toBe('br');
    expect(gz.encoding).toBe('gzip');
    for (const answer of [plain, br, gz]) {
      expect(answer.vary).toMatch(/Accept-Encoding/i);
      expect(answer.type).toMatch(/^application\/json/);
    }
    const text = plain.bytes.toString('utf8');
    expect(() => JSON.parse(text)).not.toThrow();
    expect(zlib.brotliDecompressSync(br.bytes).toString('utf8')).toBe(text);
    expect(zlib.gunzipSync(gz.bytes).toString('utf8')).toBe(text);
    expect(gz.bytes.length).toBeLessThan(plain.bytes.length / 3);
    expect(br.bytes.length).toBeLessThan(plain.bytes.length / 3);
  });
});

describe('the cached board', () => {
  it('is one picture for a second: serverTime is when it was built, then a new build moves it', async () => {
    const start = new Date(env.clock.now().getTime() + 60_000);
    env.clock.set(start);
    const first = (await request(env.app).get(BOARD).set('Authorization', `Bearer ${charge}`)).body as BoardResponse;
    expect(first.serverTime).toBe(start.toISOString());
    env.clock.set(new Date(start.getTime() + 900));
    const cached = (await request(env.app).get(BOARD).set('Authorization', `Bearer ${charge}`)).body as BoardResponse;
    expect(cached.serverTime).toBe(start.toISOString());
    env.clock.set(new Date(start.getTime() + 1000));
    const rebuilt = (await request(env.app).get(BOARD).set('Authorization', `Bearer ${charge}`)).body as BoardResponse;
    expect(rebuilt.serverTime).toBe(new Date(start.getTime() + 1000).toISOString());
  });
});

describe('the other API answers', () => {
  it('go out compressed when over 1 KB (the nurse’s infants), and decode to the plain answer', async () => {
    const plain = await raw('/api/infants/mine', nurse, 'identity');
    const br = await raw('/api/infants/mine', nurse, 'gzip, deflate, br');
    expect(plain.bytes.length).toBeGreaterThan(1024);
    expect(plain.encoding).toBeUndefined();
    expect(br.encoding).toBe('br');
    expect(zlib.brotliDecompressSync(br.bytes).toString('utf8')).toBe(plain.bytes.toString('utf8'));
  });

  it('stay plain under 1 KB', async () => {
    const small = await raw('/api/ping', nurse, 'gzip, br');
    expect(JSON.parse(small.bytes.toString('utf8'))).toEqual({ pong: true });
    expect(small.encoding).toBeUndefined();
  });

  it('are never compressed under /auth, where tokens sit beside what a user typed', () => {
    const json = { getHeader: (name: string) => (name.toLowerCase() === 'content-type' ? 'application/json; charset=utf-8' : undefined) } as unknown as Response;
    const at = (path: string) => ({ path, headers: {} }) as unknown as Request;
    expect(compressibleAnswer(at('/infants/mine'), json)).toBe(true);
    for (const path of ['/auth/sign-in', '/auth/me', '/auth/invitations/abc', '/auth/reset/abc']) expect(compressibleAnswer(at(path), json)).toBe(false);
  });
});
