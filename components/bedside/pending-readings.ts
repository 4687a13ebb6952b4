import { onlineManager, type QueryClient } from '@tanstack/react-query';
import { useSyncExternalStore } from 'react';
import type { CreateReadingInput } from '@/shared/schemas/bedside';
import type { CreateReadingResult } from '@/shared/types/bedside';
import { api, ApiFailure } from '@/components/api/client';
import { storage } from '@/components/api/storage';
import { TOKEN_KEY, USER_KEY } from '@/components/auth/session-keys';
import type { ReadingFormValues } from './reading-form-values';

/**
 * Readings saved on this device but not yet acknowledged by the server. Kept in storage so a
 * reload keeps them; sent again when the connection returns, only under the session of the nurse
 * who saved them. The reading's own id makes a resend idempotent: the server stores it once
 * however many times it arrives. A reading the server refused stays, with its reason, until the
 * nurse opens it in the form again or discards it.
 */
export interface PendingReading {
  infantId: string;
  body: CreateReadingInput & { takenAt: string };
  savedAt: string;
  /** Who saved it (filled in from the signed-in user when left out); nobody else's session sends it. */
  userId?: string;
  /** Bed and name as the form showed them (the sign-out warning). */
  label?: string;
  /** The form's values, so a refused reading can be opened in the form again. */
  values?: Partial<ReadingFormValues>;
  /** Why the last attempt failed, when the server refused it (it then stays for the nurse to see). */
  refusal?: string;
}

/** The signed-in user's id as stored with the session, or null with no session. */
function sessionUserId(): string | null {
  if (!storage.get(TOKEN_KEY)) return null;
  try {
    const user = JSON.parse(storage.get(USER_KEY) ?? 'null') as { id?: unknown } | null;
    return typeof user?.id === 'string' ? user.id : null;
  } catch {
    return null;
  }
}

/** Whether the signed-in session may send this reading: its own, or one saved before readings had owners. */
const sendableBy = (userId: string) => (p: PendingReading) => !p.refusal && (p.userId === undefined || p.userId === userId);

const KEY = 'warmfold.pending-readings.v1';
const listeners = new Set<() => void>();
let cache: PendingReading[] | null = null;

function read(): PendingReading[] {
  if (cache) return cache;
  try {
    cache = JSON.parse(storage.get(KEY) ?? '[]') as PendingReading[];
  } catch {
    cache = [];
  }
  return cache;
}

function write(next: PendingReading[]): void {
  cache = next;
  if (next.length === 0) storage.remove(KEY);
  else storage.set(KEY, JSON.stringify(next));
  listeners.forEach((l) => l());
}

export const pendingReadings = {
  all: read,
  forInfant: (infantId: string) => read().filter((p) => p.infantId === infantId),
  add(entry: PendingReading) {
    const before = read().find((p) => p.body.id === entry.body.id);
    const userId = entry.userId ?? before?.userId ?? sessionUserId() ?? undefined;
    const next: PendingReading = { ...before, ...entry, refusal: entry.refusal };
    if (userId) next.userId = userId;
    write([...read().filter((p) => p.body.id !== entry.body.id), next]);
  },
  /** Add what the form knows (the label, the values) to a reading already kept. */
  describe(id: string, details: Pick<PendingReading, 'label' | 'values'>) {
    if (!read().some((p) => p.body.id === id)) return;
    write(read().map((p) => (p.body.id === id ? { ...p, ...details } : p)));
  },
  remove(id: string) {
    write(read().filter((p) => p.body.id !== id));
  },
  markRefused(id: string, refusal: string) {
    write(read().map((p) => (p.body.id === id ? { ...p, refusal } : p)));
  },
  /** Sign-out: every pending reading on this device goes. */
  clearAll() {
    if (read().length > 0) write([]);
  },
  subscribe(listener: () => void) {
    listeners.add(listener);
    return () => listeners.delete(listener);
  },
  /** Forget the in-memory copy (tests). */
  reset() {
    cache = null;
  },
};

export function usePendingReadings(infantId?: string): PendingReading[] {
  const all = useSyncExternalStore(pendingReadings.subscribe, read, read);
  return infantId ? all.filter((p) => p.infantId === infantId) : all;
}

export function sendReading(infantId: string, body: PendingReading['body']): Promise<CreateReadingResult> {
  return api<CreateReadingResult>(`/infants/${encodeURIComponent(infantId)}/readings`, { method: 'POST', body });
}

let flushing = false;

/**
 * Send every pending reading of the signed-in nurse; keep those that still cannot reach the
 * server. With no session (it ended) nothing is sent: the readings wait for their nurse.
 */
export async function flushPendingReadings(queryClient: QueryClient): Promise<void> {
  if (flushing || !onlineManager.isOnline()) return;
  const userId = sessionUserId();
  if (!userId) return;
  flushing = true;
  try {
    for (const entry of read().filter(sendableBy(userId))) {
      // The session may have ended, or changed hands, while the last one was on its way.
      if (sessionUserId() !== userId) break;
      try {
        await sendReading(entry.infantId, entry.body);
        pendingReadings.remove(entry.body.id);
        void queryClient.invalidateQueries({ queryKey: ['infants'] });
      } catch (err) {
        if (err instanceof ApiFailure && ['cannot-connect', 'server-error', 'unauthorized', 'too-many-requests'].includes(err.problem.kind)) break;
        pendingReadings.markRefused(entry.body.id, err instanceof Error ? err.message : 'The server refused this reading.');
      }
    }
  } finally {
    flushing = false;
  }
}

/** Resend pending readings when the connection returns (and once at start). */
export function startPendingFlush(queryClient: QueryClient): () => void {
  void flushPendingReadings(queryClient);
  const unsubscribe = onlineManager.subscribe((online) => {
    if (online) void flushPendingReadings(queryClient);
  });
  const timer = setInterval(() => void flushPendingReadings(queryClient), 30_000);
  return () => {
    unsubscribe();
    clearInterval(timer);
  };
}
