// Writes the web app's Inter files (assets/fonts/inter-*.woff2): the four weights Warmfold uses,
// from @expo-google-fonts/inter, cut down to the characters the app writes and compressed as WOFF2.
// The package's TrueType files are 1.3 MB together (about 520 KB even brotli-compressed), seconds
// on busy ward Wi-Fi; the subsets are a fraction of that. The native app keeps the full files.
//
//   node scripts/web-fonts.mjs           write the files
//   node scripts/web-fonts.mjs --check   exit 1 if a committed file differs from what this writes
//
// A character outside WEB_FONT_TEXT still shows, in the phone's own sans-serif.
import fs from 'node:fs';
import path from 'node:path';
import { createRequire } from 'node:module';
import subsetFont from 'subset-font';

const require = createRequire(import.meta.url);
const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), '..');

/** Inclusive code point ranges: Latin (names of staff and infants in European languages), the
 * punctuation and signs the screens use (°, ±, ×, ≤, ≥, −, dashes, quotes, bullets, arrows), the
 * spaces Intl puts into formatted times and numbers (no-break, narrow no-break, thin), and the
 * blocks of the marks the screens draw as text (✓, ●, ○, ☐, ⌈). Characters Inter does not have
 * are skipped; tests/shared/web-fonts.test.ts checks that every character the source writes is in
 * a range. */
export const WEB_FONT_RANGES = [
  [0x20, 0x7e],
  [0xa0, 0xff],
  [0x100, 0x17f],
  [0x2009, 0x200a],
  [0x2010, 0x2027],
  [0x202f, 0x202f],
  [0x2030, 0x203a],
  [0x20ac, 0x20ac],
  [0x2190, 0x2193],
  [0x2212, 0x2212],
  [0x2248, 0x2248],
  [0x2264, 0x2265],
  [0x2300, 0x23ff],
  [0x25a0, 0x25ff],
  [0x2600, 0x27bf],
];

export const WEB_FONT_TEXT = WEB_FONT_RANGES.flatMap(([from, to]) => Array.from({ length: to - from + 1 }, (_, i) => String.fromCodePoint(from + i))).join('');

export const WEB_FONT_WEIGHTS = [
  [400, '400Regular/Inter_400Regular.ttf'],
  [500, '500Medium/Inter_500Medium.ttf'],
  [600, '600SemiBold/Inter_600SemiBold.ttf'],
  [700, '700Bold/Inter_700Bold.ttf'],
];

export const webFontFile = (weight) => path.join(root, 'assets', 'fonts', `inter-${weight}.woff2`);

export async function buildWebFont(ttfPath) {
  return subsetFont(fs.readFileSync(ttfPath), WEB_FONT_TEXT, { targetFormat: 'woff2' });
}

async function main() {
  const check = process.argv.includes('--check');
  let stale = 0;
  for (const [weight, file] of WEB_FONT_WEIGHTS) {
    const source = require.resolve(`@expo-google-fonts/inter/${file}`);
    const out = await buildWebFont(source);
    const target = webFontFile(weight);
    if (check) {
      const same = fs.existsSync(target) && Buffer.compare(fs.readFileSync(target), out) === 0;
      if (!same) stale++;
      process.stdout.write(`${path.relative(root, target)}: ${same ? 'up to date' : 'differs'}\n`);
    } else {
      fs.mkdirSync(path.dirname(target), { recursive: true });
      fs.writeFileSync(target, out);
      process.stdout.write(`${path.relative(root, target)}: ${(out.length / 1024).toFixed(1)} KiB (from ${(fs.statSync(source).size / 1024).toFixed(0)} KiB)\n`);
    }
  }
  if (stale) process.exit(1);
}

if (process.argv[1] && path.resolve(process.argv[1]) === path.resolve(new URL(import.meta.url).pathname)) await main();
