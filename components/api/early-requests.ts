/**
 * The reads a bedside page needs for its first screen, started by the page itself while its
 * JavaScript is still arriving. On a slow ward network the scripts take a second or two; without
 * this the list or flowsheet is only asked for after they have run, one more round trip later.
 *
 * app/+html.tsx puts `earlyRequestScript()` inline in every pre-rendered page (the CSP allows it
 * by hash). If a session is stored, it fetches the paths its route names below with the same
 * headers `api()` sends, and leaves the promises on `window`. `api()` takes each one once, for
 * the same path and token, within EARLY_MAX_AGE_MS of the page opening; anything else is
 * fetched as usual, so a mismatch costs a duplicate read and nothing more.
 * tests/components/early-requests.test.tsx runs the script against the screens' own paths.
 */
import { FLOWSHEET_FIRST_HOURS, flowsheetPath, MY_INFANTS_PATH } from './paths';

/** Stands for the page's id in a read's path; encodeURIComponent leaves it as it is. */
const PAGE_ID = 'PAGE_ID';

/** A page path pattern (matched against location.pathname) and the API paths it reads first; `$1` is the pattern's first group. */
export const EARLY_ROUTES: ReadonlyArray<{ page: RegExp; reads: string[] }> = [
  { page: /^\/infants\/?$/, reads: [MY_INFANTS_PATH] },
  { page: /^\/infants\/([^/]+)\/?$/, reads: [flowsheetPath(PAGE_ID, FLOWSHEET_FIRST_HOURS).replace(PAGE_ID, '$1')] },
];

/** How long an early answer waits to be taken; after that the screen fetches afresh. */
export const EARLY_MAX_AGE_MS = 30_000;

const GLOBAL = '__warmfoldEarly';

interface EarlyReads {
  token: string;
  openedAt: number;
  reads: Record<string, Promise<Response>>;
}

/** The inline script's source: plain ES5, no imports, nothing that can throw out of it. */
export function earlyRequestScript(tokenKey: string, apiBase = '/api'): string {
  const routes = EARLY_ROUTES.map((r) => [r.page.source, r.reads]);
  return (
    `(function(){try{var t=localStorage.getItem(${JSON.stringify(tokenKey)});if(!t||typeof fetch!=='function')return;` +
    `var p=location.pathname,r=${JSON.stringify(routes)},h={Accept:'application/json',Authorization:'Bearer '+t},o={};` +
    `for(var i=0;i<r.length;i++){var m=new RegExp(r[i][0]).exec(p);if(!m)continue;` +
    `for(var j=0;j<r[i][1].length;j++){var a=r[i][1][j].replace('$1',m[1]||'');o[a]=fetch(${JSON.stringify(apiBase)}+a,{headers:h});o[a].catch(function(){})}break}` +
    `window.${GLOBAL}={token:t,openedAt:Date.now(),reads:o}}catch(e){}})();`
  );
}

/** The early answer for `path`, if the page started one for this token and it is fresh; taken once. */
export function takeEarlyRead(path: string, token: string | null, now = Date.now()): Promise<Response> | null {
  const early = (globalThis as { [GLOBAL]?: EarlyReads })[GLOBAL];
  if (!early || !token || early.token !== token || now - early.openedAt > EARLY_MAX_AGE_MS) return null;
  const read = early.reads[path];
  if (!read) return null;
  delete early.reads[path];
  return read;
}
