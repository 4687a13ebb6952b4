import { randomUUID } from 'node:crypto';
import { and, asc, desc, eq, inArray, isNull, lt, ne } from 'drizzle-orm';
import { writeTx, type Db } from '../../db/client';
import { assignments, beds, escalations, flagEvents, flagResolutions, flags, infants, units, userUnits, users } from '../../db/schema';
import { shiftAt } from '../../shared/shifts';
import {
  escalationDelayOf,
  severityClassOf,
  severityOf,
  SEVERITY_RANK,
  SEVERITY_WORDS,
  type FlagKind,
  type Severity,
  type SeverityClass,
  type UnitPolicy,
} from '../../shared/thermal';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { conflict, notFound } from '../errors';
import { appendFlagEvent, dbOf, loadPolicyVersions, readClocks, type StoredOpenFlag } from './flag-lifecycle';
import { loadUnitRow, policyAt, syncFlags, type SyncResult } from './flags';

export interface EscalationRun {
  /** Escalations created by this run. */
  created: string[];
  /** Escalations whose e-mail this run sent. */
  mailed: string[];
}

interface Pending {
  id: string;
  flag_id: string;
  infant_id: string;
  unit_id: string;
  kind: FlagKind;
  severity: Severity;
  detail: unknown;
  raised_at: number;
  escalated_at: number;
  display_name: string;
  bed_label: string | null;
  time_zone: string;
  /** The escalation of the same flag before this one, when it has worsened since. */
  previous: { severity: Severity; escalated_at: number } | null;
}

const WHAT: Record<SeverityClass, { subject: string; line: string }> = {
  gap: { subject: 'probe and remote site still apart', line: 'a gap flag (probe and remote-site temperatures more than the unit limit apart) is still unresolved' },
  'overdue-check': { subject: 'remote-site check overdue', line: 'the remote-site temperature check is overdue and has not been recorded' },
  'severe-hypothermia': { subject: 'severe hypothermia', line: 'a remote-site temperature below 32.0 °C (severe hypothermia) was charted; tell the medical team per unit policy' },
  'moderate-hypothermia': {
    subject: 'moderate hypothermia',
    line: 'a remote-site temperature of 32.0–35.9 °C (moderate hypothermia) is still unresolved; tell the medical team per unit policy',
  },
  'cold-stress': { subject: 'cold stress', line: 'a remote-site temperature of 36.0–36.4 °C (cold stress) is still unresolved' },
  fever: {
    subject: 'fever',
    line: 'a remote-site temperature of 38.0 °C or over (fever) was charted; in a newborn this may mean infection: tell the medical team per unit policy',
  },
  'heat-stress': { subject: 'heat stress', line: 'a heat-stress prompt (signs, a remote site above the normal band or a fast heart rate) is still unresolved' },
  'manual-mode': { subject: 'manual mode beyond its limit', line: 'the heater is in manual mode beyond its limit (high output too long, or no check within 15 minutes)' },
  'skin-to-skin-deviation': {
    subject: 'skin-to-skin temperature outside the limit',
    line: 'a temperature during skin-to-skin care is outside the session limit and still unresolved',
  },
};

/**
 * Bring every admitted infant's stored flags up to date, so time-based flags (overdue checks,
 * manual mode) exist as rows. Each infant is synced from its restart point (the evaluation a
 * write would run), one short transaction per infant, so the sweep never holds the write lock for
 * a whole unit's stays.
 */
export function syncAdmittedInfants(ctx: AppContext, now: Date): void {
  const { sqlite } = ctx.database;
  const ids = dbOf(sqlite).select({ id: infants.id }).from(infants).where(eq(infants.status, 'admitted')).all();
  for (const { id } of ids) {
    writeTx(sqlite, () => syncFlags(sqlite, id, now, null, { from: now.getTime() }));
  }
}

