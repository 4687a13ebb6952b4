import { pendingReadings, type PendingReading } from '@/components/bedside/pending-readings';
import { readingDrafts, type ReadingDraft } from '@/components/bedside/reading-draft';

/**
 * What this device keeps of the nurse's work between sessions: drafts of the record form and
 * readings waiting to reach the server. Sign-out warns about them, then forgets them with the
 * rest of the patient data (auth-provider.tsx: the query cache, the page's early reads and the
 * service worker's runtime caches).
 */
export interface UnsavedWork {
  drafts: ReadingDraft[];
  pending: PendingReading[];
}

export function unsavedWork(): UnsavedWork {
  return { drafts: readingDrafts.all(), pending: pendingReadings.all() };
}

/** Forget every draft and pending reading on this device. */
export function forgetDeviceData(): void {
  readingDrafts.clearAll();
  pendingReadings.clearAll();
}
