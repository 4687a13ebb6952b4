import { Asset } from 'expo-asset';
import { WEB_FONT_FAMILY } from './theme';

// @expo-google-fonts/inter's four weights, cut down to the characters Warmfold writes and
// compressed as WOFF2 by scripts/web-fonts.mjs: 136 KB in all instead of 1.3 MB of TrueType.
const FACES: [source: number, weight: number][] = [
  [require('@/assets/fonts/inter-400.woff2') as number, 400],
  [require('@/assets/fonts/inter-500.woff2') as number, 500],
  [require('@/assets/fonts/inter-600.woff2') as number, 600],
  [require('@/assets/fonts/inter-700.woff2') as number, 700],
];

let declared = false;

/**
 * Web: the four Inter files shipped in the bundle become one family with real weights, so the
 * theme asks for "Inter, system sans-serif" at a weight and a phone without Inter yet shows its
 * own sans-serif at the same weight (never a serif, never a synthetic bold).
 *
 * `font-display: optional`: even cut down, the files take a second on busy hospital Wi-Fi. The
 * page never waits for them and never swaps them in late: a late swap re-wraps names and moves
 * a nurse's list under her finger (a layout shift of 0.3 on My infants). Inter is used when it
 * is at hand within about 100 ms (cached from an earlier visit); the download still completes
 * and is cached, so the next visit opens in Inter.
 */
export function useAppFonts(): boolean {
  if (!declared && typeof document !== 'undefined') {
    declared = true;
    const family = WEB_FONT_FAMILY.split(',')[0]!.trim();
    const css = FACES.map(
      ([source, weight]) =>
        `@font-face{font-family:${family};src:url("${Asset.fromModule(source).uri}") format("woff2");font-weight:${weight};font-style:normal;font-display:optional}`,
    ).join('\n');
    const style = document.createElement('style');
    style.id = 'warmfold-fonts';
    style.textContent = css;
    document.head.appendChild(style);
  }
  return true;
}