/**
 * The instant an open flag reached its current severity as its lifecycle records it: its raising
 * or its last severity change (the clocks' own record of the last evaluation comes first).
 */
function severitySince(db: Db, flagId: string, fallback: Date): Date {
  const row = db
    .select({ at: flagEvents.at, createdAt: flagEvents.createdAt })
    .from(flagEvents)
    .where(and(eq(flagEvents.flagId, flagId), inArray(flagEvents.event, ['raised', 'severity-changed'])))
    .orderBy(desc(flagEvents.createdAt))
    .limit(1)
    .get();
  if (!row) return fallback;
  // Both at the clinical instant: the raising or worsening reading's taken time.
  return row.at;
}

/**
 * The severity an escalation was sent at. Rows from before escalations recorded it carry none:
 * they went out at the severity the flag was raised with (flags that worsened had no lifecycle
 * events then).
 */
function escalatedSeverity(row: { severity: Severity | null; flagSeverity: Severity | null; kind: FlagKind; detail: string }): Severity {
  return row.severity ?? row.flagSeverity ?? severityOf(row.kind, JSON.parse(row.detail));
}

/**
 * Escalate every open flag that has stayed open past its class's delay (shared/thermal/severity.ts:
 * at once for the most severe, after the unit's delay for the urgent ones, never for mild cold
 * stress unless the unit says so), then e-mail each escalation not yet sent to its recipient: the
 * charge nurse(s) assigned on the unit's current shift, else the unit's fallback address, else
 * every charge nurse of the unit. The escalation records whom it reached, when and how.
 *
 * A flag escalates once per severity: again only when it worsens past the severity it last
 * escalated at (moderate to severe hypothermia), after the new class's delay counted from the
 * worsening; a flag that stays as it was is never told twice (common practice). The row is unique
 * per flag and severity (INSERT OR IGNORE), and a mail is claimed by setting mailed_at in a write
 * transaction before it is sent, so a second run, in this process or another, finds nothing to
 * send. A failed send releases the claim for the next run.
 */
