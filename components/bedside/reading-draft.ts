import { useSyncExternalStore } from 'react';
import { storage } from '@/components/api/storage';
import type { CorrectionReason } from '@/shared/types/bedside';
import type { ReadingFormValues } from './reading-form-values';

/**
 * What a nurse has typed into the record form and not yet saved, kept on this device per infant
 * and per signed-in user, so a reload, going back, another tab or an ended session loses nothing.
 * A draft comes back only to the user who typed it. It goes when the reading is saved (or kept as
 * pending by the offline queue), when she discards it, and at sign-out.
 */
export interface ReadingDraft {
  userId: string;
  infantId: string;
  /** The reading's own id: a save after a restore sends the same id, so the server stores it once. */
  readingId: string;
  /** Bed and name as the form showed them, for the sign-out warning. */
  label: string;
  /** A correction's draft: the reading it corrects (kept apart from the infant's record draft). */
  correcting?: string;
  values: Partial<ReadingFormValues> & { reason?: CorrectionReason; why?: string };
  /** When it was first kept, and last changed (ISO). */
  startedAt: string;
  updatedAt: string;
}

const KEY = 'warmfold.reading-drafts.v1';
const listeners = new Set<() => void>();
let cache: Record<string, ReadingDraft> | null = null;
let list: ReadingDraft[] = [];

const keyOf = (userId: string, infantId: string, correcting?: string) => (correcting ? `${userId}/${infantId}/${correcting}` : `${userId}/${infantId}`);

function read(): Record<string, ReadingDraft> {
  if (cache) return cache;
  try {
    const parsed: unknown = JSON.parse(storage.get(KEY) ?? '{}');
    cache = parsed && typeof parsed === 'object' && !Array.isArray(parsed) ? (parsed as Record<string, ReadingDraft>) : {};
  } catch {
    cache = {};
  }
  list = Object.values(cache);
  return cache;
}

function write(next: Record<string, ReadingDraft>): void {
  cache = next;
  list = Object.values(next);
  if (list.length === 0) storage.remove(KEY);
  else storage.set(KEY, JSON.stringify(next));
  listeners.forEach((l) => l());
}

function removeKey(key: string): void {
  const all = read();
  if (!all[key]) return;
  write(Object.fromEntries(Object.entries(all).filter(([k]) => k !== key)));
}

/**
 * Settings carried forward from the last reading: changing only these is not worth a draft.
 * Anything else with a value (a temperature, the heart rate, a note, a time, a sign) is.
 */
const SETTINGS = new Set(['controlMode', 'set', 'remoteSite', 'probeSite', 'probeCovered', 'position']);

/** Whether the values hold something the nurse typed or chose beyond the carried settings. */
export function hasTypedValues(values: Partial<ReadingFormValues> | Record<string, unknown>): boolean {
  return Object.entries(values).some(([key, value]) => {
    if (SETTINGS.has(key)) return false;
    if (typeof value === 'string') return value.trim() !== '';
    if (Array.isArray(value)) return value.length > 0;
    return value === true;
  });
}

export const readingDrafts = {
  get(userId: string, infantId: string, correcting?: string): ReadingDraft | null {
    return read()[keyOf(userId, infantId, correcting)] ?? null;
  },
  /** Keep the values (replacing the infant's earlier draft by this user), or forget them when nothing is typed. */
  keep(entry: Omit<ReadingDraft, 'startedAt' | 'updatedAt'>, now = new Date()): void {
    const all = read();
    const key = keyOf(entry.userId, entry.infantId, entry.correcting);
    if (!hasTypedValues(entry.values)) {
      if (all[key]) removeKey(key);
      return;
    }
    const before = all[key];
    const at = now.toISOString();
    write({ ...all, [key]: { ...entry, startedAt: before && before.readingId === entry.readingId ? before.startedAt : at, updatedAt: at } });
  },
  remove(userId: string, infantId: string, correcting?: string): void {
    removeKey(keyOf(userId, infantId, correcting));
  },
  /** Forget the draft that became this reading (it was saved, or discarded from the pending list). */
  removeReading(readingId: string): void {
    const all = read();
    const rest = Object.fromEntries(Object.entries(all).filter(([, d]) => d.readingId !== readingId));
    if (Object.keys(rest).length !== Object.keys(all).length) write(rest);
  },
  all(): ReadingDraft[] {
    read();
    return list;
  },
  /** Sign-out: every draft on this device goes. */
  clearAll(): void {
    write({});
  },
  subscribe(listener: () => void): () => void {
    listeners.add(listener);
    return () => listeners.delete(listener);
  },
  /** Forget the in-memory copy, as a reload does (tests). */
  reset(): void {
    cache = null;
  },
};

const allDrafts = () => readingDrafts.all();
const noDrafts = (): ReadingDraft[] => [];

/** Every draft kept on this device (the sign-out warning), or one user's. */
export function useReadingDrafts(userId?: string): ReadingDraft[] {
  const all = useSyncExternalStore(readingDrafts.subscribe, allDrafts, noDrafts);
  return userId ? all.filter((d) => d.userId === userId) : all;
}
