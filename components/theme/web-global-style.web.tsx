import { useEffect } from 'react';
import type { Theme } from './theme';

/**
 * Page-wide CSS that React Native styles cannot express: a focus ring on every control reached
 * by the keyboard (two-tone, so it shows on light and dark surfaces alike), and the page's own
 * colour scheme so scrollbars, overscroll and the browser bar stay dark at night, not white.
 */
function css(theme: Theme): string {
  const c = theme.colors;
  const halo = theme.name === 'dark' ? '#000000' : '#FFFFFF';
  return `
:root { color-scheme: ${theme.name}; --wf-focus: ${c.focus}; --wf-focus-halo: ${halo}; }
html, body { background-color: ${c.background} !important; margin: 0; }
/* The pre-rendered page (app/+html.tsx) may be hidden until now, or coloured by a stored choice. */
#root { visibility: visible !important; }
:focus-visible {
  outline: 3px solid var(--wf-focus) !important;
  outline-offset: 2px !important;
  box-shadow: 0 0 0 2px var(--wf-focus-halo) !important;
}
input:focus-visible, textarea:focus-visible, select:focus-visible { outline-offset: 0 !important; }
@media (prefers-reduced-motion: reduce) {
  *, *::before, *::after { animation-duration: 0.01ms !important; transition-duration: 0.01ms !important; }
}
@media print { :focus-visible { outline: none !important; box-shadow: none !important; } }
`;
}

/**
 * react-native-web's Pressable answers Enter, and Space only on buttons. ARIA asks more of the
 * roles we give it: a link opens on Enter, a radio, checkbox or switch is chosen with Space.
 * Native elements already behave; this only fills in for the div-based ones.
 */
function onKeyDown(event: KeyboardEvent): void {
  const el = event.target as HTMLElement | null;
  if (!el || event.altKey || event.ctrlKey || event.metaKey || event.shiftKey) return;
  const role = el.getAttribute('role');
  const native = el.tagName === 'A' || el.tagName === 'BUTTON' || el.tagName === 'INPUT';
  if (native || !role) return;
  const activate = (event.key === 'Enter' && role === 'link') || (event.key === ' ' && (role === 'radio' || role === 'checkbox' || role === 'switch'));
  if (!activate) return;
  // Caught on the way down, so the press happens once: here, and not again in Pressable.
  event.preventDefault();
  event.stopPropagation();
  el.click();
}

export function WebGlobalStyle({ theme }: { theme: Theme }): null {
  useEffect(() => {
    document.addEventListener('keydown', onKeyDown, true);
    return () => document.removeEventListener('keydown', onKeyDown, true);
  }, []);
  useEffect(() => {
    let style = document.getElementById('warmfold-global') as HTMLStyleElement | null;
    if (!style) {
      style = document.createElement('style');
      style.id = 'warmfold-global';
      document.head.appendChild(style);
    }
    style.textContent = css(theme);
    document.querySelector('meta[name="theme-color"]')?.setAttribute('content', theme.colors.surface);
  }, [theme]);
  return null;
}