export async function runEscalations(ctx: AppContext, now: Date, opts: { syncFirst?: boolean } = {}): Promise<EscalationRun> {
  const { sqlite } = ctx.database;
  const db = dbOf(sqlite);
  if (opts.syncFirst !== false) syncAdmittedInfants(ctx, now);

  const created = writeTx(sqlite, () => {
    const candidates = db
      .select({ flagId: flags.id, unitId: flags.unitId, kind: flags.kind, raisedAt: flags.raisedAt, infantId: flags.infantId, detail: flags.detail, flagSeverity: flags.severity })
      .from(flags)
      .innerJoin(infants, eq(infants.id, flags.infantId))
      .leftJoin(flagResolutions, eq(flagResolutions.flagId, flags.id))
      .where(and(isNull(flagResolutions.flagId), eq(infants.status, 'admitted')))
      .all();
    // The severities each open flag has already escalated at.
    const told = new Map<string, Severity[]>();
    if (candidates.length > 0) {
      const sent = db
        .select({ flagId: escalations.flagId, severity: escalations.severity, flagSeverity: flags.severity, kind: flags.kind, detail: flags.detail })
        .from(escalations)
        .innerJoin(flags, eq(flags.id, escalations.flagId))
        .innerJoin(infants, eq(infants.id, flags.infantId))
        .leftJoin(flagResolutions, eq(flagResolutions.flagId, flags.id))
        .where(and(isNull(flagResolutions.flagId), eq(infants.status, 'admitted')))
        .all();
      for (const e of sent) told.set(e.flagId, [...(told.get(e.flagId) ?? []), escalatedSeverity(e)]);
    }
    const policies = new Map<string, UnitPolicy>();
    const clocks = new Map<string, Map<string, StoredOpenFlag>>();
    const ids: string[] = [];
    for (const c of candidates) {
      let policy = policies.get(c.unitId);
      if (!policy) {
        const unit = loadUnitRow(sqlite, c.unitId)!;
        policy = policyAt(unit, loadPolicyVersions(db, c.unitId), now.getTime()).policy;
        policies.set(c.unitId, policy);
      }
      let open = clocks.get(c.infantId);
      if (!open) {
        const row = readClocks(db, c.infantId);
        open = new Map((row ? (JSON.parse(row.openFlags) as StoredOpenFlag[]) : []).map((f) => [f.flagId, f]));
        clocks.set(c.infantId, open);
      }
      const detail = open.get(c.flagId)?.detail ?? JSON.parse(c.detail);
      const severity = severityOf(c.kind, detail);
      const before = told.get(c.flagId) ?? [];
      // Told already at this severity or a worse one: nothing new to say.
      if (before.some((s) => SEVERITY_RANK[s] >= SEVERITY_RANK[severity])) continue;
      const cls = severityClassOf(c.kind, detail);
      const delay = escalationDelayOf(cls, policy);
      if (delay === null) continue;
      const seen = open.get(c.flagId)?.severitySince;
      const waited = now.getTime() - (seen ? new Date(seen) : severitySince(db, c.flagId, c.raisedAt)).getTime();
      // "More than" the delay; a delay of zero escalates at once.
      if (delay === 0 ? waited < 0 : waited <= delay * 60_000) continue;
      const id = randomUUID();
      const inserted = db.insert(escalations).values({ id, flagId: c.flagId, unitId: c.unitId, escalatedAt: now, severity }).onConflictDoNothing().run();
      if (inserted.changes !== 1) continue;
      appendAudit(sqlite, {
        at: now,
        actorId: null,
        action: 'escalation-raised',
        entityType: 'escalation',
        entityId: id,
        unitId: c.unitId,
        after: {
          flagId: c.flagId,
          kind: c.kind,
          severity,
          infantId: c.infantId,
          raisedAt: c.raisedAt.toISOString(),
          ...(before.length ? { worsenedFrom: before[before.length - 1] } : {}),
        },
      });
      ids.push(id);
    }
    return ids;
  });

  const pending = db
    .select({
      id: escalations.id,
      flag_id: flags.id,
      infant_id: flags.infantId,
      unit_id: escalations.unitId,
      kind: flags.kind,
      severity: escalations.severity,
      detail: flags.detail,
      raised_at: flags.raisedAt,
      escalated_at: escalations.escalatedAt,
      display_name: infants.displayName,
      bed_label: beds.label,
      time_zone: units.timeZone,
    })
    .from(escalations)
    .innerJoin(flags, eq(flags.id, escalations.flagId))
    .innerJoin(infants, eq(infants.id, flags.infantId))
    .innerJoin(units, eq(units.id, escalations.unitId))
    .leftJoin(beds, eq(beds.id, infants.bedId))
    .leftJoin(flagResolutions, eq(flagResolutions.flagId, flags.id))
    .where(and(isNull(escalations.mailedAt), isNull(flagResolutions.flagId)))
    .orderBy(asc(escalations.escalatedAt))
    .all()
    .map((p): Pending => {
      const seen = readClocks(db, p.infant_id);
      const live = seen ? (JSON.parse(seen.openFlags) as StoredOpenFlag[]).find((f) => f.flagId === p.flag_id) : undefined;
      const previous = db
        .select({ severity: escalations.severity, escalatedAt: escalations.escalatedAt, flagSeverity: flags.severity, kind: flags.kind, detail: flags.detail })
        .from(escalations)
        .innerJoin(flags, eq(flags.id, escalations.flagId))
        .where(and(eq(escalations.flagId, p.flag_id), ne(escalations.id, p.id), lt(escalations.escalatedAt, p.escalated_at)))
        .orderBy(desc(escalations.escalatedAt))
        .limit(1)
        .get();
      return {
        ...p,
        previous: previous ? { severity: escalatedSeverity(previous), escalated_at: previous.escalatedAt.getTime() } : null,
        severity: p.severity ?? 'urgent',
        detail: live?.detail ?? JSON.parse(p.detail),
        raised_at: p.raised_at.getTime(),
        escalated_at: p.escalated_at.getTime(),
      };
    });

  const mailed: string[] = [];
  for (const p of pending) {
    const to = escalationRecipients(ctx, p.unit_id, now);
    if (to.length === 0) continue;
    const claimed = writeTx(
      sqlite,
      () =>
        db
          .update(escalations)
          .set({ mailedAt: now, recipient: JSON.stringify(to), channel: 'email' })
          .where(and(eq(escalations.id, p.id), isNull(escalations.mailedAt)))
          .run().changes === 1,
    );
    if (!claimed) continue;
    try {
      await ctx.mailer.send({ to: to.map((r) => r.email), ...escalationMail(p, now, ctx.config.publicUrl) });
      writeTx(sqlite, () => {
        appendAudit(sqlite, {
          at: now,
          actorId: null,
          action: 'escalation-mailed',
          entityType: 'escalation',
          entityId: p.id,
          unitId: p.unit_id,
          after: { to: to.map((r) => r.email) },
        });
        appendFlagEvent(db, {
          flagId: p.flag_id,
          infantId: p.infant_id,
          unitId: p.unit_id,
          event: 'escalated',
          at: now,
          severity: p.severity,
          detail: { escalationId: p.id, to, how: 'email' },
          now,
        });
      });
      mailed.push(p.id);
    } catch (err) {
      writeTx(sqlite, () => db.update(escalations).set({ mailedAt: null, recipient: null, channel: null }).where(eq(escalations.id, p.id)).run());
      ctx.log(`escalation ${p.id}: the e-mail could not be sent (${err instanceof Error ? err.message : String(err)}); it will be tried again.`);
    }
  }
  return { created, mailed };
}

