/**
 * An independent reference model of the thermal-care rules, written from the published rules
 * (the rules table in the thermal README, the team's check values and the clinical-state
 * decisions), for the property and scenario tests. It imports nothing from the product: its
 * conversions, bands, clocks and flag lifecycles are its own, so that a test comparing the
 * product with it can fail.
 *
 * Temperatures are integer hundredths of °C ("centi"); instants are UTC milliseconds.
 */

export type ControlMode = 'skin-servo' | 'air-servo' | 'manual';
export type TempUnit = 'C' | 'F';

// ---------------------------------------------------------------------------------------------
// Conversions (NIST SP 811: t(°F) = 1.8 × t(°C) + 32; a difference has no offset)
// ---------------------------------------------------------------------------------------------

/** The typed decimal as an exact fraction num / 10^scale (String(n) is the shortest round trip). */
function exactDecimal(value: number): { num: bigint; scale: number } {
  if (!Number.isFinite(value)) throw new Error(`not a finite number: ${value}`);
  const text = String(value);
  const match = /^(-?)(\d+)(?:\.(\d+))?(?:e([+-]\d+))?$/i.exec(text);
  if (!match) throw new Error(`cannot read ${text} as a decimal`);
  const [, sign, whole, frac = '', exp = '0'] = match;
  let digits = BigInt(whole + frac);
  let scale = frac.length - Number(exp);
  if (scale < 0) {
    digits *= 10n ** BigInt(-scale);
    scale = 0;
  }
  return { num: sign === '-' ? -digits : digits, scale };
}

/** num / den rounded once, half away from zero. */
function roundHalfAway(num: bigint, den: bigint): number {
  const negative = num < 0n !== den < 0n;
  const n = num < 0n ? -num : num;
  const d = den < 0n ? -den : den;
  const q = (2n * n + d) / (2n * d);
  return Number(negative ? -q : q);
}

/** A typed temperature to hundredths of °C, exact arithmetic, one rounding. */
export function centiFrom(value: number, unit: TempUnit): number {
  const { num, scale } = exactDecimal(value);
  const pow = 10n ** BigInt(scale);
  if (unit === 'C') return roundHalfAway(num * 100n, pow);
  // (F − 32) × 5/9 °C, times 100.
  return roundHalfAway((num - 32n * pow) * 500n, pow * 9n);
}

/** Hundredths of °C to °F, rounded to two decimals. */
export function fahrenheitFromCenti(centi: number): number {
  return roundHalfAway(BigInt(centi) * 9n + 16000n, 5n) / 100;
}

// ---------------------------------------------------------------------------------------------
// Bands (WHO 1997 via Miller 2011; fever from the Bedside Clinical Guidelines Partnership)
// ---------------------------------------------------------------------------------------------

export type Band = 'severe-hypothermia' | 'moderate-hypothermia' | 'cold-stress' | 'normal' | 'hyperthermia' | 'fever';

/** The one temperature band a remote-site value raises: the most severe that applies. */
export function bandOf(centi: number): Band {
  if (centi < 3200) return 'severe-hypothermia';
  if (centi < 3600) return 'moderate-hypothermia';
  if (centi < 3650) return 'cold-stress';
  if (centi <= 3750) return 'normal';
  if (centi >= 3800) return 'fever';
  return 'hyperthermia';
}

const COLD_ORDER: Band[] = ['cold-stress', 'moderate-hypothermia', 'severe-hypothermia'];

// ---------------------------------------------------------------------------------------------
// Severity: the starting order, most severe first (the team's design notes)
// ---------------------------------------------------------------------------------------------

/**
 * Flag kinds. A remote-site value raises at most one temperature-band flag: `cold-stress` (with its
 * band) or `fever` (38.0 °C and over, which supersedes hyperthermia); hyperthermia below 38.0 °C
 * is a heat-stress reason.
 */
export type FlagKind = 'gap' | 'overdue-check' | 'heat-stress' | 'cold-stress' | 'fever' | 'manual-mode' | 'skin-to-skin-deviation';

