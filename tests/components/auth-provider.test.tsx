import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { render, waitFor } from '@testing-library/react-native';
import { useEffect, useState } from 'react';
import { Text } from 'react-native';
import { api } from '@/components/api/client';
import { storage } from '@/components/api/storage';
import { AuthProvider, useAuth } from '@/components/auth/auth-provider';

const USER = { id: 'u-nurse', name: 'Nia Okafor', email: 'nia.okafor@warmfold.test', role: 'nurse', unitIds: ['unit-north'], theme: 'system', temperatureUnit: 'C' };

/** A server that answers only requests carrying the stored session's token, as the real one does. */
function serverExpecting(token: string) {
  const seen: { url: string; authorization: string | null }[] = [];
  const fetchMock = jest.fn(async (url: string, init?: { headers?: Record<string, string> }) => {
    const authorization = init?.headers?.Authorization ?? null;
    seen.push({ url, authorization });
    const ok = authorization === `Bearer ${token}`;
    const json = !ok ? { error: { code: 'unauthorized', message: 'Your session has ended. Please sign in again.' } } : url.endsWith('/auth/me') ? { user: USER } : { infants: [] };
    return { ok, status: ok ? 200 : 401, headers: { get: () => null }, json: async () => json } as unknown as Response;
  });
  return { seen, fetchMock };
}

/** A screen that asks for its data as soon as it mounts: its effect runs before the provider's. */
function Screen() {
  const { user, endedMessage, sessionEnded } = useAuth();
  const [loaded, setLoaded] = useState(false);
  useEffect(() => {
    api('/me/infants').then(
      () => setLoaded(true),
      () => undefined,
    );
  }, []);
  return (
    <Text>
      {user ? `signed in as ${user.name}` : 'signed out'} {loaded ? 'loaded' : ''} {endedMessage ?? ''} {sessionEnded ? 'session ended' : ''}
    </Text>
  );
}

const renderScreen = () =>
  render(
    <QueryClientProvider client={new QueryClient()}>
      <AuthProvider>
        <Screen />
      </AuthProvider>
    </QueryClientProvider>,
  );

describe('AuthProvider', () => {
  afterEach(() => {
    storage.remove('warmfold.token');
    storage.remove('warmfold.user');
  });

  it("sends the stored session's token with a screen's first request, so opening a page never signs the nurse out", async () => {
    storage.set('warmfold.token', 'stored-token');
    storage.set('warmfold.user', JSON.stringify(USER));
    const server = serverExpecting('stored-token');
    globalThis.fetch = server.fetchMock as unknown as typeof fetch;
    const screen = renderScreen();
    await screen.findByText(/loaded/);
    await waitFor(() => expect(server.seen.some((r) => r.url.endsWith('/auth/me'))).toBe(true));
    expect(server.seen.map((r) => r.authorization)).toEqual(server.seen.map(() => 'Bearer stored-token'));
    expect(screen.getByText(/signed in as Nia Okafor/)).toBeTruthy();
    expect(storage.get('warmfold.token')).toBe('stored-token');
  });

  it('keeps the screen and its user when the server ends the session, and asks to sign in over it', async () => {
    storage.set('warmfold.token', 'revoked-token');
    storage.set('warmfold.user', JSON.stringify(USER));
    globalThis.fetch = serverExpecting('another-token').fetchMock as unknown as typeof fetch;
    const screen = renderScreen();
    await screen.findByText(/signed in as Nia Okafor.*session ended/);
    expect(storage.get('warmfold.token')).toBeNull();
    // A reload opens the same way: the user kept without a token is an ended session, not a sign-out.
    screen.unmount();
    const again = renderScreen();
    await again.findByText(/signed in as Nia Okafor.*session ended/);
  });

  it('signs out and says why when a session ends with no user kept on the device', async () => {
    storage.set('warmfold.token', 'revoked-token');
    globalThis.fetch = serverExpecting('another-token').fetchMock as unknown as typeof fetch;
    const screen = renderScreen();
    await screen.findByText(/signed out.*Your session ended/);
    expect(storage.get('warmfold.token')).toBeNull();
  });

  it('opens at once with a stored user, and an unchanged answer from the server draws nothing again', async () => {
    storage.set('warmfold.token', 'stored-token');
    storage.set('warmfold.user', JSON.stringify(USER));
    let answer: (value: Response) => void = () => {};
    globalThis.fetch = jest.fn(() => new Promise<Response>((resolve) => (answer = resolve))) as unknown as typeof fetch;
    const seen: { user: unknown; ready: boolean }[] = [];
    function Probe() {
      const { user, ready } = useAuth();
      seen.push({ user, ready });
      return <Text>{user && ready ? 'open' : 'waiting'}</Text>;
    }
    const screen = render(
      <QueryClientProvider client={new QueryClient()}>
        <AuthProvider>
          <Probe />
        </AuthProvider>
      </QueryClientProvider>,
    );
    await screen.findByText('open'); // before the server has answered
    const rendersBefore = seen.length;
    const opened = seen[seen.length - 1]!.user;
    answer({ ok: true, status: 200, headers: { get: () => null }, json: async () => ({ user: { ...USER } }) } as unknown as Response);
    await waitFor(() => expect(storage.get('warmfold.user')).toBe(JSON.stringify(USER)));
    await new Promise((resolve) => setTimeout(resolve, 0));
    expect(seen.length).toBe(rendersBefore);
    expect(seen[seen.length - 1]!.user).toBe(opened);
  });

  it('takes a changed user from the server', async () => {
    storage.set('warmfold.token', 'stored-token');
    storage.set('warmfold.user', JSON.stringify(USER));
    const renamed = { ...USER, name: 'Nia Okafor-Reyes' };
    globalThis.fetch = jest.fn(async () => ({ ok: true, status: 200, headers: { get: () => null }, json: async () => ({ user: renamed }) })) as unknown as typeof fetch;
    const screen = renderScreen();
    await screen.findByText(/signed in as Nia Okafor-Reyes/);
    expect(JSON.parse(storage.get('warmfold.user')!)).toEqual(renamed);
  });
});
