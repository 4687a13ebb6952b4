import { onlineManager, type QueryClient } from '@tanstack/react-query';
import { useSyncExternalStore } from 'react';
import type { CreateReadingInput } from '@/shared/schemas/bedside';
import type { CreateReadingResult } from '@/shared/types/bedside';
import { api, ApiFailure } from '@/components/api/client';
import { storage } from '@/components/api/storage';

/**
 * Readings saved on this device but not yet acknowledged by the server. Kept in storage so a
 * reload keeps them; sent again when the connection returns. The reading's own id makes a
 * resend idempotent: the server stores it once however many times it arrives.
 */
export interface PendingReading {
  infantId: string;
  body: CreateReadingInput & { takenAt: string };
  savedAt: string;
  /** Why the last attempt failed, when the server refused it (it then stays for the nurse to see). */
  refusal?: string;
}

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
    write([...read().filter((p) => p.body.id !== entry.body.id), entry]);
  },
  remove(id: string) {
    write(read().filter((p) => p.body.id !== id));
  },
  markRefused(id: string, refusal: string) {
    write(read().map((p) => (p.body.id === id ? { ...p, refusal } : p)));
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

/** Send every pending reading; keep those that still cannot reach the server. */
export async function flushPendingReadings(queryClient: QueryClient): Promise<void> {
  if (flushing || !onlineManager.isOnline()) return;
  flushing = true;
  try {
    for (const entry of read().filter((p) => !p.refusal)) {
      try {
        await sendReading(entry.infantId, entry.body);
        pendingReadings.remove(entry.body.id);
        void queryClient.invalidateQueries({ queryKey: ['infants'] });
      } catch (err) {
        if (err instanceof ApiFailure && err.problem.kind === 'cannot-connect') break;
        if (err instanceof ApiFailure && err.problem.kind === 'server-error') break;
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
