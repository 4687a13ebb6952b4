/**
 * What the bedside API answers with. Temperatures are integer hundredths of °C; instants are
 * ISO 8601 strings. The client formats both by the user's settings.
 */
import type { FlagKind, Severity } from '../thermal';
import type { PlacementPromptCode } from '../thermal/placement';
import type { ControlMode, HeatSource, InfantPosition, ProbeSite, RemoteSite } from '../vocabulary';

export type NextCheckStatus = 'never' | 'ok' | 'due-soon' | 'overdue';

export interface NextCheck {
  status: NextCheckStatus;
  dueAt: string | null;
  minutesLate: number;
}

/** An escalation that went out: whom it reached, when and how; and its acknowledgement. */
export interface EscalationSent {
  id: string;
  sentAt: string;
  to: { userId: string | null; name: string | null; email: string }[];
  how: 'email';
  acknowledgedAt: string | null;
  acknowledgedBy: { id: string; name: string } | null;
  /** The flag's severity when it went out (absent on escalations stored before it was kept). */
  severity?: Severity;
  /** The same flag's escalations before this one (it worsened since), oldest first. */
  earlier?: EscalationSent[];
}

/** A check clock at the time of the answer, from its stored next-due instant. */
export interface ClockStatus {
  status: NextCheckStatus;
  dueAt: string | null;
  minutesLate: number;
}

export interface RecheckClock extends ClockStatus {
  flagId: string;
  kind: FlagKind;
  /** From when a reading counts as the recheck (the first action plus the unit's settle time). */
  countsFrom: string | null;
}

export interface ManualClock extends ClockStatus {
  /** Manual mode charted since. */
  since: string;
  /** The latest charted heater output (%), if any. */
  outputPct: number | null;
  /** Minutes allowed between checks in manual mode (15, ECRI). */
  limitMinutes: number;
}

/** Every check clock of an infant: the remote-site check, manual mode's, each recheck; and the soonest. */
export interface CheckClocks {
  remote: ClockStatus;
  manual: ManualClock | null;
  rechecks: RecheckClock[];
  next: ClockStatus & { clock: 'remote' | 'manual' | 'recheck' };
}

export interface OpenFlagSummary {
  /** The stored flag's id once the flag has been stored; null for a flag only the rules see yet. */
  id: string | null;
  key: string;
  kind: FlagKind;
  raisedAt: string;
  raisedByReadingId?: string | null;
  /** The rules' detail for the kind, with instants as ISO strings. */
  detail: Record<string, unknown>;
  recheckDueAt: string | null;
  /** shared/thermal/severity.ts: decides order, colour, word and escalation. */
  severity?: Severity;
  recheck?: RecheckClock | null;
  /** Null unless an escalation actually went out. */
  escalation?: EscalationSent | null;
  /** True only when an escalation went out (`escalation` is then set). */
  escalated?: boolean;
}

/**
 * The infant's current placement (probe site, cover, position) and its prompt, as stored at the
 * last write that could change it (server/services/placement.ts); views show it as it is.
 */
export interface CurrentPlacement {
  probeSite: ProbeSite | null;
  probeCovered: boolean | null;
  position: InfantPosition | null;
  /** When the latest of them was charted. */
  chartedAt: string;
  /** The stored prompt and its words, or null. */
  prompt: { code: PlacementPromptCode; text: string } | null;
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
  controlMode: ControlMode | null;
  setCenti: number | null;
  latest: {
    probe: { centi: number; takenAt: string } | null;
    remote: { centi: number; site: RemoteSite | null; takenAt: string } | null;
  };
  /** The remote-site check clock (kept for older screens; `checks.remote` is the same). */
  nextCheck: NextCheck;
  checks?: CheckClocks;
  /** The most severe open flag's severity, and whether the bed needs attention now. */
  attention?: { severity: Severity | null; needsAttention: boolean };
  openFlags: OpenFlagSummary[];
  skinToSkin: SkinToSkinSummary | null;
  assignedNurse: { id: string; name: string } | null;
  /** The current placement, null until one is charted. */
  placement?: CurrentPlacement | null;
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
  remoteSite: RemoteSite | null;
  airCenti: number | null;
  setCenti: number | null;
  controlMode: ControlMode | null;
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
  /** Settings charted with the reading (null when not charted). */
  probeSite?: ProbeSite | null;
  probeCovered?: boolean | null;
  position?: InfantPosition | null;
  weightGrams?: number | null;
  humidityPct?: number | null;
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
  status: 'open' | 'closed' | 'withdrawn';
  raisedAt: string;
  raisedByReadingId: string | null;
  closedAt: string | null;
  closedByReadingId: string | null;
  recheckDueAt: string | null;
  escalated: boolean;
  detail: Record<string, unknown>;
  actions: FlagAction[];
  severity?: Severity;
  escalation?: EscalationSent | null;
  recheck?: RecheckClock | null;
  /** Set when a late entry or correction showed the flag should not have been raised. */
  withdrawn?: { reason: string; readingId: string | null; at: string } | null;
  /** How it was resolved ('recheck', 'check-recorded', 'session-ended', 'discharged', 'withdrawn'); null while open. */
  how?: string | null;
}

export interface FlagAction {
  id: string;
  flagId: string;
  kind: string;
  note: string | null;
  at: string;
  recordedBy: { id: string; name: string };
  /** Where the probe was moved to (moved-probe only). */
  probeSite?: ProbeSite | null;
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
  checks?: CheckClocks;
  policy: FlowsheetPolicy;
  /** Set once the infant has left: when, why and where to (the end of the stay). */
  discharge?: { at: string; reason: 'home' | 'transfer' | 'ward' | 'death' | null; destination: string | null } | null;
}

export interface InfantDetail {
  infant: InfantSummary;
  birthAt: string;
  birthWeightGrams: number;
  admittedAt: string;
  unitName: string;
  timeZone: string;
  /** Defaults for the record form, from the latest readings. */
  defaults: {
    controlMode: ControlMode | null;
    setCenti: number | null;
    remoteSite: RemoteSite | null;
    /** The current placement, carried forward as the form's settings. */
    placement?: { probeSite: ProbeSite | null; probeCovered: boolean | null; position: InfantPosition | null; prompt: PlacementPromptCode | null } | null;
  };
  /** Set once the infant has left: when, why and where to. */
  discharge?: { at: string; reason: string | null; destination: string | null } | null;
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
