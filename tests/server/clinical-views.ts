/**
 * A ward driven over HTTP for the clinical tests: admits infants to beds of their own, charts
 * through the real routes, and reads every view of an infant's open flags and check clocks in
 * one normal form, so the tests can compare the views with each other and with the reference
 * model. It keeps a reference-model history of what it charted.
 */
import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { settingsAt, type ControlMode, type ModelHistory, type ModelReading, type ModelSettings, type ModelState } from '../reference/thermal-model';
import { DEMO, type TestEnv } from './helpers';

export type Who = 'nurse' | 'charge' | 'educator' | 'admin';
const EMAIL: Record<Who, string> = { nurse: DEMO.nurse, charge: DEMO.charge, educator: DEMO.educator, admin: DEMO.admin };
export const NURSE_ID = 'u-nurse';
export const UNIT = 'unit-north';

/** One view's account of an infant: open flags and clocks, as far as the view tells them. */
export interface ViewState {
  view: string;
  flags: {
    id: string;
    kind: string;
    severity?: string;
    band?: string | null;
    escalated?: boolean;
    unearnedEscalated?: boolean;
    /** The severities its escalations went out at, oldest first (when the view says). */
    escalationSeverities?: string[];
  }[];
  next?: { clock: string; dueAt: string } | null;
  remoteDueAt?: string | null;
  manualDueAt?: string | null;
  recheckDueAt?: string | null;
  /** The view may carry no severity (then compare kinds and bands only). */
  severityOptional?: boolean;
}

export interface Typed {
  unit?: 'C' | 'F';
  probe?: number | null;
  remote?: number | null;
  remoteSite?: 'axilla' | 'rectal' | 'other' | null;
  controlMode?: ControlMode | null;
  heaterOutputPct?: number | null;
  heartRate?: number | null;
  heatSigns?: string[];
  set?: number | null;
  air?: number | null;
  confirmedImplausible?: boolean;
}

const centi = (v: number | null | undefined, unit: 'C' | 'F' = 'C') => (v == null ? null : unit === 'C' ? Math.round(v * 100) : Math.round(((v - 32) * 500) / 9));

export class Ward {
  private tokens: Partial<Record<Who, string>> = {};
  private beds = 0;
  /** Reference-model history per infant. */
  readonly histories = new Map<string, ModelHistory>();
  /** The unit's settings versions this ward made (shared by every history: settings are per unit). */
  readonly settings: ModelSettings[] = [];

  constructor(readonly env: TestEnv) {}

  now(): number {
    return this.env.clock.now().getTime();
  }

  private async token(who: Who, fresh = false): Promise<string> {
    if (fresh || !this.tokens[who]) this.tokens[who] = await this.env.signIn(EMAIL[who]);
    return this.tokens[who]!;
  }

  /** A request as someone, signing in again if the clock has aged the session. */
  async call(who: Who, method: 'get' | 'post' | 'patch', path: string, body?: object): Promise<request.Response> {
    const send = async (fresh: boolean) => {
      const req = request(this.env.app)
        [method](`/api${path}`)
        .set({ Authorization: `Bearer ${await this.token(who, fresh)}` });
      return body ? req.send(body) : req;
    };
    const res = await send(false);
    return res.status === 401 ? send(true) : res;
  }

  async ok(who: Who, method: 'get' | 'post' | 'patch', path: string, body?: object, status = [200, 201]): Promise<request.Response> {
    const res = await this.call(who, method, path, body);
    if (!status.includes(res.status)) throw new Error(`${method.toUpperCase()} ${path} → ${res.status} ${JSON.stringify(res.body)}`);
    return res;
  }

  /** Admit an infant to a new bed of the north unit, assigned to the demo nurse. */
  async admit(controlMode: ControlMode = 'skin-servo'): Promise<string> {
    this.beds += 1;
    const label = `T${String(this.beds).padStart(3, '0')}-${randomUUID().slice(0, 4)}`;
    const bed = await this.ok('admin', 'post', `/admin/units/${UNIT}/beds`, { label });
    const admitted = await this.ok('charge', 'post', `/units/${UNIT}/infants`, {
      bedId: bed.body.bed.id,
      displayName: `Baby Test ${this.beds}`,
      birthAt: new Date(this.now() - 36 * 3600_000).toISOString(),
      gestationWeeks: 34,
      gestationDays: 2,
      birthWeightGrams: 2100,
      heatSource: 'radiant-warmer',
      controlMode,
      setTemperature: 36.5,
    });
    const id = admitted.body.infant.id as string;
    this.histories.set(id, { admittedAt: this.now(), admissionControlMode: controlMode, readings: [], actions: [], sessions: [], settings: this.settings });
    await this.assign(id);
    // The admission charts the initial settings at this instant; chart after it.
    this.advance(1);
    return id;
  }

