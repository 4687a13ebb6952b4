/**
 * Evaluate one infant's chart: every flag, open and closed, the check schedule and the latest
 * values, from the readings, the actions taken on flags and the skin-to-skin sessions.
 *
 * Pure and deterministic: the same chart and `now` always give the same flags with the same
 * keys, so the server can store, compare and act on them. One pass over the readings in time
 * order (O(n log n) for the sort), so a whole unit's board evaluates in milliseconds.
 *
 * The chart is evaluated as it stood at `now`: readings taken, actions done and sessions ended
 * after `now` are left out, so a past `now` replays the chart for handover or review.
 */

import { requireFinite, requireInteger, requireTime, ThermalInputError } from './errors';
import { FEVER_MIN_CENTI, temperatureBand, isColdBand, worseColdBand, type ColdBand, type TemperatureBand } from './bands';
import { assessGapCenti, type GapDirection } from './gap';
import { heatStressPrompt, type HeatStressReason, type HeatStressSign } from './heat-stress';
import { isControlMode, ManualModeTracker, resolveManualPolicy, type ControlMode, type ManualModeReason } from './manual-mode';
import { resolvePolicy, type UnitPolicy } from './policy';
import { checkStatus, MINUTE_MS, type CheckStatusResult } from './schedule';
import { validateSession } from './skin-to-skin';
import { severityOf, type Severity } from './severity';
import type { RemoteSite } from '../vocabulary';

/** Where a remote-site temperature was taken; the list and its labels are in shared/vocabulary.ts. */
export type { RemoteSite };

/** One stored reading (temperatures in integer hundredths of °C). */
export interface ReadingInput {
  readonly id: string;
  readonly takenAt: Date;
  readonly probeCenti: number | null;
  readonly remoteCenti: number | null;
  readonly remoteSite: RemoteSite | null;
  readonly airCenti: number | null;
  readonly setCenti: number | null;
  readonly controlMode: ControlMode | null;
  readonly heaterOutputPct: number | null;
  readonly heartRate: number | null;
  readonly heatSigns: readonly HeatStressSign[];
  /** The reading this row corrects, if it is a correction. */
  readonly replacesId: string | null;
  /** A correction saying the reading it replaces should not have been charted at all. */
  readonly enteredInError: boolean;
  readonly recordedAt: Date;
  /**
   * The order in which the rows were stored (a database's row number), when known: readings taken
   * and recorded at the same instant keep that order rather than one by id.
   */
  readonly seq?: number;
}

/** Something done about a flag (moved the probe, lowered the set temperature…). */
export interface ActionInput {
  readonly id: string;
  readonly flagKey: string;
  readonly kind: string;
  readonly at: Date;
}

export interface SessionInput {
  readonly id: string;
  readonly startedAt: Date;
  readonly endedAt: Date | null;
  readonly referenceCenti: number;
  readonly limitCenti: number;
}

export interface InfantState {
  readonly readings: readonly ReadingInput[];
  readonly actions: readonly ActionInput[];
  readonly sessions: readonly SessionInput[];
  /** When given, the first remote-site check is due one interval after admission. */
  readonly admittedAt?: Date | null;
}

export type FlagKind = 'gap' | 'overdue-check' | 'heat-stress' | 'cold-stress' | 'manual-mode' | 'skin-to-skin-deviation' | 'fever';

export type FlagStatus = 'open' | 'closed';

export interface GapFlagDetail {
  /** The gap of the reading that raised the flag. */
  readonly gapCenti: number;
  readonly direction: GapDirection;
  readonly limitCenti: number;
  readonly probeCenti: number;
  readonly remoteCenti: number;
  /** The largest gap charted while the flag was open. */
  readonly worstGapCenti: number;
}

export interface OverdueFlagDetail {
  readonly dueAt: Date;
  /** The check the interval ran from; null when it ran from admission. */
  readonly lastCheckAt: Date | null;
  readonly intervalMinutes: number;
  /** Whole minutes late: at the late check (closed) or at `now` (open). */
  readonly minutesLate: number;
}

export interface HeatStressFlagDetail {
  /** Every reason seen while the flag was open, in the order first seen. */
  readonly reasons: HeatStressReason[];
}

export interface ColdStressFlagDetail {
  /** The worst (coldest) band charted while the flag was open. */
  readonly band: ColdBand;
  readonly lowestCenti: number;
}

