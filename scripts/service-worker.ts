/**
 * After `expo export`: write dist/sw.js, the service worker that lets an installed Warmfold open
 * with no connection (scripts/sw-template.js), with Workbox's runtime copied into dist/ and the
 * list of the build's files to keep (pages, bundles, fonts, icons). Run by `npm run build:web`.
 */
import fs from 'node:fs';
import path from 'node:path';
import { copyWorkboxLibraries, injectManifest } from 'workbox-build';
import { htmlRoutes } from '../server/web';

async function main(): Promise<void> {
  const dist = path.resolve(process.argv[2] ?? 'dist');
  if (!fs.existsSync(path.join(dist, 'index.html'))) throw new Error(`${dist} has no index.html: run the web export first`);
  for (const d of fs.readdirSync(dist)) if (/^workbox-v/.test(d)) fs.rmSync(path.join(dist, d), { recursive: true, force: true });
  const workboxDir = await copyWorkboxLibraries(dist);
  const pages = htmlRoutes(dist).map((r) => [r.pattern.source, '/' + path.relative(dist, r.file).split(path.sep).join('/')]);
  const template = fs.readFileSync(path.join(__dirname, 'sw-template.js'), 'utf8').replaceAll('__WORKBOX_DIR__', workboxDir).replace('__PAGE_ROUTES__', JSON.stringify(pages));
  const src = path.join(dist, 'sw.src.js');
  fs.writeFileSync(src, template);
  try {
    const { count, size, warnings } = await injectManifest({
      swSrc: src,
      swDest: path.join(dist, 'sw.js'),
      globDirectory: dist,
      globPatterns: ['**/*.{html,js,woff2,png,ico,webmanifest}'],
      // The (app) copies are never served; the runtime and the worker itself are not precached.
      globIgnores: ['(app)/**', 'workbox-v*/**', 'sw.js', 'sw.src.js', '**/*.map'],
      // Bundles and fonts carry their content hash in their names.
      dontCacheBustURLsMatching: /-[0-9a-f]{16,}\.|[\\/]_expo[\\/]/,
      maximumFileSizeToCacheInBytes: 4 * 1024 * 1024,
    });
    for (const w of warnings) process.stderr.write(`service worker: ${w}\n`);
    process.stdout.write(`service worker: ${count} files (${(size / 1024).toFixed(0)} KB) kept for use with no connection\n`);
  } finally {
    fs.rmSync(src, { force: true });
  }
}

main().catch((err: unknown) => {
  process.stderr.write(`service worker build failed: ${err instanceof Error ? err.message : String(err)}\n`);
  process.exit(1);
});
