/**
 * The inline script a pre-rendered page runs before its JavaScript arrives: it must ask for
 * exactly what the screens' queries will ask for (same paths, same headers), only with a stored
 * session, and api() must take each answer once, for the same token, while it is fresh.
 */
import vm from 'node:vm';
import { api, configureApi } from '@/components/api/client';
import { EARLY_MAX_AGE_MS, earlyRequestScript, takeEarlyRead } from '@/components/api/early-requests';
import { FLOWSHEET_FIRST_HOURS, flowsheetPath, MY_INFANTS_PATH } from '@/components/api/paths';
import { TOKEN_KEY } from '@/components/auth/session-keys';

/** Runs the script in a fresh context, as a page at `pathname` with `token` stored; returns what it fetched. */
function runScript(pathname: string, token: string | null) {
  const fetched: Array<{ url: string; headers: Record<string, string> }> = [];
  const window: Record<string, unknown> = {};
  const context = vm.createContext({
    window,
    location: { pathname },
    localStorage: { getItem: (key: string) => (key === TOKEN_KEY ? token : null) },
    fetch: (url: string, init: { headers: Record<string, string> }) => {
      fetched.push({ url, headers: init.headers });
      return Promise.resolve(new Response(JSON.stringify({ url }), { status: 200, headers: { 'Content-Type': 'application/json' } }));
    },
    Date,
    RegExp,
  });
  vm.runInContext(earlyRequestScript(TOKEN_KEY, '/api'), context);
  return { fetched, early: window.__warmfoldEarly as { token: string; reads: Record<string, Promise<Response>> } | undefined };
}

afterEach(() => {
  delete (globalThis as Record<string, unknown>).__warmfoldEarly;
});

describe('the early reads', () => {
  it('My infants asks for the nurse’s own list, as the screen’s first query does', () => {
    const { fetched } = runScript('/infants', 'tok-1');
    expect(fetched.map((f) => f.url)).toEqual([`/api${MY_INFANTS_PATH}`]);
    expect(fetched[0]!.headers).toEqual({ Accept: 'application/json', Authorization: 'Bearer tok-1' });
  });

  it('the flowsheet asks for its first window of the infant in the address', () => {
    const { fetched } = runScript('/infants/inf-ashgrove', 'tok-1');
    expect(fetched.map((f) => f.url)).toEqual([`/api${flowsheetPath('inf-ashgrove', FLOWSHEET_FIRST_HOURS)}`]);
  });

  it('asks for nothing without a stored session, or on pages it does not know', () => {
    expect(runScript('/infants', null).fetched).toEqual([]);
    expect(runScript('/sign-in', 'tok-1').fetched).toEqual([]);
    expect(runScript('/infants/inf-ashgrove/record', 'tok-1').fetched).toEqual([]);
  });

  it('api() takes an early answer once, for the same token, while fresh, then fetches as usual', async () => {
    const { early } = runScript('/infants/inf-ashgrove', 'tok-1');
    const sheet = flowsheetPath('inf-ashgrove', FLOWSHEET_FIRST_HOURS);
    (globalThis as Record<string, unknown>).__warmfoldEarly = early;
    const real: string[] = [];
    const realFetch = globalThis.fetch;
    globalThis.fetch = ((url: string) => {
      real.push(url);
      return Promise.resolve(new Response(JSON.stringify({ url: 'network' }), { status: 200, headers: { 'Content-Type': 'application/json' } }));
    }) as typeof fetch;
    try {
      configureApi({ token: () => 'tok-1', onUnauthorized: () => {} });
      await expect(api<{ url: string }>(sheet)).resolves.toEqual({ url: `/api${sheet}` });
      await expect(api<{ url: string }>(sheet)).resolves.toEqual({ url: 'network' });
      expect(real).toEqual([`/api${sheet}`]);
    } finally {
      globalThis.fetch = realFetch;
    }
  });

  it('never hands an early answer to another user’s token, or after it has waited too long', () => {
    const { early } = runScript('/infants', 'tok-1');
    (globalThis as Record<string, unknown>).__warmfoldEarly = early;
    expect(takeEarlyRead(MY_INFANTS_PATH, 'tok-2')).toBeNull();
    expect(takeEarlyRead(MY_INFANTS_PATH, 'tok-1', Date.now() + EARLY_MAX_AGE_MS + 1)).toBeNull();
    expect(takeEarlyRead(MY_INFANTS_PATH, 'tok-1')).not.toBeNull();
    expect(takeEarlyRead(MY_INFANTS_PATH, 'tok-1')).toBeNull();
  });
});