/** Rank 1 is the most severe: the starting order of the design notes. */
export function severityRank(kind: FlagKind, band?: Band): number {
  switch (kind) {
    case 'cold-stress':
      return band === 'severe-hypothermia' ? 1 : band === 'moderate-hypothermia' ? 2 : 9;
    case 'fever':
      return 3;
    case 'heat-stress':
      return 4;
    case 'manual-mode':
      return 5;
    case 'skin-to-skin-deviation':
      return 6;
    case 'gap':
      return 7;
    case 'overdue-check':
      return 8;
  }
}

export type Severity = 'critical' | 'urgent' | 'caution';

/**
 * Three classes: the most severe escalate at once (severe hypothermia; fever, whose infection
 * caution cannot wait), mild cold stress is watched, everything else needs attention.
 */
export function severityOf(kind: FlagKind, band?: Band): Severity {
  const rank = severityRank(kind, band);
  if (rank === 1 || rank === 3) return 'critical';
  if (rank === 9) return 'caution';
  return 'urgent';
}

/** Default escalation delay in minutes (null: never), the unit's delay being 30 (from memory). */
export function defaultEscalationDelay(kind: FlagKind, band?: Band, unitDelay = 30): number | null {
  const severity = severityOf(kind, band);
  return severity === 'critical' ? 0 : severity === 'caution' ? null : unitDelay;
}

// ---------------------------------------------------------------------------------------------
// History
// ---------------------------------------------------------------------------------------------

/** One stored version of a reading. A correction is a new version with `replacesId`. */
export interface ModelReading {
  id: string;
  replacesId?: string | null;
  /** When the version was written (the clock at the POST). */
  recordedAt: number;
  takenAt: number;
  enteredInError?: boolean;
  probe?: number | null;
  remote?: number | null;
  controlMode?: ControlMode | null;
  heaterOutputPct?: number | null;
  heartRate?: number | null;
  heatSigns?: string[];
}

export interface ModelAction {
  /** The key of the flag it was recorded against (see `ModelFlag.key`). */
  flagKey: string;
  at: number;
  recordedAt?: number;
}

export interface ModelSession {
  id: string;
  startedAt: number;
  endedAt?: number | null;
  /** When the end was charted (defaults to `endedAt`). */
  endRecordedAt?: number | null;
  referenceCenti: number;
  limitCenti: number;
}

/** One version of the unit's settings; the version in force at t has the latest effectiveFrom ≤ t. */
export interface ModelSettings {
  effectiveFrom: number;
  checkIntervalMinutes: number;
  recheckMinutes: number;
  settleMinutes: number;
  gapLimitCenti: number;
  manualCheckMinutes: number;
  highOutputPct: number;
  highOutputMinutes: number;
}

/** Defaults, each with its source. */
export const MODEL_DEFAULTS: Omit<ModelSettings, 'effectiveFrom'> = {
  checkIntervalMinutes: 120, // common practice: at least every 2 hours on a servo heater
  recheckMinutes: 30, // common practice: recheck 15–30 min after an action
  settleMinutes: 15, // common practice: a reading settles about 15–30 min after a change
  gapLimitCenti: 50, // common practice: more than 0.5 °C
  manualCheckMinutes: 15, // ECRI, Infant Radiant Warmers Can Burn: at least every 15 min
  highOutputPct: 80, // from memory
  highOutputMinutes: 15, // from memory
};

export interface ModelHistory {
  admittedAt: number;
  admissionControlMode: ControlMode;
  readings: ModelReading[];
  actions: ModelAction[];
  sessions: ModelSession[];
  settings: ModelSettings[];
}

export interface ModelOptions {
  /** Whose time the settle minutes count from: the first action on the flag, or the latest before the reading. */
  settleFrom: 'first-action' | 'last-action';
  /** Kinds whose closing reading must wait for the settle time after an action (a gap always needs an action). */
  settleKinds: readonly FlagKind[];
}

