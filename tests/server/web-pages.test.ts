/**
 * The static export's pages over HTTP: each path gets its route's pre-rendered HTML, the one
 * inline script is allowed by its hash in the CSP, unknown paths get the not-found page with a
 * 404, and the API keeps its own answers. The build here is a small fake with the export's
 * file names; the e2e stories load the real one in Chromium.
 */
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { makeEnv, type TestEnv } from './helpers';

const INLINE = '__EXPO_ROUTER_HYDRATE__=true;';
// Padded like a real page, so it is worth compressing.
const page = (name: string) =>
  `<!DOCTYPE html><html><head><script>${INLINE}</script><script src="/_expo/static/js/web/entry-abc.js" defer></script><style>${'.a{color:red}'.repeat(200)}</style></head><body><div id="root">${name}</div></body></html>`;

let env: TestEnv;
let webDir: string;

beforeAll(async () => {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'warmfold-web-'));
  webDir = path.join(dir, 'web');
  const files: Record<string, string> = {
    'index.html': page('home'),
    'sign-in.html': page('sign-in'),
    'board.html': page('board'),
    'infants/index.html': page('my infants'),
    'infants/[id].html': page('flowsheet').replace('</body>', '<script src="/_expo/static/js/web/flowsheet-def.js" defer></script></body>'),
    'infants/[id]/record.html': page('record'),
    'infants/[id]/correct/[readingId].html': page('correct'),
    '(app)/board.html': page('group copy'),
    '+not-found.html': page('not found'),
    '_expo/static/js/web/entry-abc.js': 'console.log("entry")',
  };
  for (const [rel, text] of Object.entries(files)) {
    fs.mkdirSync(path.dirname(path.join(webDir, rel)), { recursive: true });
    fs.writeFileSync(path.join(webDir, rel), text);
  }
  env = await makeEnv({ seed: false, config: { webDir } });
});

afterAll(() => {
  env.close();
  fs.rmSync(path.dirname(webDir), { recursive: true, force: true });
});

const body = (text: string) => /<div id="root">([^<]*)<\/div>/.exec(text)?.[1];

describe('the web pages', () => {
  it.each([
    ['/', 'home'],
    ['/sign-in', 'sign-in'],
    ['/board', 'board'],
    ['/infants', 'my infants'],
    ['/infants/', 'my infants'],
    ['/infants/inf-ashgrove', 'flowsheet'],
    ['/infants/inf-ashgrove/record', 'record'],
    ['/infants/inf-ashgrove/correct/rdg-42', 'correct'],
  ])('%s is served its pre-rendered page', async (url, expected) => {
    const res = await request(env.app).get(url);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/text\/html/);
    expect(res.headers['cache-control']).toBe('no-cache');
    expect(body(res.text)).toBe(expected);
  });

  it('answers an unknown path with the not-found page and a 404, and never serves a group folder by its own name', async () => {
    for (const url of ['/nowhere', '/infants/inf-ashgrove/record/extra', '/(app)/board']) {
      const res = await request(env.app).get(url);
      expect(res.status).toBe(404);
      expect(body(res.text)).toBe('not found');
    }
  });

  it('allows the pages’ inline script by its hash and no other inline script', async () => {
    const res = await request(env.app).get('/sign-in');
    const csp = String(res.headers['content-security-policy']);
    const scriptSrc = /script-src ([^;]+)/.exec(csp)?.[1] ?? '';
    const hash = `'sha256-${createHash('sha256').update(INLINE).digest('base64')}'`;
    expect(scriptSrc.split(' ').sort()).toEqual(["'self'", hash].sort());
    expect(scriptSrc).not.toContain('unsafe-inline');
  });

  it('serves the hashed bundles as immutable and leaves the API its own 404', async () => {
    const js = await request(env.app).get('/_expo/static/js/web/entry-abc.js');
    expect(js.status).toBe(200);
    expect(js.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    const api = await request(env.app).get('/api/nowhere');
    expect(api.status).toBe(404);
    expect(api.headers['content-type']).toMatch(/json/);
  });

  it('names each page’s own scripts in a preload header, so the phone asks for them before parsing the page', async () => {
    const sheet = await request(env.app).get('/infants/inf-ashgrove');
    expect(sheet.headers.link).toBe('</_expo/static/js/web/entry-abc.js>; rel=preload; as=script, </_expo/static/js/web/flowsheet-def.js>; rel=preload; as=script');
    const list = await request(env.app).get('/infants');
    expect(list.headers.link).toBe('</_expo/static/js/web/entry-abc.js>; rel=preload; as=script');
    const js = await request(env.app).get('/_expo/static/js/web/entry-abc.js');
    expect(js.headers.link).toBeUndefined();
  });

  it('sends the pages compressed when the browser accepts it', async () => {
    const res = await request(env.app).get('/infants/inf-ashgrove').set('Accept-Encoding', 'gzip');
    expect(res.status).toBe(200);
    expect(res.headers['content-encoding']).toBe('gzip');
    expect(body(res.text)).toBe('flowsheet');
  });
});
