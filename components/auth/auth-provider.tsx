import { useQueryClient } from '@tanstack/react-query';
import { createContext, useCallback, useContext, useEffect, useMemo, useState, type ReactNode } from 'react';
import type { SessionUser, SignInInput } from '@/shared/schemas/auth';
import { api, configureApi } from '@/components/api/client';
import { forgetEarlyReads } from '@/components/api/early-requests';
import { storage } from '@/components/api/storage';
import { afterNextPaint } from '@/components/ui/after-next-paint';
import { TOKEN_KEY, USER_KEY } from './session-keys';
import { clearPatientData } from '@/components/offline/service-worker';
import { forgetDeviceData } from '@/components/offline/device-data';
import { flushPendingReadings } from '@/components/bedside/pending-readings';

interface AuthState {
  /** The signed-in user; while `sessionEnded`, the user whose session it was (their screens stay). */
  user: SessionUser | null;
  /** False until the stored session has been read. */
  ready: boolean;
  /**
   * The server ended the session (a 401) while someone was signed in: the screen stays as it was
   * (a form keeps what was typed) and sign-in happens over it. The same user carries on where
   * they were; someone else signing in starts afresh, and the first user's drafts stay theirs.
   */
  sessionEnded: boolean;
  signIn: (input: SignInInput) => Promise<SessionUser>;
  /** Sign out and forget this device's drafts, pending readings and stored patient data. */
  signOut: () => Promise<void>;
  replaceUser: (user: SessionUser) => void;
  /** Set when the server ended the session, so sign-in can say why. */
  endedMessage: string | null;
}

const AuthContext = createContext<AuthState | null>(null);

/** What a 401 does; the provider sets it once mounted. */
let whenUnauthorized: () => void = () => {};

const resumedListeners = new Set<(userId: string) => void>();
/**
 * Called with the user who signed in over an ended session (the same nurse, or someone else): a
 * screen holding a save for that session sends it if the user is the one it belongs to.
 */
export function onSignedInAgain(listener: (userId: string) => void): () => void {
  resumedListeners.add(listener);
  return () => resumedListeners.delete(listener);
}

// Configured when this module loads, not in the provider's effect: React runs a screen's effects
// (and so its first queries) before its parents', so a page opened with a stored session used to
// send its first request without the token, get a 401 and sign the nurse out at random.
configureApi({
  token: () => storage.get(TOKEN_KEY),
  onUnauthorized: () => whenUnauthorized(),
});

function readStoredUser(): SessionUser | null {
  const raw = storage.get(USER_KEY);
  if (!raw) return null;
  try {
    return JSON.parse(raw) as SessionUser;
  } catch {
    return null;
  }
}

export function AuthProvider({ children }: { children: ReactNode }) {
  const queryClient = useQueryClient();
  // Nobody is signed in during the static render, so the first client render must agree (the
  // stored user is read in the effect below), or hydration fails and React redraws the page.
  const [user, setUser] = useState<SessionUser | null>(null);
  const [ready, setReady] = useState(false);
  const [endedMessage, setEndedMessage] = useState<string | null>(null);
  const [sessionEnded, setSessionEnded] = useState(false);

  const clear = useCallback(() => {
    storage.remove(TOKEN_KEY);
    storage.remove(USER_KEY);
    setUser(null);
    setSessionEnded(false);
    queryClient.clear();
    forgetEarlyReads();
    // The service worker's stored API answers are patient data: they go with the session.
    void clearPatientData();
  }, [queryClient]);

  useEffect(() => {
    whenUnauthorized = () => {
      const hadToken = storage.get(TOKEN_KEY) !== null;
      storage.remove(TOKEN_KEY);
      // Someone was signed in: keep their screen and ask them to sign in over it.
      if (readStoredUser()) {
        setSessionEnded(true);
        return;
      }
      if (hadToken) setEndedMessage('Your session ended. Please sign in again.');
      clear();
    };
    if (!storage.get(TOKEN_KEY)) {
      // A user kept without a token is a session the server ended (sign-out forgets both): the
      // page opens as it was, with sign-in over it, so a reload does not lose the nurse's place.
      const ended = readStoredUser();
      if (ended) {
        // eslint-disable-next-line react-hooks/set-state-in-effect -- storage is read after hydration (DEVELOPERS.md, Footguns)
        setUser(ended);
        setSessionEnded(true);
      }
      setReady(true);
      return;
    }
    // A stored user opens the app at once; the server's answer only corrects it.
    const stored = readStoredUser();
    setUser(stored);
    if (stored) setReady(true);
    // Confirm the stored session with the server once the first screen is painted (the check is
    // not what the nurse is waiting for); a 401 signs out through onUnauthorized. An unchanged
    // user keeps the same object, so the screens are not drawn again for nothing.
    return afterNextPaint(() => {
      api<{ user: SessionUser }>('/auth/me')
        .then(({ user: fresh }) => {
          const json = JSON.stringify(fresh);
          storage.set(USER_KEY, json);
          setUser((current) => (current && JSON.stringify(current) === json ? current : fresh));
        })
        .catch(() => {})
        .finally(() => setReady(true));
    });
  }, [clear]);

  const signIn = useCallback(
    async (input: SignInInput) => {
      const result = await api<{ token: string; user: SessionUser }>('/auth/sign-in', { method: 'POST', body: input, skipUnauthorizedHandler: true });
      const before = readStoredUser();
      const resumed = before !== null && before.id === result.user.id;
      if (before && !resumed) {
        // Someone else over an ended session: nothing of the first user's stays in memory or in the
        // worker's cache. Their drafts and pending readings stay on the device, still theirs.
        queryClient.clear();
        forgetEarlyReads();
        void clearPatientData();
      }
      storage.set(TOKEN_KEY, result.token);
      storage.set(USER_KEY, JSON.stringify(result.user));
      setEndedMessage(null);
      setSessionEnded(false);
      setUser(result.user);
      if (resumed) {
        // The same nurse again: what failed while signed out is asked again, and her pending readings go.
        void queryClient.invalidateQueries();
        void flushPendingReadings(queryClient);
      }
      if (before) resumedListeners.forEach((l) => l(result.user.id));
      return result.user;
    },
    [queryClient],
  );

  const signOut = useCallback(async () => {
    if (storage.get(TOKEN_KEY)) {
      try {
        await api('/auth/sign-out', { method: 'POST', skipUnauthorizedHandler: true });
      } catch {
        // Signing out locally still happens when the server cannot be reached.
      }
    }
    forgetDeviceData();
    clear();
  }, [clear]);

  const replaceUser = useCallback((next: SessionUser) => {
    storage.set(USER_KEY, JSON.stringify(next));
    setUser(next);
  }, []);

  const value = useMemo(() => ({ user, ready, sessionEnded, signIn, signOut, replaceUser, endedMessage }), [user, ready, sessionEnded, signIn, signOut, replaceUser, endedMessage]);
  return <AuthContext.Provider value={value}>{children}</AuthContext.Provider>;
}

export function useAuth(): AuthState {
  const ctx = useContext(AuthContext);
  if (!ctx) throw new Error('useAuth must be used inside AuthProvider');
  return ctx;
}

/** The signed-in user; only for screens behind the signed-in layout. */
export function useUser(): SessionUser {
  const { user } = useAuth();
  if (!user) throw new Error('useUser needs a signed-in user');
  return user;
}