/**
 * The gap is the one kind that needs an action to close, and its recheck counts from the first
 * action plus the settle time (common practice: read again 15–30 min after a change). Other kinds
 * close on their next qualifying reading.
 */
export const MODEL_OPTIONS: ModelOptions = {
  settleFrom: 'first-action',
  settleKinds: ['gap'],
};

// ---------------------------------------------------------------------------------------------
// Output
// ---------------------------------------------------------------------------------------------

export interface ModelFlag {
  key: string;
  kind: FlagKind;
  band?: Band;
  /** gap: which reading is lower; s2s: warmer or colder than the reference. */
  direction?: 'probe-lower' | 'probe-higher' | 'equal' | 'warmer' | 'colder';
  severityRank: number;
  severity: Severity;
  raisedAt: number;
  /** When it reached its current severity (a worsening band moves it). */
  severityAt: number;
  /** Root id of the reading that raised it (null for an overdue check or a clock-raised manual flag). */
  raisedByRootId: string | null;
  /**
   * After this instant (strictly) an open flag is escalated at its current severity; null: never
   * (default delays). A worsening starts the new severity's delay: the flag is told again then
   * (common practice), and never twice at one severity.
   */
  escalateAfter: number | null;
  /** Last action + recheck minutes, for an open flag with an action. */
  recheckDueAt: number | null;
  closedAt?: number;
}

export interface ModelClocks {
  /** The remote-site check on the unit's interval (keeps running in every mode). */
  remoteDueAt: number;
  /** The manual-mode check (any charted infant temperature), while manual lasts. */
  manualDueAt: number | null;
  /** The earliest recheck due among open flags with an action. */
  recheckDueAt: number | null;
  /** The earliest of the three. */
  nextDueAt: number;
}

export interface ModelState {
  open: ModelFlag[];
  closed: ModelFlag[];
  clocks: ModelClocks;
  controlMode: ControlMode;
}

const MIN = 60_000;

export function settingsAt(settings: readonly ModelSettings[], t: number): ModelSettings {
  const sorted = [...settings].sort((a, b) => a.effectiveFrom - b.effectiveFrom);
  let found: ModelSettings = { effectiveFrom: -Infinity, ...MODEL_DEFAULTS };
  for (const s of sorted) if (s.effectiveFrom <= t) found = s;
  return found;
}

interface CurrentReading extends ModelReading {
  rootId: string;
}

/** The current version of each chain recorded by `now`; entered-in-error chains are dropped. */
export function currentVersions(readings: readonly ModelReading[], now: number): CurrentReading[] {
  const visible = readings.filter((r) => r.recordedAt <= now);
  const byId = new Map(visible.map((r) => [r.id, r]));
  const rootOf = (r: ModelReading): string => {
    let cur = r;
    while (cur.replacesId && byId.has(cur.replacesId)) cur = byId.get(cur.replacesId)!;
    return cur.id;
  };
  const latest = new Map<string, ModelReading>();
  for (const r of visible) {
    const root = rootOf(r);
    const prev = latest.get(root);
    if (!prev || r.recordedAt > prev.recordedAt || (r.recordedAt === prev.recordedAt && r.replacesId === prev.id)) latest.set(root, r);
  }
  const out: CurrentReading[] = [];
  for (const [rootId, r] of latest) if (!r.enteredInError) out.push({ ...r, rootId });
  return out.sort((a, b) => a.takenAt - b.takenAt || a.recordedAt - b.recordedAt);
}

const hasInfantTemp = (r: ModelReading) => r.probe != null || r.remote != null;

/**
 * The infant's flags and clocks as of `now`, judged on what had been charted by `now` (a late
 * entry counts at the time it was taken, so a flag it shows should not have been raised is not
 * open: withdrawn).
 */