export interface Recipient {
  userId: string | null;
  name: string | null;
  email: string;
}

/**
 * Who an escalation goes to: the unit's charge nurse(s) assigned on the current shift; else the
 * fallback address the administrator set for the unit; else every active charge nurse of the unit.
 */
export function escalationRecipients(ctx: AppContext, unitId: string, now: Date): Recipient[] {
  const db = dbOf(ctx.database.sqlite);
  const unit = db.select().from(units).where(eq(units.id, unitId)).get();
  if (!unit) return [];
  const slot = shiftAt(now, { dayShiftStart: unit.dayShiftStart, nightShiftStart: unit.nightShiftStart, timeZone: unit.timeZone });
  const onShift = db
    .selectDistinct({ userId: users.id, name: users.name, email: users.email })
    .from(assignments)
    .innerJoin(users, eq(users.id, assignments.nurseId))
    .where(and(eq(assignments.unitId, unitId), eq(assignments.shiftDate, slot.shiftDate), eq(assignments.shift, slot.shift), eq(users.role, 'charge'), eq(users.active, true)))
    .orderBy(asc(users.email))
    .all();
  if (onShift.length > 0) return onShift;
  if (unit.escalationFallbackEmail) return [{ userId: null, name: null, email: unit.escalationFallbackEmail }];
  return db
    .select({ userId: users.id, name: users.name, email: users.email })
    .from(users)
    .innerJoin(userUnits, eq(userUnits.userId, users.id))
    .where(and(eq(userUnits.unitId, unitId), eq(users.role, 'charge'), eq(users.active, true)))
    .orderBy(asc(users.email))
    .all();
}

function localTime(ms: number, timeZone: string): string {
  return new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', day: 'numeric', month: 'short', hour12: false }).format(new Date(ms));
}

