/** What the board, handover and mailbox endpoints answer. Instants are ISO strings. */
import type { CheckStatus, FlagKind, Severity } from '../thermal';
import type { ControlMode, HeatSource } from '../vocabulary';
import type { CheckClocks, CurrentPlacement, EscalationSent, InfantSummary } from './bedside';

/** 0 needs attention now (a critical or urgent flag, an overdue clock), 1 due soon or a caution, 2 the rest, 3 empty bed. */
export type UrgencyTier = 0 | 1 | 2 | 3;

export interface BoardEscalation {
  id: string;
  flagId: string;
  flagKind: FlagKind;
  escalatedAt: string;
  mailedAt: string | null;
  acknowledgedAt: string | null;
  acknowledgedBy: { id: string; name: string } | null;
  note: string | null;
  /** When it went out (null: not sent yet, so no one has been told). */
  sentAt: string | null;
  /** Whom it reached. */
  to: EscalationSent['to'];
  /** The same as `to` (the name the contract with the scenario tests uses). */
  recipient: EscalationSent['to'];
  severity: Severity;
}

export interface BoardBed {
  bedId: string;
  label: string;
  tier: UrgencyTier;
  /** When the bed's most urgent matter began (ISO), for ordering within a tier. */
  since: string | null;
  infant: InfantSummary | null;
  /** Escalations of the infant's open flags, acknowledged or not. */
  escalations: BoardEscalation[];
}

/** A unit and the settings its board, admin and reports show. */
export interface UnitWithSettings {
  id: string;
  name: string;
  hospitalName: string;
  timeZone: string;
  checkIntervalMinutes: number;
  dueSoonMinutes: number;
  gapLimitCenti: number;
  escalationDelayMinutes: number;
  dayShiftStart: string;
  nightShiftStart: string;
}

export interface BoardResponse {
  /** When the server computed this board (the statuses are as of then): at most a second before it was sent. */
  serverTime: string;
  unit: UnitWithSettings;
  shift: { shiftDate: string; shift: 'day' | 'night'; startsAt: string; endsAt: string };
  beds: BoardBed[];
  /** Everyone who can be assigned in this unit (for the nurse filter and reassigning). */
  nurses: { id: string; name: string; role: 'nurse' | 'charge' }[];
}

export interface HandoverReading {
  id: string;
  takenAt: string;
  probeCenti: number | null;
  remoteCenti: number | null;
  remoteSite: string | null;
  airCenti: number | null;
  setCenti: number | null;
  controlMode: ControlMode | null;
  heaterOutputPct: number | null;
  heartRate: number | null;
  heatSigns: string[];
  note: string | null;
  recordedBy: string;
  /** Set when this row corrects an earlier one. */
  corrects: boolean;
}

export interface HandoverFlag {
  id: string;
  kind: FlagKind;
  raisedAt: string;
  closedAt: string | null;
  how: string | null;
  actions: { kind: string; note: string | null; at: string; by: string }[];
  escalatedAt: string | null;
  acknowledgedAt: string | null;
  severity?: Severity;
  /** Null unless an escalation actually went out. */
  escalation?: EscalationSent | null;
  /** Set when a late entry or correction withdrew it. */
  withdrawn?: { reason: string; readingId: string | null } | null;
  /** The rules' detail (a gap's direction: which reading is lower; a deviation's sign). */
  detail?: Record<string, unknown>;
  /** The temperature band: a cold-stress flag's worst band, 'fever' for a fever, else null. */
  band?: string | null;
}

export interface HandoverInfant {
  infant: {
    id: string;
    displayName: string;
    bedLabel: string | null;
    gestationWeeks: number;
    gestationDays: number;
    weightGrams: number;
    birthAt: string;
    heatSource: HeatSource;
    status: 'admitted' | 'discharged';
  };
  from: string;
  to: string;
  /** The unit's zone: every time on the handover is shown in it. */
  timeZone: string;
  settings: {
    controlMode: ControlMode | null;
    setCenti: number | null;
    heaterOutputPct: number | null;
    probeCenti: number | null;
    remoteCenti: number | null;
    remoteTakenAt: string | null;
    /** The current placement and its prompt, as stored. */
    placement?: CurrentPlacement | null;
  };
  nextCheck: { status: CheckStatus; dueAt: string | null; minutesLate: number };
  checks?: CheckClocks;
  readings: HandoverReading[];
  flags: HandoverFlag[];
  sessions: { id: string; startedAt: string; endedAt: string | null; referenceCenti: number; limitCenti: number; carer: string | null }[];
  nurse: { id: string; name: string } | null;
}

export interface HandoverResponse {
  generatedAt: string;
  infants: HandoverInfant[];
}

export interface CaughtMail {
  id: number;
  receivedAt: string;
  from: string;
  to: string;
  subject: string;
  text: string;
}
