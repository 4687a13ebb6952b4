import { onlineManager, QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { act, renderHook, waitFor } from '@testing-library/react-native';
import type { ReactNode } from 'react';
import { storage } from '@/components/api/storage';
import { TOKEN_KEY, USER_KEY } from '@/components/auth/session-keys';
import { flushPendingReadings, pendingReadings, startPendingFlush, usePendingReadings, type PendingReading } from '@/components/bedside/pending-readings';
import { useCreateReadingMutation } from '@/components/queries/infants';

/** The session as the auth provider stores it: the pending queue sends only under its owner's session. */
function signedInAs(id: string, token = `token-${id}`) {
  storage.set(TOKEN_KEY, token);
  storage.set(USER_KEY, JSON.stringify({ id, name: id, email: `${id}@warmfold.test`, role: 'nurse' }));
}

const INFANT = 'inf-test';
const body = (id: string): PendingReading['body'] => ({
  id,
  unit: 'C',
  takenAt: '2026-11-16T10:00:00.000Z',
  probe: 36.9,
  remote: 36.2,
  remoteSite: 'axilla',
  confirmedImplausible: false,
});

/**
 * A stand-in for the server: stores a reading once by its id, like the real route, and can
 * drop the connection before the request arrives or after it was stored (the answer is lost).
 */
function fakeServer() {
  const stored = new Map<string, unknown>();
  const posts: { id: string }[] = [];
  let mode: 'down' | 'lose-answer' | 'up' = 'up';
  const fetchMock = jest.fn(async (_url: string, init?: { body?: string }) => {
    if (mode === 'down') throw new TypeError('Failed to fetch');
    const sent = JSON.parse(init?.body ?? '{}') as { id: string };
    posts.push(sent);
    const created = !stored.has(sent.id);
    if (created) stored.set(sent.id, sent);
    if (mode === 'lose-answer') throw new TypeError('Network connection was lost');
    const json = { reading: { id: sent.id }, created, openFlags: [], nextCheck: { status: 'ok', dueAt: null, minutesLate: 0 }, raisedFlagIds: [], closedFlagIds: [] };
    return { ok: true, status: created ? 201 : 200, headers: { get: () => null }, json: async () => json } as unknown as Response;
  });
  return {
    stored,
    posts,
    fetchMock,
    set: (m: typeof mode) => {
      mode = m;
    },
  };
}

function setup() {
  const server = fakeServer();
  global.fetch = server.fetchMock as unknown as typeof fetch;
  const queryClient = new QueryClient({ defaultOptions: { queries: { retry: false, gcTime: Infinity }, mutations: { retry: false, gcTime: Infinity } } });
  const wrapper = ({ children }: { children: ReactNode }) => <QueryClientProvider client={queryClient}>{children}</QueryClientProvider>;
  return { server, queryClient, wrapper };
}

beforeEach(() => {
  for (const p of pendingReadings.all()) pendingReadings.remove(p.body.id);
  pendingReadings.reset();
  onlineManager.setOnline(true);
  signedInAs('u-nia');
});

describe('readings saved without a connection', () => {
  it('keeps a reading saved offline as "not yet saved", on the device', async () => {
    const { server, wrapper } = setup();
    server.set('down');
    const { result } = renderHook(() => ({ save: useCreateReadingMutation(INFANT), pending: usePendingReadings(INFANT) }), { wrapper });

    let outcome: Awaited<ReturnType<typeof result.current.save.mutateAsync>> | undefined;
    await act(async () => {
      outcome = await result.current.save.mutateAsync(body('11111111-1111-4111-8111-111111111111'));
    });

    expect(outcome).toMatchObject({ saved: false });
    expect(result.current.pending.map((p) => p.body.id)).toEqual(['11111111-1111-4111-8111-111111111111']);
    expect(result.current.pending[0]?.refusal).toBeUndefined();
    expect(server.stored.size).toBe(0);
    // A reload reads it back from storage.
    pendingReadings.reset();
    expect(pendingReadings.forInfant(INFANT)).toHaveLength(1);
  });

  it('sends it once when the connection returns', async () => {
    const { server, wrapper, queryClient } = setup();
    server.set('down');
    const { result } = renderHook(() => ({ save: useCreateReadingMutation(INFANT), pending: usePendingReadings(INFANT) }), { wrapper });
    await act(async () => {
      await result.current.save.mutateAsync(body('22222222-2222-4222-8222-222222222222'));
    });
    expect(result.current.pending).toHaveLength(1);

    act(() => onlineManager.setOnline(false));
    const stop = startPendingFlush(queryClient);
    try {
      server.set('up');
      const before = server.fetchMock.mock.calls.length;
      await act(async () => {
        onlineManager.setOnline(true);
      });
      await waitFor(() => expect(result.current.pending).toHaveLength(0));
      expect(server.fetchMock.mock.calls.length - before).toBe(1);
      expect(server.posts.at(-1)).toMatchObject({ id: '22222222-2222-4222-8222-222222222222', probe: 36.9, remote: 36.2 });
      expect(server.stored.size).toBe(1);

      // Nothing left to send: a later flush sends nothing again.
      await act(async () => {
        await flushPendingReadings(queryClient);
      });
      expect(server.fetchMock.mock.calls.length - before).toBe(1);
    } finally {
      stop();
    }
  });

  it('stores a reading once when the answer was lost and the same id is sent again', async () => {
    const { server, wrapper, queryClient } = setup();
    server.set('lose-answer');
    const { result } = renderHook(() => ({ save: useCreateReadingMutation(INFANT), pending: usePendingReadings(INFANT) }), { wrapper });
    await act(async () => {
      await result.current.save.mutateAsync(body('33333333-3333-4333-8333-333333333333'));
    });
    // The server has it, but the device never heard: it must stay pending.
    expect(server.stored.size).toBe(1);
    expect(result.current.pending).toHaveLength(1);

    server.set('up');
    await act(async () => {
      await flushPendingReadings(queryClient);
    });
    expect(result.current.pending).toHaveLength(0);
    expect(server.posts.map((p) => p.id)).toEqual(['33333333-3333-4333-8333-333333333333', '33333333-3333-4333-8333-333333333333']);
    expect(server.stored.size).toBe(1);
  });

  it('keeps a reading the server refuses as pending, with the reason, and does not send it again by itself', async () => {
    const { wrapper, queryClient } = setup();
    const refuse = jest.fn(async () => ({
      ok: false,
      status: 400,
      headers: { get: () => null },
      json: async () => ({ error: { code: 'invalid', message: 'Check the values.', fields: { probe: 'Too high.' } } }),
    }));
    global.fetch = refuse as unknown as typeof fetch;
    const { result } = renderHook(() => ({ save: useCreateReadingMutation(INFANT), pending: usePendingReadings(INFANT) }), { wrapper });
    await act(async () => {
      await expect(result.current.save.mutateAsync(body('44444444-4444-4444-8444-444444444444'))).rejects.toThrow('Check the values.');
    });
    expect(result.current.pending.map((p) => [p.body.id, p.refusal])).toEqual([['44444444-4444-4444-8444-444444444444', 'Check the values.']]);
    expect(result.current.pending[0]?.userId).toBe('u-nia');
    await act(async () => {
      await flushPendingReadings(queryClient);
    });
    expect(refuse).toHaveBeenCalledTimes(1);
    // Saved again (the nurse put it right in the form, same id): the refusal goes with the success.
    const { server } = setup();
    await act(async () => {
      await result.current.save.mutateAsync(body('44444444-4444-4444-8444-444444444444'));
    });
    expect(server.stored.size).toBe(1);
    expect(result.current.pending).toHaveLength(0);
  });

  it('does not keep a reading pending when the session has ended: the form holds it until she signs in', async () => {
    const { wrapper } = setup();
    global.fetch = jest.fn(async () => ({
      ok: false,
      status: 401,
      headers: { get: () => null },
      json: async () => ({ error: { code: 'unauthorized', message: 'Your session has ended. Please sign in again.' } }),
    })) as unknown as typeof fetch;
    const { result } = renderHook(() => ({ save: useCreateReadingMutation(INFANT), pending: usePendingReadings(INFANT) }), { wrapper });
    await act(async () => {
      await expect(result.current.save.mutateAsync(body('55555555-5555-4555-8555-555555555555'))).rejects.toThrow(/session has ended/);
    });
    expect(result.current.pending).toHaveLength(0);
  });

  it("sends a reading only under the session of the nurse who saved it, never another user's or with no session", async () => {
    const { server, wrapper, queryClient } = setup();
    server.set('down');
    const { result } = renderHook(() => ({ save: useCreateReadingMutation(INFANT), pending: usePendingReadings(INFANT) }), { wrapper });
    await act(async () => {
      await result.current.save.mutateAsync(body('66666666-6666-4666-8666-666666666666'));
    });
    expect(result.current.pending[0]?.userId).toBe('u-nia');
    server.set('up');

    // The session ended: nothing goes.
    storage.remove(TOKEN_KEY);
    await act(async () => {
      await flushPendingReadings(queryClient);
    });
    expect(server.posts).toHaveLength(0);

    // Someone else signs in on the phone: still nothing, the reading is Nia's.
    signedInAs('u-marta');
    await act(async () => {
      await flushPendingReadings(queryClient);
    });
    expect(server.posts).toHaveLength(0);
    expect(result.current.pending).toHaveLength(1);

    // Nia again: it goes, once.
    signedInAs('u-nia');
    await act(async () => {
      await flushPendingReadings(queryClient);
    });
    expect(server.posts.map((p) => p.id)).toEqual(['66666666-6666-4666-8666-666666666666']);
    expect(result.current.pending).toHaveLength(0);
  });
});