export function evaluateModel(history: ModelHistory, now: number, options: ModelOptions = MODEL_OPTIONS): ModelState {
  const readings = currentVersions(history.readings, now).filter((r) => r.takenAt <= now);
  const actions = history.actions.filter((a) => a.at <= now && (a.recordedAt ?? a.at) <= now);
  const sessions = history.sessions.filter((s) => s.startedAt <= now);
  const at = (t: number) => settingsAt(history.settings, t);

  const open = new Map<string, ModelFlag>();
  const closed: ModelFlag[] = [];
  const close = (key: string, t: number) => {
    const f = open.get(key);
    if (!f) return;
    open.delete(key);
    closed.push({ ...f, closedAt: t });
  };
  const raise = (f: Omit<ModelFlag, 'severityRank' | 'severity' | 'severityAt' | 'escalateAfter' | 'recheckDueAt'>) => {
    const delay = defaultEscalationDelay(f.kind, f.band);
    open.set(f.key, {
      ...f,
      severityRank: severityRank(f.kind, f.band),
      severity: severityOf(f.kind, f.band),
      severityAt: f.raisedAt,
      escalateAfter: delay == null ? null : f.raisedAt + delay * MIN,
      recheckDueAt: null,
    });
  };
  const actionsOn = (key: string) => actions.filter((a) => a.flagKey === key).sort((a, b) => a.at - b.at);
  /** A reading counts as the recheck of a flag only after its action and the settle time. */
  const settled = (key: string, kind: FlagKind, t: number): boolean => {
    const acts = actionsOn(key).filter((a) => a.at <= t);
    if (acts.length === 0) return kind !== 'gap';
    if (!options.settleKinds.includes(kind)) return true;
    const from = options.settleFrom === 'first-action' ? acts[0].at : acts[acts.length - 1].at;
    return t >= from + at(from).settleMinutes * MIN;
  };

  // Events: readings, session ends, and the clock deadlines found as we go.
  type Ev = { t: number; order: number; reading?: CurrentReading; sessionEnd?: ModelSession };
  const events: Ev[] = readings.map((r) => ({ t: r.takenAt, order: 1, reading: r }));
  for (const s of sessions) if (s.endedAt != null && s.endedAt <= now && (s.endRecordedAt ?? s.endedAt) <= now) events.push({ t: s.endedAt, order: 0, sessionEnd: s });
  events.sort((a, b) => a.t - b.t || a.order - b.order);

  // Remote-site check clock: the version in force at the previous check sets the next due time.
  let remoteDueAt = history.admittedAt + at(history.admittedAt).checkIntervalMinutes * MIN;
  let overdueSeq = 0;
  // Mode.
  let mode: ControlMode = history.admissionControlMode;
  let output: number | null = null;
  let manualSince: number | null = mode === 'manual' ? history.admittedAt : null;
  let manualAnchor: number | null = manualSince;
  let highSince: number | null = null;
  let gapKey: string | null = null;
  let heatKey: string | null = null;
  let coldKey: string | null = null;
  let feverKey: string | null = null;
  let manualKey: string | null = null;
  const s2sKey = new Map<string, string>();
  /** Whether the skin-to-skin flag was raised on a remote-site value. */
  const s2sOnRemote = new Map<string, boolean>();

  const manualDue = () => (manualAnchor == null ? null : manualAnchor + at(manualAnchor).manualCheckMinutes * MIN);
  const highDue = () => (highSince == null ? null : highSince + at(highSince).highOutputMinutes * MIN);

  /** Raise what the clocks owe up to (and not including) instant t, strictly "more than". */
  const advanceClocks = (t: number) => {
    if (t > remoteDueAt && !open.has(`overdue:${overdueSeq}`)) {
      raise({ key: `overdue:${overdueSeq}`, kind: 'overdue-check', raisedAt: remoteDueAt, raisedByRootId: null });
    }
    if (mode === 'manual' && !manualKey) {
      const candidates = [manualDue(), highDue()].filter((d): d is number => d != null && t > d);
      if (candidates.length > 0) {
        const raisedAt = Math.min(...candidates);
        manualKey = `manual:${raisedAt}`;
        raise({ key: manualKey, kind: 'manual-mode', raisedAt, raisedByRootId: null });
      }
    }
  };
  const manualReasonsActive = (t: number) => {
    if (mode !== 'manual') return false;
    const d1 = manualDue();
    const d2 = highDue();
    return (d1 != null && t > d1) || (d2 != null && t > d2);
  };

  for (const ev of events) {
    advanceClocks(ev.t);
    if (ev.sessionEnd) {
      const key = s2sKey.get(ev.sessionEnd.id);
      if (key) close(key, ev.t);
      s2sKey.delete(ev.sessionEnd.id);
      continue;
    }
    const r = ev.reading!;
    const policy = at(r.takenAt);

    // Mode and output carry forward until charted again.
    if (r.controlMode != null && r.controlMode !== mode) {
      mode = r.controlMode;
      if (mode === 'manual') {
        manualSince = r.takenAt;
        manualAnchor = r.takenAt;
      } else {
        manualSince = null;
        manualAnchor = null;
        highSince = null;
      }
    }
    if (r.heaterOutputPct != null) output = r.heaterOutputPct;
    if (mode === 'manual') {
      if (hasInfantTemp(r)) manualAnchor = r.takenAt;
      const high = output != null && output >= policy.highOutputPct;
      if (!high) highSince = null;
      else if (highSince == null) highSince = Math.max(r.takenAt, manualSince ?? r.takenAt);
    }
    if (manualKey && !manualReasonsActive(r.takenAt)) {
      close(manualKey, r.takenAt);
      manualKey = null;
    }

    // Remote-site check.
    if (r.remote != null) {
      close(`overdue:${overdueSeq}`, r.takenAt);
      overdueSeq += 1;
      remoteDueAt = r.takenAt + policy.checkIntervalMinutes * MIN;
    }

    // Gap.
    if (r.probe != null && r.remote != null) {
      const diff = r.probe - r.remote;
      const exceeds = Math.abs(diff) > policy.gapLimitCenti;
      if (!gapKey && exceeds) {
        gapKey = `gap:${r.rootId}`;
        raise({ key: gapKey, kind: 'gap', direction: diff < 0 ? 'probe-lower' : diff > 0 ? 'probe-higher' : 'equal', raisedAt: r.takenAt, raisedByRootId: r.rootId });
      } else if (gapKey && !exceeds && settled(gapKey, 'gap', r.takenAt)) {
        close(gapKey, r.takenAt);
        gapKey = null;
      }
    }

    // Heat stress: signs, a fast heart rate, or a remote site above normal but below fever
    // (fever supersedes hyperthermia). A probe-only reading says nothing about it.
    const band = r.remote != null ? bandOf(r.remote) : null;
    const heatRaised = band === 'hyperthermia' || (r.heartRate != null && r.heartRate > 160) || (r.heatSigns?.length ?? 0) > 0;
    if (heatRaised && !heatKey) {
      heatKey = `heat-stress:${r.rootId}`;
      raise({ key: heatKey, kind: 'heat-stress', raisedAt: r.takenAt, raisedByRootId: r.rootId });
    } else if (!heatRaised && heatKey && (r.remote != null || r.heartRate != null) && settled(heatKey, 'heat-stress', r.takenAt)) {
      close(heatKey, r.takenAt);
      heatKey = null;
    }

    // Temperature bands: cold stress keeps its worst band; fever is its own flag.
    if (band != null) {
      if (COLD_ORDER.includes(band)) {
        const cur = coldKey ? open.get(coldKey)! : null;
        if (!cur) {
          coldKey = `cold:${r.rootId}`;
          raise({ key: coldKey, kind: 'cold-stress', band, raisedAt: r.takenAt, raisedByRootId: r.rootId });
        } else if (COLD_ORDER.indexOf(band) > COLD_ORDER.indexOf(cur.band!)) {
          const delay = defaultEscalationDelay('cold-stress', band);
          open.set(coldKey!, {
            ...cur,
            band,
            severityRank: severityRank('cold-stress', band),
            severity: severityOf('cold-stress', band),
            severityAt: r.takenAt,
            escalateAfter: delay == null ? null : r.takenAt + delay * MIN,
          });
        }
      } else if (coldKey && settled(coldKey, 'cold-stress', r.takenAt)) {
        close(coldKey, r.takenAt);
        coldKey = null;
      }
      if (band === 'fever') {
        if (!feverKey) {
          feverKey = `fever:${r.rootId}`;
          raise({ key: feverKey, kind: 'fever', band, raisedAt: r.takenAt, raisedByRootId: r.rootId });
        }
      } else if (feverKey && settled(feverKey, 'fever', r.takenAt)) {
        close(feverKey, r.takenAt);
        feverKey = null;
      }
    }

    // Skin-to-skin: remote site if taken, else probe; [startedAt, endedAt).
    for (const s of sessions) {
      const ended = s.endedAt != null && s.endedAt <= now && (s.endRecordedAt ?? s.endedAt) <= now;
      if (r.takenAt < s.startedAt || (ended && r.takenAt >= s.endedAt!)) continue;
      const value = r.remote ?? r.probe;
      if (value == null) continue;
      const dev = value - s.referenceCenti;
      const exceeds = Math.abs(dev) > s.limitCenti;
      const key = s2sKey.get(s.id);
      if (!key && exceeds) {
        const k = `s2s:${s.id}:${r.rootId}`;
        s2sKey.set(s.id, k);
        s2sOnRemote.set(s.id, r.remote != null);
        raise({ key: k, kind: 'skin-to-skin-deviation', direction: dev > 0 ? 'warmer' : 'colder', raisedAt: r.takenAt, raisedByRootId: r.rootId });
      } else if (key && !exceeds && !(s2sOnRemote.get(s.id) && r.remote == null) && settled(key, 'skin-to-skin-deviation', r.takenAt)) {
        close(key, r.takenAt);
        s2sKey.delete(s.id);
      }
    }
  }
  advanceClocks(now);

  // Recheck clocks.
  let recheckDueAt: number | null = null;
  for (const f of open.values()) {
    const acts = actionsOn(f.key);
    if (acts.length === 0) continue;
    const last = acts[acts.length - 1].at;
    f.recheckDueAt = last + at(last).recheckMinutes * MIN;
    if (recheckDueAt == null || f.recheckDueAt < recheckDueAt) recheckDueAt = f.recheckDueAt;
  }
  const manualDueAt = mode === 'manual' ? manualDue() : null;
  const nextDueAt = Math.min(remoteDueAt, manualDueAt ?? Infinity, recheckDueAt ?? Infinity);
  const openFlags = [...open.values()].sort((a, b) => a.severityRank - b.severityRank || a.raisedAt - b.raisedAt);
  return { open: openFlags, closed, clocks: { remoteDueAt, manualDueAt, recheckDueAt, nextDueAt }, controlMode: mode };
}

/** "ok" / "due-soon" (within the window before due, inclusive) / "overdue" (strictly after). */
export function clockStatus(dueAt: number, now: number, dueSoonMinutes = 15): 'ok' | 'due-soon' | 'overdue' {
  if (now > dueAt) return 'overdue';
  if (now >= dueAt - dueSoonMinutes * MIN) return 'due-soon';
  return 'ok';
}

/**
 * Late checks in a range, each check judged by the settings in force at the previous check:
 * a check is late when it was taken after the due time set then. Settings changed later never
 * rewrite it.
 */
export function lateChecks(history: ModelHistory, now: number): { due: number; takenAt: number | null; late: boolean }[] {
  const remote = currentVersions(history.readings, now).filter((r) => r.remote != null && r.takenAt <= now);
  const out: { due: number; takenAt: number | null; late: boolean }[] = [];
  let prev = history.admittedAt;
  for (const r of remote) {
    const due = prev + settingsAt(history.settings, prev).checkIntervalMinutes * MIN;
    out.push({ due, takenAt: r.takenAt, late: r.takenAt > due });
    prev = r.takenAt;
  }
  return out;
}