/** A remote site of 38.0 °C and over (Bedside Clinical Guidelines Partnership): may mean infection. */
export interface FeverFlagDetail {
  /** The highest remote-site temperature charted while the flag was open. */
  readonly highestCenti: number;
}

export interface ManualModeFlagDetail {
  /** Every reason seen while the flag was open. */
  readonly reasons: ManualModeReason[];
  readonly manualSince: Date | null;
  readonly highOutputSince: Date | null;
}

export interface SkinToSkinFlagDetail {
  readonly sessionId: string;
  /** Reading minus reference (signed) of the reading that raised the flag. */
  readonly deviationCenti: number;
  readonly referenceCenti: number;
  readonly limitCenti: number;
  /** The largest deviation (by size, signed) while the flag was open. */
  readonly worstDeviationCenti: number;
  /**
   * Which temperature raised it: the remote site when one was charted, else the probe. A flag
   * raised on the remote site is closed only by a remote-site reading.
   */
  readonly site: 'remote' | 'probe';
}

export interface FlagDetailByKind {
  gap: GapFlagDetail;
  'overdue-check': OverdueFlagDetail;
  'heat-stress': HeatStressFlagDetail;
  'cold-stress': ColdStressFlagDetail;
  'manual-mode': ManualModeFlagDetail;
  'skin-to-skin-deviation': SkinToSkinFlagDetail;
  fever: FeverFlagDetail;
}

interface FlagBase<K extends FlagKind> {
  /**
   * Deterministic and stable: `gap:<readingId>`, `overdue:<readingId>` or `overdue:admission`,
   * `heat-stress:<readingId>`, `cold:<readingId>`, `manual:<readingId>`,
   * `s2s:<sessionId>:<readingId>`. The reading id is that of the original row of a correction
   * chain, so correcting a value keeps the flag (and the actions recorded against it).
   */
  readonly key: string;
  readonly kind: K;
  readonly raisedAt: Date;
  /**
   * The current version of the reading that raised the flag. For a time-based flag, the
   * reading its clock ran from (the last remote-site check, or where manual or high output
   * began); null when the clock ran from admission.
   */
  readonly raisedByReadingId: string | null;
  readonly detail: FlagDetailByKind[K];
  readonly status: FlagStatus;
  readonly closedAt: Date | null;
  /** Null for a flag closed by time (the end of a skin-to-skin session) or still open. */
  readonly closedByReadingId: string | null;
  /** For an open flag with an action: the last action + recheckMinutes; otherwise null. */
  readonly recheckDueAt: Date | null;
  /**
   * For an open flag with an action: the first action + recheckSettleMinutes, the instant from
   * which a reading counts as its recheck; otherwise null.
   */
  readonly recheckCountsFrom: Date | null;
  /** From SEVERITY_TABLE, by kind and (cold stress) worst band. */
  readonly severity: Severity;
  /**
   * When it reached its current severity: its raising, or the taken time of the reading that
   * made it worse (a colder band). An escalation's delay runs from here.
   */
  readonly severitySince: Date;
}

export type EvaluatedFlag = { [K in FlagKind]: FlagBase<K> }[FlagKind];

export interface LatestValues {
  readonly probeCenti: number | null;
  readonly probeTakenAt: Date | null;
  readonly remoteCenti: number | null;
  readonly remoteSite: RemoteSite | null;
  readonly remoteTakenAt: Date | null;
  /** The latest charted value of each (a reading that leaves it blank keeps the last one). */
  readonly controlMode: ControlMode | null;
  readonly setCenti: number | null;
  readonly heaterOutputPct: number | null;
  /** The latest current reading of any kind. */
  readonly takenAt: Date | null;
}

export interface InfantEvaluation {
  /** All flags, open and closed, by raisedAt (then kind, then key). */
  readonly flags: EvaluatedFlag[];
  readonly openFlags: EvaluatedFlag[];
  /** The latest current reading with a remote-site temperature. */
  readonly lastRemoteCheckAt: Date | null;
  /**
   * The schedule from the last remote-site check, or from admission before the first check;
   * 'never' only with neither.
   */
  readonly nextCheck: CheckStatusResult;
  /**
   * While the latest charted control mode is manual: the 15-minute check clock (ECRI), which any
   * charted temperature (probe or remote site) satisfies. Null outside manual mode.
   */
  readonly manualCheck: ManualCheckClock | null;
  readonly latest: LatestValues;
}

