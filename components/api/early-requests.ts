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
 *
 * A successful answer is also parsed as it arrives. A screen that mounts after that starts from
 * it (`takeEarlyAnswer`, as a query's initial data), so its rows are drawn in the same pass as
 * the page around them rather than one asynchronous round later.
 * tests/components/early-requests.test.tsx runs the script against the screens' own paths.
 */
import { FLOWSHEET_FIRST_HOURS, flowsheetPath, MY_INFANTS_PATH } from './paths';

/** Stands for the page's id in a read's path; encodeURIComponent leaves it as it is. */
const PAGE_ID = 'PAGE_ID';

/** A page path pattern (matched against location.pathname) and the API paths it reads first; `$1` is the pattern's first group. */
export const EARLY_ROUTES: readonly { page: RegExp; reads: string[] }[] = [
  { page: /^\/infants\/?$/, reads: [MY_INFANTS_PATH] },
  { page: /^\/infants\/([^/]+)\/?$/, reads: [flowsheetPath(PAGE_ID, FLOWSHEET_FIRST_HOURS).replace(PAGE_ID, '$1')] },
];

/** How long an early answer waits to be taken; after that the screen fetches afresh. */
export const EARLY_MAX_AGE_MS = 30_000;

const GLOBAL = '__warmfoldEarly';

/** A successful early answer, parsed, and when it arrived (ms since the epoch). */
export interface EarlyAnswer {
  body: unknown;
  at: number;
}

interface EarlyReads {
  token: string;
  openedAt: number;
  reads: Record<string, Promise<Response>>;
  answers: Record<string, EarlyAnswer>;
}

/** The inline script's source: plain ES5, no imports, nothing that can throw out of it. */
export function earlyRequestScript(tokenKey: string, apiBase = '/api'): string {
  const routes = EARLY_ROUTES.map((r) => [r.page.source, r.reads]);
  return (
    `(function(){try{var t=localStorage.getItem(${JSON.stringify(tokenKey)});if(!t||typeof fetch!=='function')return;` +
    `var p=location.pathname,r=${JSON.stringify(routes)},h={Accept:'application/json',Authorization:'Bearer '+t},o={},d={};` +
    `function read(a){o[a]=fetch(${JSON.stringify(apiBase)}+a,{headers:h});` +
    `o[a].then(function(s){if(s.ok)return s.clone().json().then(function(b){d[a]={body:b,at:Date.now()}})}).catch(function(){})}` +
    `for(var i=0;i<r.length;i++){var m=new RegExp(r[i][0]).exec(p);if(!m)continue;` +
    `for(var j=0;j<r[i][1].length;j++)read(r[i][1][j].replace('$1',m[1]||''));break}` +
    `window.${GLOBAL}={token:t,openedAt:Date.now(),reads:o,answers:d}}catch(e){}})();`
  );
}

/** The early response or parsed answer for `path`, if the page started one for this token and it is fresh. Either is taken once, and takes the other with it. */
function take<K extends 'reads' | 'answers'>(kind: K, path: string, token: string | null, now: number): EarlyReads[K][string] | null {
  const early = (globalThis as { [GLOBAL]?: EarlyReads })[GLOBAL];
  if (!early || !token || early.token !== token || now - early.openedAt > EARLY_MAX_AGE_MS) return null;
  const found = early[kind][path];
  if (!found) return null;
  delete early.reads[path];
  delete early.answers[path];
  return found as EarlyReads[K][string];
}

/** The early response for `path`, for `api()`. */
export function takeEarlyRead(path: string, token: string | null, now = Date.now()): Promise<Response> | null {
  return take('reads', path, token, now);
}

/** The early answer for `path`, parsed, if it has already arrived (successfully): a screen's first data. */
export function takeEarlyAnswer(path: string, token: string | null, now = Date.now()): EarlyAnswer | null {
  return take('answers', path, token, now);
}

/** Sign-out and a change of user: drop whatever the page read early (patient data in memory). */
export function forgetEarlyReads(): void {
  delete (globalThis as { [GLOBAL]?: EarlyReads })[GLOBAL];
}
