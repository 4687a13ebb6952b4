import type { RequestHandler } from 'express';
import fs from 'node:fs';
import path from 'node:path';
import { promisify } from 'node:util';
import zlib from 'node:zlib';
import { acceptedEncodings } from './compressed-body';

const brotli = promisify(zlib.brotliCompress);
const gzip = promisify(zlib.gzip);

/** Text and font types that shrink; images in dist are already compressed. */
const COMPRESSIBLE: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'application/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.map': 'application/json; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.ttf': 'font/ttf',
  '.otf': 'font/otf',
  '.ico': 'image/x-icon',
  '.txt': 'text/plain; charset=utf-8',
};
const MIN_BYTES = 1024;

interface Entry {
  type: string;
  br: Promise<Buffer>;
  gz: Promise<Buffer>;
  brReady: Buffer | null;
  gzReady: Buffer | null;
}

/**
 * Serves the web build's files brotli- or gzip-compressed, compressed once and kept in memory.
 * The build is immutable while the server runs (hashed names), so paying brotli's top quality
 * once beats compressing on every request, which is what the `compression` middleware (used for
 * the API's answers) would do here. Compression runs on libuv's thread pool and starts at boot,
 * so the event loop never waits for it; a request that arrives first gets gzip (quick) while
 * brotli finishes.
 */
export function precompressed(webDir: string, cacheControl: (file: string) => string | null): RequestHandler {
  const root = path.resolve(webDir);
  const entries = new Map<string, Entry>();

  const entryFor = (file: string): Entry | null => {
    const hit = entries.get(file);
    if (hit) return hit;
    const type = COMPRESSIBLE[path.extname(file).toLowerCase()];
    if (!type) return null;
    let stat: fs.Stats;
    try {
      stat = fs.statSync(file);
    } catch {
      return null;
    }
    if (!stat.isFile() || stat.size < MIN_BYTES) return null;
    const raw = fs.readFileSync(file);
    const entry: Entry = {
      type,
      gz: gzip(raw, { level: 9 }),
      br: brotli(raw, { params: { [zlib.constants.BROTLI_PARAM_QUALITY]: 11, [zlib.constants.BROTLI_PARAM_SIZE_HINT]: raw.length } }),
      brReady: null,
      gzReady: null,
    };
    void entry.gz.then((b) => (entry.gzReady = b));
    void entry.br.then((b) => (entry.brReady = b));
    entries.set(file, entry);
    return entry;
  };

  // Warm the cache at start-up with what every first visit needs: the pages, scripts and fonts.
  const warm = (dir: string) => {
    for (const d of fs.existsSync(dir) ? fs.readdirSync(dir, { withFileTypes: true }) : []) {
      const full = path.join(dir, d.name);
      if (d.isDirectory()) warm(full);
      else entryFor(full);
    }
  };
  warm(root);

  return (req, res, next) => {
    if (req.method !== 'GET' && req.method !== 'HEAD') return next();
    let rel: string;
    try {
      rel = decodeURIComponent(req.path);
    } catch {
      return next();
    }
    const file = path.join(root, rel);
    if (!file.startsWith(root + path.sep)) return next();
    const { br: wantsBr, gzip: wantsGz } = acceptedEncodings(req);
    if (!wantsBr && !wantsGz) return next();
    const entry = entryFor(file);
    if (!entry) return next();
    const send = (body: Buffer, encoding: 'br' | 'gzip') => {
      res.set('Content-Type', entry.type);
      res.set('Content-Encoding', encoding);
      res.set('Vary', 'Accept-Encoding');
      res.set('Content-Length', String(body.length));
      const cache = cacheControl(file);
      if (cache) res.set('Cache-Control', cache);
      if (req.method === 'HEAD') res.end();
      else res.end(body);
    };
    if (wantsBr && entry.brReady) return send(entry.brReady, 'br');
    if (wantsGz && entry.gzReady) return send(entry.gzReady, 'gzip');
    (wantsGz ? entry.gz.then((b) => send(b, 'gzip')) : entry.br.then((b) => send(b, 'br'))).catch(next);
  };
}