export interface ManualCheckClock {
  /** First reading of the current run of manual mode. */
  readonly since: Date;
  /** The later of `since` and the last temperature charted, plus manualCheckMinutes. */
  readonly dueAt: Date;
  /** The latest charted heater output, if any. */
  readonly outputPct: number | null;
  readonly limitMinutes: number;
  readonly status: CheckStatusResult['status'];
  readonly minutesLate: number;
}

/** A version of a unit's settings and the instant from which it is in force. */
export interface PolicyVersion {
  readonly effectiveFrom: Date;
  readonly policy: Partial<UnitPolicy>;
}

/** Plain code-unit order: deterministic everywhere, unlike localeCompare. */
function compareIds(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

/** Storing order when both rows carry one, else plain id order. */
function bySeqThenId(a: ReadingInput, b: ReadingInput): number {
  if (typeof a.seq === 'number' && typeof b.seq === 'number' && a.seq !== b.seq) return a.seq - b.seq;
  return compareIds(a.id, b.id);
}

// ---------------------------------------------------------------------------------------------
// Corrections
// ---------------------------------------------------------------------------------------------

interface CurrentReading {
  readonly reading: ReadingInput;
  /** Id of the original row of its correction chain: the stable part of flag keys. */
  readonly rootId: string;
  readonly ms: number;
  readonly recordedMs: number;
}

/**
 * The current version of each reading. Rows are never edited: a correction is a new row that
 * points at the one it replaces. Within one chain the current version is the row nothing
 * replaces (if a row was corrected twice, the later-recorded correction wins); a current version
 * marked entered-in-error removes the reading altogether.
 */
export function currentReadings(readings: readonly ReadingInput[]): ReadingInput[] {
  return currentVersions(readings, Number.POSITIVE_INFINITY).map((entry) => entry.reading);
}

const TEMPERATURE_KEYS = ['probeCenti', 'remoteCenti', 'airCenti', 'setCenti'] as const;
const NUMBER_KEYS = ['heaterOutputPct', 'heartRate'] as const;

const isTime = (value: unknown): value is Date => value instanceof Date && !Number.isNaN(value.getTime());
const isAbsentOr = (value: unknown, test: (v: unknown) => boolean): boolean => value === null || value === undefined || test(value);
const isFiniteNumber = (value: unknown): boolean => typeof value === 'number' && Number.isFinite(value);

/**
 * Stored rows were checked on the way in; this guards against a broken caller. The happy path
 * allocates nothing (it runs for every reading on every board refresh); field names are built
 * only when something is wrong.
 */
function validateReading(reading: ReadingInput, index: number): { ms: number; recordedMs: number } {
  const field = (name: string): string => `readings[${index}].${name}`;
  if (typeof reading?.id !== 'string' || reading.id === '') {
    throw new ThermalInputError(field('id'), 'invalid-value', 'Each reading needs an id');
  }
  if (!isTime(reading.takenAt)) requireTime(reading.takenAt, field('takenAt'));
  if (!isTime(reading.recordedAt)) requireTime(reading.recordedAt, field('recordedAt'));
  for (const key of TEMPERATURE_KEYS) {
    if (!isAbsentOr(reading[key], Number.isSafeInteger)) requireInteger(reading[key], field(key));
  }
  for (const key of NUMBER_KEYS) {
    if (!isAbsentOr(reading[key], isFiniteNumber)) requireFinite(reading[key], field(key));
  }
  if (!isAbsentOr(reading.controlMode, isControlMode)) {
    const mode = String(reading.controlMode);
    throw new ThermalInputError(field('controlMode'), 'invalid-value', `Unknown control mode: ${mode}`);
  }
  return { ms: reading.takenAt.getTime(), recordedMs: reading.recordedAt.getTime() };
}

function currentVersions(readings: readonly ReadingInput[], nowMs: number): CurrentReading[] {
  const stamps = readings.map(validateReading);
  const byId = new Map<string, number>();
  readings.forEach((reading, index) => byId.set(reading.id, index));
  const replaced = new Set<string>();
  for (const reading of readings) {
    if (reading.replacesId !== null && reading.replacesId !== undefined && byId.has(reading.replacesId)) {
      replaced.add(reading.replacesId);
    }
  }

  const roots = new Map<string, string>();
  const rootOf = (id: string): string => {
    const own = readings[byId.get(id) ?? -1]?.replacesId;
    if (own === null || own === undefined || !byId.has(own)) return id; // not a correction
    const path: string[] = [];
    const onPath = new Set<string>();
    let cursor = id;
    let root: string | undefined;
    for (;;) {
      const known = roots.get(cursor);
      if (known !== undefined) {
        root = known;
        break;
      }
      const parent = readings[byId.get(cursor) ?? -1]?.replacesId;
      if (parent === null || parent === undefined || !byId.has(parent) || onPath.has(parent)) {
        path.push(cursor);
        root = cursor;
        break;
      }
      path.push(cursor);
      onPath.add(cursor);
      cursor = parent;
    }
    for (const step of path) roots.set(step, root);
    return root;
  };

  // The tip of each chain; two tips (a row corrected twice) → the later-recorded one.
  const tips = new Map<string, CurrentReading>();
  readings.forEach((reading, index) => {
    if (replaced.has(reading.id)) return;
    const { ms, recordedMs } = stamps[index];
    const entry: CurrentReading = { reading, rootId: rootOf(reading.id), ms, recordedMs };
    const other = tips.get(entry.rootId);
    if (other === undefined || entry.recordedMs > other.recordedMs || (entry.recordedMs === other.recordedMs && bySeqThenId(other.reading, entry.reading) < 0)) {
      tips.set(entry.rootId, entry);
    }
  });

  return [...tips.values()]
    .filter((entry) => !entry.reading.enteredInError && entry.ms <= nowMs)
    .sort((a, b) => a.ms - b.ms || a.recordedMs - b.recordedMs || bySeqThenId(a.reading, b.reading));
}

// ---------------------------------------------------------------------------------------------
// Flags under construction
// ---------------------------------------------------------------------------------------------

interface Draft<K extends FlagKind = FlagKind> {
  key: string;
  kind: K;
  raisedMs: number;
  raisedByReadingId: string | null;
  detail: FlagDetailByKind[K];
  closedMs: number | null;
  closedByReadingId: string | null;
  /** When it reached its current severity (raisedMs unless it worsened). */
  severityMs: number;
}

const KIND_ORDER: Readonly<Record<FlagKind, number>> = {
  'overdue-check': 0,
  gap: 1,
  'cold-stress': 2,
  'heat-stress': 3,
  'manual-mode': 4,
  'skin-to-skin-deviation': 5,
  fever: 6,
};

class FlagBook {
  readonly drafts: Draft[] = [];
  private readonly keyUses = new Map<string, number>();

  open<K extends FlagKind>(kind: K, baseKey: string, raisedMs: number, raisedByReadingId: string | null, detail: FlagDetailByKind[K]): Draft<K> {
    // Keys are unique by construction; the suffix is a guard so a key never names two flags.
    const uses = this.keyUses.get(baseKey) ?? 0;
    this.keyUses.set(baseKey, uses + 1);
    const key = uses === 0 ? baseKey : `${baseKey}:${uses + 1}`;
    const draft: Draft<K> = {
      key,
      kind,
      raisedMs,
      raisedByReadingId,
      detail,
      closedMs: null,
      closedByReadingId: null,
      severityMs: raisedMs,
    };
    this.drafts.push(draft as unknown as Draft);
    return draft;
  }
}

function close(draft: Draft, ms: number, readingId: string | null): void {
  draft.closedMs = ms;
  draft.closedByReadingId = readingId;
}

function addUnique<T>(list: T[], items: readonly T[], same: (a: T, b: T) => boolean): T[] {
  const result = [...list];
  for (const item of items) if (!result.some((existing) => same(existing, item))) result.push(item);
  return result;
}

const sameHeatReason = (a: HeatStressReason, b: HeatStressReason): boolean => a.kind === b.kind && (a.kind !== 'sign' || (b.kind === 'sign' && a.sign === b.sign));

// ---------------------------------------------------------------------------------------------
// The evaluation
// ---------------------------------------------------------------------------------------------

interface ActionTimes {
  first: number;
  last: number;
}

function actionTimes(actions: readonly ActionInput[], nowMs: number): Map<string, ActionTimes> {
  const byKey = new Map<string, ActionTimes>();
  actions.forEach((action, index) => {
    const ms = requireTime(action?.at, `actions[${index}].at`);
    if (ms > nowMs) return;
    const times = byKey.get(action.flagKey);
    if (times === undefined) byKey.set(action.flagKey, { first: ms, last: ms });
    else {
      times.first = Math.min(times.first, ms);
      times.last = Math.max(times.last, ms);
    }
  });
  return byKey;
}

/** Where the check clock runs from: the last remote-site check, or admission (reading null). */
interface ScheduleStart {
  readonly ms: number;
  readonly reading: CurrentReading | null;
}

interface ActiveSession {
  readonly session: SessionInput;
  readonly startMs: number;
  readonly endMs: number | null;
  open: Draft<'skin-to-skin-deviation'> | null;
}

/**
 * The check interval in force at an instant: that of the latest version effective at or before
 * it, else the base policy's. A check's due time is set by the version in force at the check
 * before it (or at admission), so a change of settings never moves a check already due.
 */
function intervalAtFn(base: UnitPolicy, versions: readonly PolicyVersion[]): (ms: number) => number {
  if (versions.length === 0) return () => base.checkIntervalMinutes;
  const sorted = versions
    .map((v) => ({ ms: requireTime(v.effectiveFrom, 'versions.effectiveFrom'), minutes: resolvePolicy(v.policy).checkIntervalMinutes }))
    .sort((a, b) => a.ms - b.ms);
  return (ms) => {
    let minutes = base.checkIntervalMinutes;
    for (const v of sorted) {
      if (v.ms <= ms) minutes = v.minutes;
      else break;
    }
    return minutes;
  };
}

export function evaluateInfant(state: InfantState, now: Date, policyInput: Partial<UnitPolicy> = {}, versions: readonly PolicyVersion[] = []): InfantEvaluation {
  const nowMs = requireTime(now, 'now');
  const policy = resolvePolicy(policyInput);
  const intervalMinutesAt = intervalAtFn(policy, versions);
  const intervalOf = (start: { ms: number }): number => intervalMinutesAt(start.ms) * MINUTE_MS;
  const settleMs = policy.recheckSettleMinutes * MINUTE_MS;
  const readings = currentVersions(state.readings ?? [], nowMs);
  const actions = actionTimes(state.actions ?? [], nowMs);
  const hasActionBy = (key: string, ms: number): boolean => {
    const times = actions.get(key);
    return times !== undefined && times.first <= ms;
  };

  const book = new FlagBook();

  // Check schedule: the clock runs from admission until the first remote-site check.
  const admittedMs = state.admittedAt === null || state.admittedAt === undefined ? null : requireTime(state.admittedAt, 'admittedAt');
  let scheduleFrom: ScheduleStart | null = admittedMs !== null && admittedMs <= nowMs ? { ms: admittedMs, reading: null } : null;
  let lastRemote: CurrentReading | null = null;

  /** An overdue flag for the check due one interval after `start`, late as of `lateAtMs`. */
  const openOverdue = (start: ScheduleStart, lateAtMs: number): Draft<'overdue-check'> => {
    const dueMs = start.ms + intervalOf(start);
    const key = `overdue:${start.reading === null ? 'admission' : start.reading.rootId}`;
    return book.open('overdue-check', key, dueMs, start.reading?.reading.id ?? null, {
      dueAt: new Date(dueMs),
      lastCheckAt: start.reading === null ? null : new Date(start.ms),
      intervalMinutes: intervalMinutesAt(start.ms),
      minutesLate: Math.floor((lateAtMs - dueMs) / MINUTE_MS),
    });
  };

  let openGap: Draft<'gap'> | null = null;
  let openHeat: Draft<'heat-stress'> | null = null;
  let openCold: Draft<'cold-stress'> | null = null;
  let openFever: Draft<'fever'> | null = null;
  // Held in an object because it is opened from a closure (time passing between readings).
  const manualFlag: { open: Draft<'manual-mode'> | null } = { open: null };

  const manualPolicy = resolveManualPolicy({
    highOutputPct: policy.highOutputPct,
    highOutputMinutes: policy.highOutputMinutes,
    manualCheckMinutes: policy.manualCheckMinutes,
  });
  const manual = new ManualModeTracker<ReadingInput>(manualPolicy);
  const rootById = new Map(readings.map((entry) => [entry.reading.id, entry.rootId]));

  const sessions: ActiveSession[] = (state.sessions ?? [])
    .map((session, index) => ({ session, ...validateSession(session, `sessions[${index}]`), open: null }))
    .filter((entry) => entry.startMs <= nowMs)
    .sort((a, b) => a.startMs - b.startMs || compareIds(a.session.id, b.session.id));

  const closeEndedSessions = (ms: number): void => {
    for (const entry of sessions) {
      if (entry.open !== null && entry.endMs !== null && entry.endMs <= ms) {
        close(entry.open, entry.endMs, null);
        entry.open = null;
      }
    }
  };

  /** Open the manual-mode flag if its warning began before `ms` (time passing, no reading). */
  const openManualBefore = (ms: number): void => {
    const from = manual.warningFrom;
    if (manualFlag.open === null && from !== null && from < ms) {
      const highAt = manual.highOutputLimitAt;
      const cause = highAt !== null && highAt === from ? manual.highOutputSince : manual.checkClockFrom;
      const causeId = cause?.reading.id ?? null;
      manualFlag.open = book.open('manual-mode', `manual:${causeId === null ? 'unknown' : (rootById.get(causeId) ?? causeId)}`, from, causeId, {
        reasons: manual.reasonsAt(ms),
        manualSince: manual.manualSince === null ? null : new Date(manual.manualSince.ms),
        highOutputSince: manual.highOutputSince === null ? null : new Date(manual.highOutputSince.ms),
      });
    } else if (manualFlag.open !== null) {
      const flag = manualFlag.open;
      const reasons = addUnique(flag.detail.reasons, manual.reasonsAt(ms), (a, b) => a === b);
      flag.detail = { ...flag.detail, reasons };
    }
  };

  for (const entry of readings) {
    const { reading, ms, rootId } = entry;
    // Rows from a database may carry undefined for an empty column; treat it as null.
    const probe = reading.probeCenti ?? null;
    const remote = reading.remoteCenti ?? null;
    closeEndedSessions(ms);
    openManualBefore(ms);

    // Gap: raised by a reading over the limit; closed only by a reading within the limit
    // taken after an action on the flag (a recheck after an action).
    if (probe !== null && remote !== null) {
      const gap = assessGapCenti(probe, remote, policy.gapLimitCenti);
      if (gap.exceeds) {
        if (openGap === null) {
          openGap = book.open('gap', `gap:${rootId}`, ms, reading.id, {
            gapCenti: gap.gapCenti,
            direction: gap.direction,
            limitCenti: policy.gapLimitCenti,
            probeCenti: probe,
            remoteCenti: remote,
            worstGapCenti: gap.gapCenti,
          });
        } else if (gap.gapCenti > openGap.detail.worstGapCenti) {
          openGap.detail = { ...openGap.detail, worstGapCenti: gap.gapCenti };
        }
      } else if (openGap !== null && hasActionBy(openGap.key, ms - settleMs)) {
        // A recheck counts only once the reading has settled after the first action.
        close(openGap, ms, reading.id);
        openGap = null;
      }
    }

    // Overdue check: a remote-site check after its due time closes a (historic) overdue flag.
    if (remote !== null) {
      if (scheduleFrom !== null && ms > scheduleFrom.ms + intervalOf(scheduleFrom)) {
        close(openOverdue(scheduleFrom, ms), ms, reading.id);
      }
      if (scheduleFrom === null || ms >= scheduleFrom.ms) scheduleFrom = { ms, reading: entry };
      lastRemote = entry;
    }

    // Heat stress: any sign, a remote site above normal, or a fast heart rate. It closes at the
    // next observation (a remote-site temperature or a heart rate) that raises nothing; a
    // reading with only a probe or air value says nothing about heat stress.
    const heartRate = reading.heartRate ?? null;
    // A fever supersedes hyperthermia: a remote site of 38.0 °C and over raises the fever flag,
    // not a heat-stress reason (signs and heart rate still count).
    const feverish = remote !== null && remote >= FEVER_MIN_CENTI;
    const heat = heatStressPrompt({ remoteCenti: feverish ? null : remote, heartRate, signs: reading.heatSigns ?? [] });
    if (heat.raised) {
      if (openHeat === null) {
        openHeat = book.open('heat-stress', `heat-stress:${rootId}`, ms, reading.id, {
          reasons: heat.reasons,
        });
      } else {
        openHeat.detail = { reasons: addUnique(openHeat.detail.reasons, heat.reasons, sameHeatReason) };
      }
    } else if (openHeat !== null && (remote !== null || heartRate !== null)) {
      close(openHeat, ms, reading.id);
      openHeat = null;
    }

    // Cold stress: a remote site below the normal band; closed by one in or above it.
    if (remote !== null) {
      const band: TemperatureBand = temperatureBand(remote);
      if (isColdBand(band)) {
        if (openCold === null) {
          openCold = book.open('cold-stress', `cold:${rootId}`, ms, reading.id, {
            band,
            lowestCenti: remote,
          });
        } else {
          const was = severityOf('cold-stress', openCold.detail);
          openCold.detail = {
            band: worseColdBand(openCold.detail.band, band),
            lowestCenti: Math.min(openCold.detail.lowestCenti, remote),
          };
          if (severityOf('cold-stress', openCold.detail) !== was) openCold.severityMs = ms;
        }
      } else if (openCold !== null) {
        close(openCold, ms, reading.id);
        openCold = null;
      }
      if (feverish) {
        if (openFever === null) {
          openFever = book.open('fever', `fever:${rootId}`, ms, reading.id, { highestCenti: remote });
        } else if (remote > openFever.detail.highestCenti) {
          openFever.detail = { highestCenti: remote };
        }
      } else if (openFever !== null) {
        close(openFever, ms, reading.id);
        openFever = null;
      }
    }

    // Manual mode: the reading may end the warning (left manual, output dropped, a check).
    manual.apply(reading, ms);
    if (manualFlag.open !== null && manual.reasonsAt(ms).length === 0) {
      close(manualFlag.open, ms, reading.id);
      manualFlag.open = null;
    }

    // Skin-to-skin: one open flag per session; an in-session reading within the limit closes it.
    for (const active of sessions) {
      if (active.startMs > ms) break;
      if (active.endMs !== null && ms >= active.endMs) continue;
      const temperature = remote ?? probe;
      if (temperature === null) continue;
      // A probe-only reading says nothing about a deviation seen on the remote site.
      if (remote === null && active.open !== null && active.open.detail.site === 'remote') continue;
      const deviation = temperature - active.session.referenceCenti;
      if (Math.abs(deviation) > active.session.limitCenti) {
        if (active.open === null) {
          const key = `s2s:${active.session.id}:${rootId}`;
          active.open = book.open('skin-to-skin-deviation', key, ms, reading.id, {
            sessionId: active.session.id,
            deviationCenti: deviation,
            referenceCenti: active.session.referenceCenti,
            limitCenti: active.session.limitCenti,
            worstDeviationCenti: deviation,
            site: remote !== null ? 'remote' : 'probe',
          });
        } else if (Math.abs(deviation) > Math.abs(active.open.detail.worstDeviationCenti)) {
          active.open.detail = { ...active.open.detail, worstDeviationCenti: deviation };
        }
      } else if (active.open !== null) {
        close(active.open, ms, reading.id);
        active.open = null;
      }
    }
  }

  // Time has passed since the last reading: sessions may have ended, warnings may have begun.
  closeEndedSessions(nowMs);
  // Opens the warning if it began after the last reading, or adds reasons that began since.
  openManualBefore(nowMs);

  const from = scheduleFrom as ScheduleStart | null;
  if (from !== null && nowMs > from.ms + intervalOf(from)) openOverdue(from, nowMs);

  const flags = book.drafts
    .map((draft) => finishFlag(draft, actions, policy))
    .sort((a, b) => a.raisedAt.getTime() - b.raisedAt.getTime() || KIND_ORDER[a.kind] - KIND_ORDER[b.kind] || compareIds(a.key, b.key));

  const remote = lastRemote as CurrentReading | null;
  return {
    flags,
    openFlags: flags.filter((flag) => flag.status === 'open'),
    lastRemoteCheckAt: remote === null ? null : new Date(remote.ms),
    nextCheck:
      from === null
        ? checkStatus(null, now)
        : checkStatus(new Date(from.ms), now, {
            intervalMinutes: intervalMinutesAt(from.ms),
            dueSoonMinutes: policy.dueSoonMinutes,
          }),
    manualCheck: manualClock(manual, now, policy),
    latest: latestValues(readings),
  };
}

function manualClock(manual: ManualModeTracker<ReadingInput>, now: Date, policy: UnitPolicy): ManualCheckClock | null {
  const since = manual.manualSince;
  const from = manual.checkClockFrom;
  if (since === null || from === null) return null;
  const status = checkStatus(new Date(from.ms), now, {
    intervalMinutes: policy.manualCheckMinutes,
    dueSoonMinutes: Math.min(policy.dueSoonMinutes, Math.max(0, policy.manualCheckMinutes - 1)),
  });
  return {
    since: new Date(since.ms),
    dueAt: new Date(from.ms + policy.manualCheckMinutes * MINUTE_MS),
    outputPct: manual.outputPct,
    limitMinutes: policy.manualCheckMinutes,
    status: status.status,
    minutesLate: status.minutesLate,
  };
}

function finishFlag(draft: Draft, actions: Map<string, ActionTimes>, policy: UnitPolicy): EvaluatedFlag {
  const open = draft.closedMs === null;
  const times = actions.get(draft.key);
  return {
    key: draft.key,
    kind: draft.kind,
    raisedAt: new Date(draft.raisedMs),
    raisedByReadingId: draft.raisedByReadingId,
    detail: draft.detail,
    status: open ? 'open' : 'closed',
    closedAt: open ? null : new Date(draft.closedMs as number),
    closedByReadingId: draft.closedByReadingId,
    recheckDueAt: open && times !== undefined ? new Date(times.last + policy.recheckMinutes * MINUTE_MS) : null,
    recheckCountsFrom: open && times !== undefined ? new Date(times.first + policy.recheckSettleMinutes * MINUTE_MS) : null,
    severity: severityOf(draft.kind, draft.detail),
    severitySince: new Date(draft.severityMs),
  } as EvaluatedFlag;
}

function latestValues(readings: readonly CurrentReading[]): LatestValues {
  let probe: CurrentReading | null = null;
  let remote: CurrentReading | null = null;
  let controlMode: ControlMode | null = null;
  let setCenti: number | null = null;
  let heaterOutputPct: number | null = null;
  for (const entry of readings) {
    const r = entry.reading;
    if ((r.probeCenti ?? null) !== null) probe = entry;
    if ((r.remoteCenti ?? null) !== null) remote = entry;
    controlMode = r.controlMode ?? controlMode;
    setCenti = r.setCenti ?? setCenti;
    heaterOutputPct = r.heaterOutputPct ?? heaterOutputPct;
  }
  const last = readings.length === 0 ? null : readings[readings.length - 1];
  return {
    probeCenti: probe?.reading.probeCenti ?? null,
    probeTakenAt: probe === null ? null : new Date(probe.ms),
    remoteCenti: remote?.reading.remoteCenti ?? null,
    remoteSite: remote?.reading.remoteSite ?? null,
    remoteTakenAt: remote === null ? null : new Date(remote.ms),
    controlMode,
    setCenti,
    heaterOutputPct,
    takenAt: last === null ? null : new Date(last.ms),
  };
}

/** When an open flag with no action escalates: raisedAt + escalationDelayMinutes (from memory). */
export interface FlagEscalation {
  readonly escalateAt: Date | null;
  readonly escalated: boolean;
}

/**
 * An open flag that has waited MORE than escalationDelayMinutes without any action is
 * escalated to the nurse in charge. A flag with an action is being worked (its recheck is
 * tracked by recheckDueAt); a closed flag never escalates.
 */
export function flagEscalation(flag: EvaluatedFlag, now: Date, policyInput: Partial<UnitPolicy> = {}): FlagEscalation {
  const nowMs = requireTime(now, 'now');
  const policy = resolvePolicy(policyInput);
  if (flag.status !== 'open' || flag.recheckDueAt !== null) return { escalateAt: null, escalated: false };
  const escalateMs = flag.raisedAt.getTime() + policy.escalationDelayMinutes * MINUTE_MS;
  return { escalateAt: new Date(escalateMs), escalated: nowMs > escalateMs };
}
