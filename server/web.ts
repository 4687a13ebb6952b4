/**
 * The exported web build (`web.output: "static"` in app.json): one pre-rendered HTML page per
 * route, so a phone on slow Wi-Fi paints the page before the JavaScript arrives, plus the hashed
 * bundles, fonts and images. Expo Router writes no manifest for a static export, so the pages'
 * paths are read from the file names: `infants/[id].html` answers /infants/<any id>.
 */
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import express, { type Express } from 'express';
import { precompressed } from './precompressed';

/** CSP hashes of the inline scripts in the exported pages (the same few on every page). */
export function inlineScriptHashes(webDir: string): string[] {
  const hashes = new Set<string>();
  const walk = (dir: string) => {
    if (!fs.existsSync(dir)) return;
    for (const d of fs.readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, d.name);
      if (d.isDirectory()) {
        if (d.name !== '_expo' && d.name !== 'assets') walk(full);
      } else if (d.name.endsWith('.html')) {
        for (const m of fs.readFileSync(full, 'utf8').matchAll(/<script(?![^>]*\bsrc=)[^>]*>([\s\S]*?)<\/script>/g)) {
          hashes.add(`'sha256-${createHash('sha256').update(m[1]!).digest('base64')}'`);
        }
      }
    }
  };
  walk(webDir);
  return [...hashes];
}

/** One pre-rendered page of the static export and the paths it answers. */
export interface HtmlRoute {
  file: string;
  pattern: RegExp;
  dynamic: number;
  /** A `Link` header preloading the page's scripts, or null if it has none. */
  preload: string | null;
}

/**
 * The page's scripts as a `Link: <…>; rel=preload; as=script` header value. Expo writes the
 * script tags at the end of the body, after the page's styles and inline scripts; on a slow phone
 * whose main thread is busy with those, the requests waited for the parser (up to a quarter of a
 * second at 4x CPU in the bench). With the header the browser asks for them as it opens the page.
 */
export function scriptPreloads(html: string): string | null {
  const srcs = [...html.matchAll(/<script\b[^>]*\bsrc="([^"]+)"[^>]*>/g)].map((m) => m[1]!).filter((src) => src.startsWith('/'));
  return srcs.length ? srcs.map((src) => `<${src}>; rel=preload; as=script`).join(', ') : null;
}

/**
 * Expo Router's `output: "static"` writes one HTML file per route (`infants/[id].html`,
 * `infants/index.html`) and no routes manifest; map each request path to its file.
 * Group folders (`(app)/...`) are duplicates of the hoisted copies and are skipped.
 */
export function htmlRoutes(webDir: string): HtmlRoute[] {
  const out: HtmlRoute[] = [];
  const walk = (rel: string) => {
    for (const d of fs.readdirSync(path.join(webDir, rel), { withFileTypes: true })) {
      const r = rel ? `${rel}/${d.name}` : d.name;
      if (d.isDirectory()) {
        if (!/^(_expo|assets|\(.*\))$/.test(d.name)) walk(r);
      } else if (d.name.endsWith('.html') && !/^(\+not-found|_sitemap)\.html$/.test(r)) {
        const segs = r.replace(/\.html$/, '').split('/');
        if (segs[segs.length - 1] === 'index') segs.pop();
        let dynamic = 0;
        const src = segs
          .map((seg) => {
            if (/^\[\.\.\..+\]$/.test(seg)) return ((dynamic += 10), '.+');
            if (/^\[.+\]$/.test(seg)) return ((dynamic += 1), '[^/]+');
            return seg.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
          })
          .join('/');
        const file = path.join(webDir, r);
        out.push({ file, pattern: new RegExp(`^/${src}/?$`), dynamic, preload: scriptPreloads(fs.readFileSync(file, 'utf8')) });
      }
    }
  };
  walk('');
  return out.sort((a, b) => a.dynamic - b.dynamic);
}

/** The exported web build: each route's pre-rendered HTML, the hashed bundles and assets. */
export function serveWeb(app: Express, webDir: string): void {
  const index = path.join(webDir, 'index.html');
  if (!fs.existsSync(index)) {
    app.get('/', (_req, res) => {
      res.type('text').send('Warmfold API is running. The web app has not been built: run `npm run build:web`.');
    });
    return;
  }
  // Hashed bundles never change; the HTML must always be fresh.
  // The service worker and the manifest are checked for a new build at every visit.
  const cacheControl = (file: string) =>
    /[\\/]_expo[\\/]|[\\/]assets[\\/]/.test(file) ? 'public, max-age=31536000, immutable' : /\.html$|[\\/]sw\.js$|\.webmanifest$/.test(file) ? 'no-cache' : null;
  const routes = htmlRoutes(webDir);
  const notFound = path.join(webDir, '+not-found.html');
  // Rewrite a page's path to its HTML file, so the precompressed and static handlers below serve it.
  app.use((req, res, next) => {
    if ((req.method !== 'GET' && req.method !== 'HEAD') || path.extname(req.path)) return next();
    const route = routes.find((r) => r.pattern.test(req.path));
    if (!route) return next();
    if (route.preload) res.set('Link', route.preload);
    req.url = '/' + path.relative(webDir, route.file).split(path.sep).map(encodeURIComponent).join('/');
    next();
  });
  app.use(precompressed(webDir, cacheControl));
  app.use(
    express.static(webDir, {
      index: false,
      setHeaders(res, file) {
        const cache = cacheControl(file);
        if (cache) res.set('Cache-Control', cache);
      },
    }),
  );
  app.get('/{*splat}', (_req, res) => {
    res.set('Cache-Control', 'no-cache');
    if (fs.existsSync(notFound)) res.status(404).sendFile(notFound);
    else res.sendFile(index);
  });
}