  async assign(infantId: string): Promise<void> {
    await this.ok('charge', 'post', `/units/${UNIT}/assignments`, { infantId, nurseId: NURSE_ID });
  }

  async discharge(infantId: string): Promise<void> {
    await this.ok('charge', 'post', `/infants/${infantId}/discharge`, { reason: 'home' });
  }

  /** Chart a reading now, or taken earlier (a late entry). Answers the stored reading's body. */
  async chart(infantId: string, typed: Typed, takenAt?: number): Promise<request.Response> {
    const id = randomUUID();
    const unit = typed.unit ?? 'C';
    const body: Record<string, unknown> = { id, unit, ...typed };
    if (typed.remote != null && !typed.remoteSite) body.remoteSite = 'axilla';
    if (takenAt != null) {
      body.takenAt = new Date(takenAt).toISOString();
      if (this.now() - takenAt > 10 * 60_000) body.lateReason = 'Charted after the event.';
    }
    const res = await this.ok('nurse', 'post', `/infants/${infantId}/readings`, body);
    const h = this.histories.get(infantId);
    if (h) {
      const r: ModelReading = {
        id,
        recordedAt: this.now(),
        takenAt: takenAt ?? this.now(),
        probe: centi(typed.probe, unit),
        remote: centi(typed.remote, unit),
        controlMode: typed.controlMode ?? null,
        heaterOutputPct: typed.heaterOutputPct ?? null,
        heartRate: typed.heartRate ?? null,
        heatSigns: typed.heatSigns ?? [],
      };
      h.readings.push(r);
    }
    return res;
  }

  /** A correction: new values, or entered in error (no values). */
  async correct(infantId: string, readingId: string, typed: Typed | 'entered-in-error'): Promise<request.Response> {
    const id = randomUUID();
    const h = this.histories.get(infantId)!;
    const old = h.readings.find((r) => r.id === readingId)!;
    const body =
      typed === 'entered-in-error'
        ? { id, reason: 'entered-in-error', note: 'Charted on the wrong infant.' }
        : {
            id,
            reason: 'corrected-value',
            note: 'Typed the wrong value.',
            values: { unit: 'C', ...typed, ...(typed.remote != null && !typed.remoteSite ? { remoteSite: 'axilla' } : {}) },
          };
    const res = await this.ok('nurse', 'post', `/readings/${readingId}/corrections`, body);
    h.readings.push(
      typed === 'entered-in-error'
        ? { id, replacesId: readingId, recordedAt: this.now(), takenAt: old.takenAt, enteredInError: true }
        : {
            id,
            replacesId: readingId,
            recordedAt: this.now(),
            takenAt: old.takenAt,
            probe: centi(typed.probe),
            remote: centi(typed.remote),
            controlMode: typed.controlMode ?? null,
            heaterOutputPct: typed.heaterOutputPct ?? null,
            heartRate: typed.heartRate ?? null,
            heatSigns: typed.heatSigns ?? [],
          },
    );
    return res;
  }

  /** Record an action on a stored flag; `modelKey` ties it to the reference model's flag. */
  async act(infantId: string, flagId: string, modelKey: string, kind = 'checked-probe-contact'): Promise<request.Response> {
    const res = await this.ok('nurse', 'post', `/flags/${flagId}/actions`, { id: randomUUID(), kind });
    this.histories.get(infantId)?.actions.push({ flagKey: modelKey, at: this.now() });
    return res;
  }

  async startSession(infantId: string, reference: number, limitCenti: 50 | 100): Promise<string> {
    const id = randomUUID();
    await this.ok('nurse', 'post', `/infants/${infantId}/skin-to-skin`, { id, unit: 'C', reference, limitCenti, carer: 'Parent' });
    this.histories.get(infantId)?.sessions.push({ id, startedAt: this.now(), endedAt: null, referenceCenti: centi(reference)!, limitCenti });
    return id;
  }

  async endSession(infantId: string, sessionId: string): Promise<void> {
    await this.ok('nurse', 'post', `/skin-to-skin/${sessionId}/end`, {});
    const s = this.histories.get(infantId)?.sessions.find((x) => x.id === sessionId);
    if (s) s.endedAt = this.now();
  }

