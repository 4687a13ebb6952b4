import type { PropsWithChildren } from 'react';
import { API_BASE } from '@/components/api/client';
import { earlyRequestScript } from '@/components/api/early-requests';
import { TOKEN_KEY, USER_KEY } from '@/components/auth/session-keys';
import { darkTheme, lightTheme } from '@/components/theme/theme';

/**
 * The page around every statically rendered route (`web.output: "static"`); runs only in Node at
 * export time. The markup inside is rendered in the light theme, so it is shown at once only where
 * the light theme is what the app will draw: on a light-scheme device, or for a user who chose
 * light. Where the app will draw dark (a dark-scheme device, or a user who chose dark in
 * Settings), #root stays hidden on the dark background until the app has drawn itself
 * (WebGlobalStyle shows it), so a nurse at night never gets a white flash.
 */
const light = lightTheme.colors;
const dark = darkTheme.colors;
const RESET = `
html, body { height: 100%; margin: 0; background: ${light.background}; color: ${light.text}; }
body { overflow: hidden; }
#root { display: flex; height: 100%; flex: 1; }
@media (prefers-color-scheme: dark) {
  html:not([data-wf-theme=light]), html:not([data-wf-theme=light]) body { background: ${dark.background}; color: ${dark.text}; }
  html:not([data-wf-theme=light]) #root { visibility: hidden; }
}
html[data-wf-theme=dark], html[data-wf-theme=dark] body { background: ${dark.background}; color: ${dark.text}; }
html[data-wf-theme=dark] #root { visibility: hidden; }`;

/** The signed-in user's own theme choice, read before the first paint (the CSP allows this script by its hash). */
const THEME_CHOICE = `try{var u=JSON.parse(localStorage.getItem(${JSON.stringify(USER_KEY)})||'null');if(u&&(u.theme==='dark'||u.theme==='light'))document.documentElement.setAttribute('data-wf-theme',u.theme)}catch(e){}`;

export default function Root({ children }: PropsWithChildren) {
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1, shrink-to-fit=no" />
        <meta name="theme-color" content="#1F4E5A" />
        {/* Installable on a ward phone; the service worker (scripts/sw-template.js) opens it with no connection. */}
        <link rel="manifest" href="/manifest.webmanifest" />
        <link rel="apple-touch-icon" href="/icons/icon-192.png" />
        <script dangerouslySetInnerHTML={{ __html: THEME_CHOICE }} />
        {/* A bedside page starts its first reads now, while its scripts arrive (components/api/early-requests.ts). */}
        <script dangerouslySetInnerHTML={{ __html: earlyRequestScript(TOKEN_KEY, `${API_BASE}/api`) }} />
        <style id="expo-reset" dangerouslySetInnerHTML={{ __html: RESET }} />
      </head>
      <body>
        <noscript>Warmfold needs JavaScript switched on in this browser.</noscript>
        {children}
      </body>
    </html>
  );
}
