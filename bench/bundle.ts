/** The exported web build: every file's size raw, gzip and brotli, and the JavaScript a route loads first. */
import fs from 'node:fs';
import path from 'node:path';
import zlib from 'node:zlib';

export interface Sizes {
  raw: number;
  gzip: number;
  brotli: number;
}

export interface BundleFigures {
  js: Sizes & { files: number };
  css: Sizes & { files: number };
  fonts: Sizes & { files: number };
  assets: Sizes & { files: number };
  html: Sizes;
  /** The scripts index.html itself names: what every route loads before any split chunk. */
  entry: Sizes & { files: string[] };
  largestJs: ({ file: string } & Sizes)[];
}

const zero = (): Sizes => ({ raw: 0, gzip: 0, brotli: 0 });
const cache = new Map<string, Sizes>();

/** Sizes as a server would send the file: gzip level 9 and brotli quality 11, as precompressed. */
export function sizesOf(file: string): Sizes {
  const hit = cache.get(file);
  if (hit) return hit;
  const buf = fs.readFileSync(file);
  const sizes = {
    raw: buf.length,
    gzip: zlib.gzipSync(buf, { level: 9 }).length,
    brotli: zlib.brotliCompressSync(buf, { params: { [zlib.constants.BROTLI_PARAM_QUALITY]: 11, [zlib.constants.BROTLI_PARAM_SIZE_HINT]: buf.length } }).length,
  };
  cache.set(file, sizes);
  return sizes;
}

function add(into: Sizes, s: Sizes): void {
  into.raw += s.raw;
  into.gzip += s.gzip;
  into.brotli += s.brotli;
}

function walk(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((d) => (d.isDirectory() ? walk(path.join(dir, d.name)) : [path.join(dir, d.name)]));
}

export function analyseBundle(distDir: string): BundleFigures {
  const out: BundleFigures = {
    js: { ...zero(), files: 0 },
    css: { ...zero(), files: 0 },
    fonts: { ...zero(), files: 0 },
    assets: { ...zero(), files: 0 },
    html: zero(),
    entry: { ...zero(), files: [] },
    largestJs: [],
  };
  // Precompressed copies (.gz, .br) are the same bytes again; count each file once.
  for (const file of walk(distDir).filter((f) => !/\.(gz|br)$/.test(f))) {
    const ext = path.extname(file).toLowerCase();
    const s = sizesOf(file);
    const bucket = ext === '.js' ? out.js : ext === '.css' ? out.css : /\.(ttf|otf|woff2?)$/.test(ext) ? out.fonts : ext === '.html' ? null : out.assets;
    if (bucket) {
      add(bucket, s);
      bucket.files += 1;
    } else add(out.html, s);
    if (ext === '.js') out.largestJs.push({ file: path.relative(distDir, file), ...s });
  }
  out.largestJs.sort((a, b) => b.gzip - a.gzip).splice(5);
  const html = fs.readFileSync(path.join(distDir, 'index.html'), 'utf8');
  for (const m of html.matchAll(/<script[^>]+src="([^"]+)"/g)) {
    const rel = m[1]!.replace(/^\//, '');
    const file = path.join(distDir, rel);
    if (!fs.existsSync(file)) continue;
    out.entry.files.push(`/${rel}`);
    add(out.entry, sizesOf(file));
  }
  return out;
}

/** Sum the sizes of the scripts a page loaded (paths as the browser asked for them). */
export function scriptsSize(distDir: string, scripts: string[]): Sizes {
  const total = zero();
  for (const p of new Set(scripts)) {
    const file = path.join(distDir, decodeURIComponent(p).replace(/^\//, ''));
    if (fs.existsSync(file)) add(total, sizesOf(file));
  }
  return total;
}