  /** Change the unit's check interval now: a new settings version, in force from now. */
  async setCheckInterval(minutes: number): Promise<void> {
    await this.ok('admin', 'patch', `/admin/units/${UNIT}`, { checkIntervalMinutes: minutes });
    const { effectiveFrom: _, ...current } = settingsAt(this.settings, this.now());
    this.settings.push({ ...current, effectiveFrom: this.now(), checkIntervalMinutes: minutes });
  }

  advance(minutes: number): void {
    this.env.clock.advanceMinutes(minutes);
  }

  // ------------------------------------------------------------------------------------------
  // Views
  // ------------------------------------------------------------------------------------------

  async board(): Promise<Record<string, any>> {
    return (await this.ok('charge', 'get', `/units/${UNIT}/board`)).body;
  }

  /** The raw answers of the board (and the infant's bed), My infants, infant detail and the flowsheet. */
  async summaries(infantId: string): Promise<{ board: any; bed: any; mine: any; detail: any; sheet: any }> {
    await this.assign(infantId);
    const board = await this.board();
    const bed = board.beds.find((b: any) => b.infant?.id === infantId);
    const mine = (await this.ok('nurse', 'get', '/infants/mine')).body.infants.find((i: any) => i.id === infantId);
    const detail = (await this.ok('nurse', 'get', `/infants/${infantId}`)).body.infant;
    const sheet = (await this.ok('nurse', 'get', `/infants/${infantId}/flowsheet?hours=72`)).body;
    return { board, bed, mine, detail, sheet };
  }

  /** Every view's account of one infant. */
  async views(infantId: string): Promise<ViewState[]> {
    const { bed, mine, detail, sheet } = await this.summaries(infantId);
    const handover = (await this.ok('nurse', 'get', `/infants/${infantId}/handover`)).body.infants[0];
    const queue = await this.queueItems(infantId);
    const out: ViewState[] = [
      fromSummary('board', bed?.infant),
      fromSummary('my infants', mine),
      fromSummary('infant detail', detail),
      fromSummary('flowsheet header', sheet.infant),
      {
        view: 'flowsheet flags',
        flags: (sheet.flags ?? []).filter((f: any) => f.status === 'open').map(flagOf),
        ...clocksOf(sheet.checks),
      },
      {
        view: 'handover',
        flags: (handover?.flags ?? []).filter((f: any) => f.closedAt == null && !f.withdrawn && f.status !== 'withdrawn').map(flagOf),
        ...clocksOf(handover?.checks),
      },
      // The queue is the educator's list: it names each flag's kind; severity where it gives one.
      {
        view: 'review queue',
        flags: queue.filter((i: any) => i.closedAt == null && !i.withdrawn && i.status !== 'withdrawn').map((i: any) => flagOf({ ...i, id: i.flagId })),
        severityOptional: true,
      },
    ];
    return out;
  }

  private async queueItems(infantId: string): Promise<any[]> {
    const items: any[] = [];
    let cursor: string | null = null;
    do {
      const q: string = `/review/queue?infantId=${infantId}${cursor ? `&cursor=${cursor}` : ''}`;
      const body: any = (await this.ok('educator', 'get', q)).body;
      items.push(...body.items);
      cursor = body.nextCursor;
    } while (cursor);
    return items;
  }
}

function flagOf(f: any): ViewState['flags'][number] {
  const told = f.escalation != null && Array.isArray(f.escalation.to) && f.escalation.to.length > 0;
  const sent: any[] = f.escalation ? [...(f.escalation.earlier ?? []), f.escalation] : [];
  return {
    id: f.id,
    kind: f.kind,
    severity: f.severity,
    band: f.band ?? f.detail?.band ?? null,
    escalated: typeof f.escalated === 'boolean' ? f.escalated : undefined,
    unearnedEscalated: f.escalated === true && !told,
    escalationSeverities: sent.length > 0 && sent.every((e) => typeof e.severity === 'string') ? sent.map((e) => e.severity) : undefined,
  };
}

function clocksOf(checks: any): Omit<ViewState, 'view' | 'flags'> {
  if (!checks) return { next: null };
  const rechecks: { dueAt: string }[] = checks.rechecks ?? [];
  return {
    next: checks.next ? { clock: checks.next.clock, dueAt: checks.next.dueAt } : null,
    remoteDueAt: checks.remote?.dueAt ?? null,
    manualDueAt: checks.manual?.dueAt ?? null,
    recheckDueAt: rechecks.map((r) => r.dueAt).sort()[0] ?? null,
  };
}

