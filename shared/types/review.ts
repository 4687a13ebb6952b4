/** What the review, reports and export endpoints answer. Instants are ISO strings. */
import type { ReviewKind } from '../vocabulary';

export interface PersonRef {
  id: string;
  name: string;
}

export interface ReviewNoteVersion {
  version: number;
  note: string;
  at: string;
  by: PersonRef;
}

export interface ReviewNote {
  id: string;
  flagId: string;
  /** The current text (the latest version). */
  note: string;
  reviewer: PersonRef;
  createdAt: string;
  /** 1 for the note as first written; each amendment adds one. */
  version: number;
  /** Every version, oldest first (append-only: an amendment never overwrites). */
  versions: ReviewNoteVersion[];
  /** Withdrawn by the educator: kept in the record, no longer shown to the nurse as current. */
  withdrawn: { at: string; by: PersonRef; reason: string | null } | null;
  /** The nurse concerned said she read it: when, and which version. Null until then. */
  acknowledged: { at: string; by: PersonRef; version: number } | null;
}

/**
 * The review's own status, apart from the flag's lifecycle (open, closed, withdrawn):
 * unreviewed; noted (a current teaching note); acknowledged (the nurse read the current
 * version); no-teaching-point (closed by the educator without a note).
 */
export type ReviewState = 'unreviewed' | 'noted' | 'acknowledged' | 'no-teaching-point';

export interface ReviewQueueItem {
  flagId: string;
  kind: ReviewKind;
  unitId: string;
  unitName: string;
  /** The unit's IANA time zone: every time of the item is shown in it. */
  timeZone: string;
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
  /** The review's status (separate from the flag's lifecycle). */
  reviewState: ReviewState;
}

export interface ReviewQueueResponse {
  items: ReviewQueueItem[];
  /** How many items match the filters, on every page together. */
  total: number;
  /** Pass as `cursor` for the next page; null on the last page. */
  nextCursor: string | null;
  /** Nurses who appear in the unfiltered queue, for the nurse filter. */
  nurses: PersonRef[];
  units: { id: string; name: string }[];
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
  /** Closed as "no teaching point": by whom and when, with an optional comment. */
  noTeachingPoint: { at: string; by: PersonRef; comment: string | null } | null;
}

export interface MyReviewNote extends ReviewNote {
  kind: ReviewKind;
  infantName: string;
  raisedAt: string;
}

/** One nurse's flags and reviews over a range (the nurse concerned, as in the queue). */
export interface NurseSummaryRow {
  nurse: PersonRef;
  flags: number;
  byKind: Record<string, number>;
  /** Flags whose review status is noted or acknowledged. */
  noted: number;
  acknowledged: number;
  noTeachingPoint: number;
  unreviewed: number;
  /** Conventional median minutes from flag to first action (mean of the two middle values for an even count). */
  medianMinutesToAction: number | null;
}

export interface NurseSummaryResponse {
  unitId: string;
  from: string;
  to: string;
  nurses: NurseSummaryRow[];
  /** Flags whose nurse is not known (an import that named nobody). */
  withoutNurse: number;
}

/** A unit's figures over one period (a week, a month, or one side of a comparison). */
export interface PeriodFigures {
  label: string;
  from: string;
  to: string;
  checks: number;
  onTime: number;
  onTimeRate: number | null;
  flags: number;
  gapFlags: number;
  gapPer100: number | null;
  /** Conventional median minutes from flag to first action. */
  medianMinutesToAction: number | null;
  medianMinutesToResolution: number | null;
}

export interface TrendResponse {
  unitId: string;
  by: 'week' | 'month';
  periods: PeriodFigures[];
}

export interface CompareResponse {
  unitId: string;
  a: PeriodFigures;
  b: PeriodFigures;
}
