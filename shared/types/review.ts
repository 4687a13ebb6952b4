/** What the review, reports and export endpoints answer. Instants are ISO strings. */
import type { ReviewKind } from '../vocabulary';

export interface PersonRef {
  id: string;
  name: string;
}

export interface ReviewNote {
  id: string;
  flagId: string;
  note: string;
  reviewer: PersonRef;
  createdAt: string;
}

export interface ReviewQueueItem {
  flagId: string;
  kind: ReviewKind;
  unitId: string;
  unitName: string;
  infantId: string;
  infantName: string;
  bedLabel: string | null;
  raisedAt: string;
  shift: 'day' | 'night';
  /** Local date on which the shift began. */
  shiftDate: string;
  /** The nurse concerned: who charted the raising reading, or for an overdue check the assigned nurse. */
  nurse: PersonRef | null;
  /** When the raising reading came from a file that named no nurse: who imported it (never the nurse concerned). */
  importedBy: PersonRef | null;
  /** Short words on what happened, e.g. "Probe 36.90 °C, remote site 36.20 °C". */
  summary: string;
  firstActionAt: string | null;
  closedAt: string | null;
  /** A late entry or correction showed it should not have been raised: shown struck through, never counted late. */
  withdrawn?: boolean;
  minutesToFirstAction: number | null;
  minutesToResolution: number | null;
  reviewCount: number;
  lastReviewedAt: string | null;
}

export interface ReviewQueueResponse {
  items: ReviewQueueItem[];
  /** How many items match the filters, on every page together. */
  total: number;
  /** Pass as `cursor` for the next page; null on the last page. */
  nextCursor: string | null;
  /** Nurses who appear in the unfiltered queue, for the nurse filter. */
  nurses: PersonRef[];
  units: Array<{ id: string; name: string }>;
}

export interface ReviewReading {
  id: string;
  takenAt: string;
  recordedBy: PersonRef;
  probeCenti: number | null;
  remoteCenti: number | null;
  remoteSite: string | null;
  controlMode: string | null;
  heaterOutputPct: number | null;
  heartRate: number | null;
  note: string | null;
  /** True for the reading that raised the flag. */
  raisedFlag: boolean;
  /** A later row replaced this one (a correction). */
  replaced: boolean;
}

export interface ReviewAction {
  id: string;
  kind: string;
  note: string | null;
  at: string;
  by: PersonRef;
}

export interface ReviewItemDetail {
  item: ReviewQueueItem;
  detail: Record<string, unknown>;
  readings: ReviewReading[];
  actions: ReviewAction[];
  reviews: ReviewNote[];
}

export interface MyReviewNote extends ReviewNote {
  kind: ReviewKind;
  infantName: string;
  raisedAt: string;
}
