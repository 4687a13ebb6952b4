/**
 * What the bedside API answers with. Temperatures are integer hundredths of °C; instants are
 * ISO 8601 strings. The client formats both by the user's settings.
 */
import type { FlagKind } from '../thermal';

export type HeatSource = 'radiant-warmer' | 'incubator' | 'convertible';
export type ControlModeName = 'skin-servo' | 'air-servo' | 'manual';
export type RemoteSiteName = 'axilla' | 'rectal' | 'other';
export type NextCheckStatus = 'never' | 'ok' | 'due-soon' | 'overdue';

export interface NextCheck {
  status: NextCheckStatus;
  dueAt: string | null;
  minutesLate: number;
}

export interface OpenFlagSummary {
  /** The stored flag's id once the flag has been stored; null for a flag only the rules see yet. */
  id: string | null;
  key: string;
  kind: FlagKind;
  raisedAt: string;
  /** The rules' detail for the kind, with instants as ISO strings. */
  detail: Record<string, unknown>;
  recheckDueAt: string | null;
  escalated?: boolean;
}

export interface SkinToSkinSummary {
  id: string;
  startedAt: string;
  referenceCenti: number;
  limitCenti: number;
}

export interface InfantSummary {
  id: string;
  unitId: string;
  /** The unit's IANA time zone: local times are shown in it. */
  timeZone: string;
  bedId: string | null;
  bedLabel: string | null;
  displayName: string;
  gestationWeeks: number;
  gestationDays: number;
  /** Postmenstrual age: gestation at birth plus days since birth. */
  correctedWeeks: number;
  correctedDays: number;
  ageDays: number;
  weightGrams: number;
  heatSource: HeatSource;
  controlMode: ControlModeName | null;
  setCenti: number | null;
  latest: {
    probe: { centi: number; takenAt: string } | null;
    remote: { centi: number; site: RemoteSiteName | null; takenAt: string } | null;
  };
  nextCheck: NextCheck;
  openFlags: OpenFlagSummary[];
  skinToSkin: SkinToSkinSummary | null;
  assignedNurse: { id: string; name: string } | null;
}

export type CorrectionReason = 'corrected-value' | 'entered-in-error' | 'late-entry';

/** One stored row of the readings table: every version, current or replaced. */
export interface ReadingVersion {
  id: string;
  infantId: string;
  takenAt: string;
  recordedAt: string;
  recordedBy: { id: string; name: string };
  probeCenti: number | null;
  remoteCenti: number | null;
  remoteSite: RemoteSiteName | null;
  airCenti: number | null;
  setCenti: number | null;
  controlMode: ControlModeName | null;
  heaterOutputPct: number | null;
  heartRate: number | null;
  heatSigns: string[];
  note: string | null;
  enteredUnit: 'C' | 'F';
  lateReason: string | null;
  sessionId: string | null;
  replacesId: string | null;
  correctionReason: CorrectionReason | null;
  correctionNote: string | null;
  enteredInError: boolean;
}

/** A reading as the flowsheet shows it: the current version and the versions before it. */
export interface FlowsheetReading extends ReadingVersion {
  /** Id of the first version: stable across corrections. */
  rootId: string;
  /** Earlier versions, oldest first (empty when never corrected). */
  history: ReadingVersion[];
  corrected: boolean;
}

export interface FlowsheetFlag {
  id: string | null;
  key: string;
  kind: FlagKind;
  status: 'open' | 'closed';
  raisedAt: string;
  raisedByReadingId: string | null;
  closedAt: string | null;
  closedByReadingId: string | null;
  recheckDueAt: string | null;
  escalated: boolean;
  detail: Record<string, unknown>;
  actions: FlagAction[];
}

export interface FlagAction {
  id: string;
  flagId: string;
  kind: string;
  note: string | null;
  at: string;
  recordedBy: { id: string; name: string };
}

export interface SessionRecord {
  id: string;
  startedAt: string;
  endedAt: string | null;
  referenceCenti: number;
  limitCenti: number;
  carer: string | null;
  startedBy: { id: string; name: string };
}

export interface FlowsheetPolicy {
  checkIntervalMinutes: number;
  dueSoonMinutes: number;
  gapLimitCenti: number;
  recheckMinutes: number;
  escalationDelayMinutes: number;
  timeZone: string;
}

export interface Flowsheet {
  infant: InfantSummary;
  hours: number;
  from: string;
  to: string;
  /** Current readings in the window, newest first; entered-in-error ones are left out. */
  readings: FlowsheetReading[];
  /** Readings removed as entered in error, with their history, newest first. */
  removed: FlowsheetReading[];
  flags: FlowsheetFlag[];
  sessions: SessionRecord[];
  nextCheck: NextCheck;
  policy: FlowsheetPolicy;
}

export interface InfantDetail {
  infant: InfantSummary;
  birthAt: string;
  birthWeightGrams: number;
  admittedAt: string;
  unitName: string;
  timeZone: string;
  /** Defaults for the record form, from the latest readings. */
  defaults: { controlMode: ControlModeName | null; setCenti: number | null; remoteSite: RemoteSiteName | null };
}

export interface CreateReadingResult {
  reading: ReadingVersion;
  /** True when this POST stored the reading; false for a retry of one already stored. */
  created: boolean;
  openFlags: OpenFlagSummary[];
  nextCheck: NextCheck;
  raisedFlagIds: string[];
  closedFlagIds: string[];
}