/** Only what the charge nurse needs to act: bed, display name, what, how serious, since when. */
export function escalationMail(p: Pending, now: Date, publicUrl: string): { subject: string; text: string } {
  const bed = p.bed_label ?? 'no bed';
  const minutes = Math.max(0, Math.floor((now.getTime() - p.raised_at) / 60_000));
  const what = WHAT[severityClassOf(p.kind, p.detail)];
  return {
    subject: `Warmfold escalation: bed ${bed}, ${what.subject}${p.previous ? ', worse' : ''}`,
    text: [
      `Bed ${bed}, ${p.display_name}: ${what.line}.`,
      ...(p.previous ? [`It has worsened since the escalation at ${localTime(p.previous.escalated_at, p.time_zone)} (then: ${SEVERITY_WORDS[p.previous.severity]}).`] : []),
      `Severity: ${SEVERITY_WORDS[p.severity]}. Open since ${localTime(p.raised_at, p.time_zone)} (${p.time_zone}), ${minutes} minutes ago.`,
      '',
      `Please look at the board and acknowledge the escalation there: ${publicUrl}/board`,
      '',
      'Warmfold supports your judgment; follow unit policy, the device instructions and licensed practice.',
    ].join('\n'),
  };
}

export interface Acknowledged {
  id: string;
  acknowledgedAt: string;
  acknowledgedBy: string;
  note: string | null;
}

/** Record the charge nurse's acknowledgement; a second acknowledgement is a conflict. */
export function acknowledgeEscalation(
  ctx: AppContext,
  escalationId: string,
  actor: { userId: string; unitIds: string[] },
  note: string | null,
  assertUnit: (unitId: string) => void,
): Acknowledged {
  const { sqlite } = ctx.database;
  const now = ctx.clock.now();
  const db = dbOf(sqlite);
  return writeTx(sqlite, () => {
    const row = db
      .select({
        id: escalations.id,
        unitId: escalations.unitId,
        acknowledgedAt: escalations.acknowledgedAt,
        flagId: escalations.flagId,
        infantId: flags.infantId,
        severity: escalations.severity,
      })
      .from(escalations)
      .innerJoin(flags, eq(flags.id, escalations.flagId))
      .where(eq(escalations.id, escalationId))
      .get();
    if (!row) throw notFound('That escalation');
    assertUnit(row.unitId);
    // Only this escalation: an earlier or later one of the same flag keeps its own acknowledgement.
    if (row.acknowledgedAt !== null) throw conflict('This escalation has already been acknowledged.');
    db.update(escalations).set({ acknowledgedAt: now, acknowledgedBy: actor.userId, acknowledgeNote: note }).where(eq(escalations.id, row.id)).run();
    appendAudit(sqlite, {
      at: now,
      actorId: actor.userId,
      action: 'escalation-acknowledged',
      entityType: 'escalation',
      entityId: row.id,
      unitId: row.unitId,
      before: { acknowledgedAt: null },
      after: { acknowledgedAt: now.toISOString(), note },
    });
    appendFlagEvent(db, {
      flagId: row.flagId,
      infantId: row.infantId,
      unitId: row.unitId,
      event: 'acknowledged',
      at: now,
      actorId: actor.userId,
      severity: row.severity,
      detail: { escalationId: row.id, note },
      now,
    });
    return { id: row.id, acknowledgedAt: now.toISOString(), acknowledgedBy: actor.userId, note };
  });
}

/**
 * Right after a write that raised a flag, or made an open one worse, has committed: escalate what
 * is due at once (a zero delay: the most severe classes by default) without waiting for the next
 * minute's sweep. The escalation row is written before this returns; the mail goes out in the
 * background (a failure is left for the sweep, which sends what is not yet sent). Takes the
 * write's sync result (or the raised flag ids alone).
 */
export function escalateAfterWrite(ctx: AppContext, now: Date, changed: readonly string[] | Pick<SyncResult, 'raised' | 'worsened'>): void {
  const ids = 'raised' in changed ? [...changed.raised, ...changed.worsened] : changed;
  if (ids.length === 0) return;
  runEscalations(ctx, now, { syncFirst: false }).catch(() => undefined);
}
