/**
 * The inline script a pre-rendered page runs before its JavaScript arrives: it must ask for
 * exactly what the screens' queries will ask for (same paths, same headers), only with a stored
 * session, and api() must take each answer once, for the same token, while it is fresh.
 */
import vm from 'node:vm';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { renderHook } from '@testing-library/react-native';
import type { ReactNode } from 'react';
import { api, configureApi } from '@/components/api/client';
import { EARLY_MAX_AGE_MS, earlyRequestScript, takeEarlyAnswer, takeEarlyRead } from '@/components/api/early-requests';
import { useFlowsheetQuery, useMyInfantsQuery } from '@/components/queries/infants';
import { FLOWSHEET_FIRST_HOURS, flowsheetPath, MY_INFANTS_PATH } from '@/components/api/paths';
import { TOKEN_KEY } from '@/components/auth/session-keys';

/** Runs the script in a fresh context, as a page at `pathname` with `token` stored; returns what it fetched. */
function runScript(pathname: string, token: string | null, status = 200) {
  const fetched: { url: string; headers: Record<string, string> }[] = [];
  const window: Record<string, unknown> = {};
  const context = vm.createContext({
    window,
    location: { pathname },
    localStorage: { getItem: (key: string) => (key === TOKEN_KEY ? token : null) },
    fetch: (url: string, init: { headers: Record<string, string> }) => {
      fetched.push({ url, headers: init.headers });
      return Promise.resolve(new Response(JSON.stringify({ url }), { status, headers: { 'Content-Type': 'application/json' } }));
    },
    Date,
    RegExp,
  });
  vm.runInContext(earlyRequestScript(TOKEN_KEY, '/api'), context);
  return { fetched, early: window.__warmfoldEarly as { token: string; reads: Record<string, Promise<Response>>; answers: Record<string, unknown> } | undefined };
}

/** Lets the script's fetches resolve and their bodies be parsed. */
const arrived = () => new Promise((resolve) => setTimeout(resolve, 0));

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

  it('parses a successful answer as it arrives and hands it over once, with its response, for the same token', async () => {
    const { early } = runScript('/infants', 'tok-1');
    (globalThis as Record<string, unknown>).__warmfoldEarly = early;
    expect(takeEarlyAnswer(MY_INFANTS_PATH, 'tok-1')).toBeNull(); // not arrived yet
    await arrived();
    expect(takeEarlyAnswer(MY_INFANTS_PATH, 'tok-2')).toBeNull();
    expect(takeEarlyAnswer(MY_INFANTS_PATH, 'tok-1', Date.now() + EARLY_MAX_AGE_MS + 1)).toBeNull();
    const answer = takeEarlyAnswer(MY_INFANTS_PATH, 'tok-1');
    expect(answer?.body).toEqual({ url: `/api${MY_INFANTS_PATH}` });
    expect(answer!.at).toBeLessThanOrEqual(Date.now());
    // Taken with its answer: api() now fetches afresh rather than reading the same response again.
    expect(takeEarlyRead(MY_INFANTS_PATH, 'tok-1')).toBeNull();
    expect(takeEarlyAnswer(MY_INFANTS_PATH, 'tok-1')).toBeNull();
  });

  it('keeps a refused answer (a 401) for api(), which signs out, never as a screen’s data', async () => {
    const { early } = runScript('/infants', 'tok-1', 401);
    (globalThis as Record<string, unknown>).__warmfoldEarly = early;
    await arrived();
    expect(takeEarlyAnswer(MY_INFANTS_PATH, 'tok-1')).toBeNull();
    expect(takeEarlyRead(MY_INFANTS_PATH, 'tok-1')).not.toBeNull();
  });

  it('a response api() has taken is not handed out again as data', async () => {
    const { early } = runScript('/infants', 'tok-1');
    (globalThis as Record<string, unknown>).__warmfoldEarly = early;
    await arrived();
    expect(takeEarlyRead(MY_INFANTS_PATH, 'tok-1')).not.toBeNull();
    expect(takeEarlyAnswer(MY_INFANTS_PATH, 'tok-1')).toBeNull();
  });

  describe('the screens’ queries', () => {
    // gcTime Infinity: no garbage-collection timer outlives the test.
    const wrapper = ({ children }: { children: ReactNode }) => (
      <QueryClientProvider client={new QueryClient({ defaultOptions: { queries: { gcTime: Infinity } } })}>{children}</QueryClientProvider>
    );
    let network: string[];
    const realFetch = globalThis.fetch;
    beforeEach(() => {
      network = [];
      globalThis.fetch = ((url: string) => {
        network.push(url);
        return new Promise<Response>(() => {}); // never answers: only what the page already has can be shown
      }) as typeof fetch;
      configureApi({ token: () => 'tok-1', onUnauthorized: () => {} });
    });
    afterEach(() => {
      globalThis.fetch = realFetch;
    });

    it('My infants draws the arrived answer in its first render, fresh, without asking again', async () => {
      const infants = [{ id: 'inf-ashgrove', displayName: 'Baby Ashgrove' }];
      (globalThis as Record<string, unknown>).__warmfoldEarly = {
        token: 'tok-1',
        openedAt: Date.now(),
        reads: { [MY_INFANTS_PATH]: Promise.resolve(new Response('{}')) },
        answers: { [MY_INFANTS_PATH]: { body: { infants }, at: Date.now() } },
      };
      const { result } = renderHook(() => useMyInfantsQuery(), { wrapper });
      expect(result.current.data).toEqual(infants);
      expect(result.current.isStale).toBe(false);
      await arrived();
      expect(network).toEqual([]);
    });

    it('the flowsheet starts from its own window’s answer only, and fetches when there is none', async () => {
      const sheet = flowsheetPath('inf-ashgrove', FLOWSHEET_FIRST_HOURS);
      (globalThis as Record<string, unknown>).__warmfoldEarly = {
        token: 'tok-1',
        openedAt: Date.now(),
        reads: { [sheet]: Promise.resolve(new Response('{}')) },
        answers: { [sheet]: { body: { readings: ['first window'] }, at: Date.now() } },
      };
      const other = renderHook(() => useFlowsheetQuery('inf-ashgrove', 72), { wrapper });
      expect(other.result.current.data).toBeUndefined();
      const first = renderHook(() => useFlowsheetQuery('inf-ashgrove', FLOWSHEET_FIRST_HOURS), { wrapper });
      expect(first.result.current.data).toEqual({ readings: ['first window'] });
      await arrived();
      expect(network).toEqual([`/api${flowsheetPath('inf-ashgrove', 72)}`]);
    });
  });
});