function fromSummary(view: string, infant: any): ViewState {
  if (!infant) return { view, flags: [], next: null };
  return { view, flags: (infant.openFlags ?? []).map(flagOf), ...clocksOf(infant.checks) };
}

/** A view's flags sorted, for comparing sets. */
export function flagSet(v: ViewState): string[] {
  return v.flags.map((f) => `${f.kind}|${f.severity ?? '?'}|${f.band ?? ''}`).sort();
}

/** What the reference model says of an infant now, in the views' normal form. */
export function modelView(ward: Ward, infantId: string, evaluate: (h: ModelHistory, now: number) => ModelState): ViewState {
  const state = evaluate(ward.histories.get(infantId)!, ward.now());
  const iso = (t: number | null) => (t == null ? null : new Date(t).toISOString());
  return {
    view: 'reference model',
    // After a sweep at `now`: escalated at its current severity once open longer than that
    // severity's delay since it reached it (a worsening starts a new escalation).
    flags: state.open.map((f) => ({
      id: f.key,
      kind: f.kind,
      severity: f.severity,
      band: f.kind === 'cold-stress' ? f.band! : null,
      escalated: f.escalateAfter != null && ward.now() > f.escalateAfter,
    })),
    next: {
      clock: state.clocks.nextDueAt === state.clocks.recheckDueAt ? 'recheck' : state.clocks.nextDueAt === state.clocks.manualDueAt ? 'manual' : 'remote',
      dueAt: iso(state.clocks.nextDueAt)!,
    },
    remoteDueAt: iso(state.clocks.remoteDueAt),
    manualDueAt: iso(state.clocks.manualDueAt),
    recheckDueAt: iso(state.clocks.recheckDueAt),
  };
}

/** The differences between a view and the model, as readable lines (empty when they agree). */
export function differences(view: ViewState, model: ViewState, escalationsSwept = false): string[] {
  const out: string[] = [];
  const a = flagSet(view);
  // A view that names no band says the band through the severity (critical, urgent, caution).
  const noBand = view.flags.every((f) => !f.band);
  const noSeverity = view.severityOptional && view.flags.every((f) => f.severity === undefined);
  const b = flagSet({ ...model, flags: model.flags.map((f) => ({ ...f, band: noBand ? null : f.band, severity: noSeverity ? undefined : f.severity })) });
  if (JSON.stringify(a) !== JSON.stringify(b)) out.push(`${view.view}: open flags ${JSON.stringify(a)}, model ${JSON.stringify(b)}`);
  for (const f of view.flags) if (f.unearnedEscalated) out.push(`${view.view}: ${f.kind} says escalated, but names nobody who was told`);
  // A flag escalates once per severity, each time to a worse one (common practice).
  const RANK: Record<string, number> = { caution: 1, urgent: 2, critical: 3 };
  for (const f of view.flags) {
    const s = f.escalationSeverities ?? [];
    if (s.some((x, i) => i > 0 && RANK[x]! <= RANK[s[i - 1]!]!)) out.push(`${view.view}: ${f.kind} escalated at ${s.join(', ')}: again without worsening`);
  }
  if (escalationsSwept) {
    for (const f of view.flags) {
      const same = model.flags.filter((m) => m.kind === f.kind);
      if (f.escalated === undefined || same.length !== 1 || view.flags.filter((x) => x.kind === f.kind).length !== 1) continue;
      if (f.escalated !== same[0].escalated) out.push(`${view.view}: ${f.kind} escalated ${f.escalated}, model ${same[0].escalated}`);
      // The model says escalated at the current severity: the latest escalation is at it.
      const last = f.escalationSeverities?.[f.escalationSeverities.length - 1];
      if (same[0].escalated && last !== undefined && f.severity !== undefined && last !== f.severity) {
        out.push(`${view.view}: ${f.kind} is ${f.severity} but last escalated at ${last}; the model says told at its current severity`);
      }
    }
  }
  if (view.next !== undefined) {
    for (const k of ['remoteDueAt', 'manualDueAt', 'recheckDueAt'] as const) {
      if (view[k] !== model[k]) out.push(`${view.view}: ${k} ${view[k]}, model ${model[k]}`);
    }
    if (view.next?.dueAt !== model.next?.dueAt) out.push(`${view.view}: next check ${JSON.stringify(view.next)}, model ${JSON.stringify(model.next)}`);
  }
  return out;
}
