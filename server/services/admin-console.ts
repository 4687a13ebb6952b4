import { randomUUID } from 'node:crypto';
import { and, desc, eq, gte, inArray, lt, lte, max, notLike, or } from 'drizzle-orm';
import type { AuditQuery, CreateUnitInput, UnitSettingsInput, UpdateBedInput } from '../../shared/schemas/admin';
import type { AuditEntry, AuditPage } from '../../shared/types/admin';
import { auditEvents, authSessions, beds, infants, units, userUnits, users } from '../../db/schema';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { badRequest, conflict, forbidden, notFound } from '../errors';
import { nextSessionVersion, revokeAllSessions } from './auth';
import { recordUnitSettingsChange } from './flag-lifecycle';
import { policyForUnit } from './flags';

type Admin = { userId: string; unitIds: string[] };

const membershipsOf = (ctx: AppContext, userId: string): string[] =>
  ctx.database.db
    .select({ unitId: userUnits.unitId })
    .from(userUnits)
    .where(eq(userUnits.userId, userId))
    .orderBy(userUnits.unitId)
    .all()
    .map((r) => r.unitId);

function assertAdminUnit(ctx: AppContext, admin: Admin, unitId: string): void {
  if (!ctx.database.db.select({ id: units.id }).from(units).where(eq(units.id, unitId)).get()) throw notFound('That unit');
  if (!admin.unitIds.includes(unitId)) throw forbidden('You can only place people in your own units.');
}

/**
 * Add or remove one unit membership, leaving the others as they are; a person keeps at least one
 * unit (deactivate them instead). The person's sessions end, so the new access holds from their
 * next sign-in. The route's access rule has already checked that the administrator administers
 * every unit the person works in.
 */
function changeMembership(ctx: AppContext, userId: string, unitId: string, admin: Admin, op: 'add' | 'remove'): string[] {
  assertAdminUnit(ctx, admin, unitId);
  if (userId === admin.userId) throw badRequest('You cannot change your own units.', { unitId: 'Ask another administrator to change your own units.' });
  const { sqlite, db } = ctx.database;
  return db.transaction(
    (tx) => {
      const before = membershipsOf(ctx, userId);
      if (op === 'add') {
        if (before.includes(unitId)) throw conflict('This person already works in that unit.', { unitId: 'Already a member of this unit.' });
        tx.insert(userUnits).values({ userId, unitId }).run();
      } else {
        if (!before.includes(unitId)) throw notFound('That membership');
        if (before.length === 1) throw conflict('This is the only unit this person works in; deactivate the account instead.', { unitId: 'A person keeps at least one unit.' });
        tx.delete(userUnits)
          .where(and(eq(userUnits.userId, userId), eq(userUnits.unitId, unitId)))
          .run();
      }
      tx.update(users).set({ sessionVersion: nextSessionVersion, updatedAt: ctx.clock.now() }).where(eq(users.id, userId)).run();
      revokeAllSessions(ctx, userId);
      const after = membershipsOf(ctx, userId);
      appendAudit(sqlite, {
        at: ctx.clock.now(),
        actorId: admin.userId,
        action: op === 'add' ? 'membership-added' : 'membership-removed',
        entityType: 'user',
        entityId: userId,
        unitId,
        before: { unitIds: before },
        after: { unitIds: after },
      });
      return after;
    },
    { behavior: 'immediate' },
  );
}

export const addMembership = (ctx: AppContext, userId: string, unitId: string, admin: Admin) => changeMembership(ctx, userId, unitId, admin, 'add');
export const removeMembership = (ctx: AppContext, userId: string, unitId: string, admin: Admin) => changeMembership(ctx, userId, unitId, admin, 'remove');

/** A new unit with the default settings; the administrator who creates it administers it. */
export function createUnit(ctx: AppContext, input: CreateUnitInput, admin: Admin): { id: string } {
  const { sqlite, db } = ctx.database;
  const id = randomUUID();
  db.transaction(
    (tx) => {
      if (tx.select({ id: units.id }).from(units).where(eq(units.name, input.name)).get())
        throw conflict('A unit with that name exists.', { name: 'A unit with this name exists.' });
      tx.insert(units).values({ id, name: input.name, hospitalName: input.hospitalName, timeZone: input.timeZone, createdAt: ctx.clock.now() }).run();
      tx.insert(userUnits).values({ userId: admin.userId, unitId: id }).run();
      appendAudit(sqlite, { at: ctx.clock.now(), actorId: admin.userId, action: 'unit-created', entityType: 'unit', entityId: id, unitId: id, after: input });
    },
    { behavior: 'immediate' },
  );
  return { id };
}

/** A unit's stored row (404 when there is none): the settings a partial change is checked against. */
export function unitSettingsOf(ctx: AppContext, unitId: string): typeof units.$inferSelect {
  const unit = ctx.database.db.select().from(units).where(eq(units.id, unitId)).get();
  if (!unit) throw notFound('That unit');
  return unit;
}

/**
 * Change a unit's settings (already checked, each field and across fields). Settings are versions:
 * earlier judgements keep the settings in force when they were made.
 */
export function updateUnitSettings(ctx: AppContext, unitId: string, input: UnitSettingsInput, admin: { userId: string }): void {
  const { db, sqlite } = ctx.database;
  // Settings the unit row has no column for live only in the settings versions.
  const { escalationDelays, recheckSettleMinutes, ...columns } = input;
  const changed = Object.values(columns).some((v) => v !== undefined);
  db.transaction(
    (tx) => {
      const before = unitSettingsOf(ctx, unitId);
      if (changed) tx.update(units).set(columns).where(eq(units.id, unitId)).run();
      const after = unitSettingsOf(ctx, unitId);
      recordUnitSettingsChange(sqlite, unitId, policyForUnit(before), policyForUnit(after), admin.userId, ctx.clock.now(), { escalationDelays, recheckSettleMinutes });
      appendAudit(sqlite, { at: ctx.clock.now(), actorId: admin.userId, action: 'unit-settings', entityType: 'unit', entityId: unitId, unitId, before, after: input });
    },
    { behavior: 'immediate' },
  );
}

/** A new bed at the end of the unit's order; labels are unique within a unit. */
export function createBed(ctx: AppContext, unitId: string, label: string, admin: { userId: string }): { id: string; label: string; active: boolean } {
  const { db, sqlite } = ctx.database;
  const id = randomUUID();
  db.transaction(
    (tx) => {
      if (
        tx
          .select({ id: beds.id })
          .from(beds)
          .where(and(eq(beds.unitId, unitId), eq(beds.label, label)))
          .get()
      )
        throw conflict('That bed label is taken.', { label: 'This unit already has a bed with this label.' });
      const last = tx
        .select({ n: max(beds.sortOrder) })
        .from(beds)
        .where(eq(beds.unitId, unitId))
        .get();
      tx.insert(beds)
        .values({ id, unitId, label, sortOrder: (last?.n ?? 0) + 1, active: true })
        .run();
      appendAudit(sqlite, { at: ctx.clock.now(), actorId: admin.userId, action: 'bed-created', entityType: 'bed', entityId: id, unitId, after: { label } });
    },
    { behavior: 'immediate' },
  );
  return { id, label, active: true };
}

/**
 * Rename a bed, take it out of use (or back) or move it up or down the unit's order. Moving swaps
 * its place with its neighbour's, so the order stays a sequence.
 */
export function updateBed(ctx: AppContext, bedId: string, input: UpdateBedInput, admin: Admin) {
  const { sqlite, db } = ctx.database;
  const bed = db.select().from(beds).where(eq(beds.id, bedId)).get();
  if (!bed) throw notFound('That bed');
  if (!admin.unitIds.includes(bed.unitId)) throw forbidden('This record belongs to a unit you are not part of.');
  if (
    input.active === false &&
    db
      .select({ id: infants.id })
      .from(infants)
      .where(and(eq(infants.bedId, bedId), eq(infants.status, 'admitted')))
      .get()
  ) {
    throw conflict('An infant is in this bed; move the infant first.', { active: 'An infant is in this bed.' });
  }
  return db.transaction(
    (tx) => {
      if (input.label !== undefined && input.label !== bed.label) {
        if (
          tx
            .select({ id: beds.id })
            .from(beds)
            .where(and(eq(beds.unitId, bed.unitId), eq(beds.label, input.label)))
            .get()
        ) {
          throw conflict(`Bed ${input.label}: this unit already has a bed with this label.`, { label: 'This unit already has a bed with this label.' });
        }
      }
      const set: Partial<typeof beds.$inferInsert> = {};
      if (input.label !== undefined) set.label = input.label;
      if (input.active !== undefined) set.active = input.active;
      if (Object.keys(set).length) tx.update(beds).set(set).where(eq(beds.id, bedId)).run();
      if (input.move) {
        const ordered = tx.select({ id: beds.id, sortOrder: beds.sortOrder }).from(beds).where(eq(beds.unitId, bed.unitId)).orderBy(beds.sortOrder, beds.label).all();
        const at = ordered.findIndex((b) => b.id === bedId);
        const to = input.move === 'up' ? at - 1 : at + 1;
        if (to < 0 || to >= ordered.length)
          throw badRequest(`Bed ${bed.label} is already ${input.move === 'up' ? 'first' : 'last'}.`, {
            move: `Bed ${bed.label} is already ${input.move === 'up' ? 'first' : 'last'}.`,
          });
        [ordered[at], ordered[to]] = [ordered[to]!, ordered[at]!];
        // Renumber the whole unit 1..n so equal or missing orders never leave a move without effect.
        ordered.forEach((b, i) => {
          if (b.sortOrder !== i + 1)
            tx.update(beds)
              .set({ sortOrder: i + 1 })
              .where(eq(beds.id, b.id))
              .run();
        });
      }
      const after = tx.select().from(beds).where(eq(beds.id, bedId)).get()!;
      appendAudit(sqlite, {
        at: ctx.clock.now(),
        actorId: admin.userId,
        action: 'bed-updated',
        entityType: 'bed',
        entityId: bedId,
        unitId: bed.unitId,
        before: { label: bed.label, active: bed.active, sortOrder: bed.sortOrder },
        after: { label: after.label, active: after.active, sortOrder: after.sortOrder },
      });
      return { id: after.id, label: after.label, active: after.active };
    },
    { behavior: 'immediate' },
  );
}

/** Each person's latest sign-in (a session's start), by user id. */
export function lastSignIns(ctx: AppContext, userIds: string[]): Map<string, string> {
  if (userIds.length === 0) return new Map();
  const rows = ctx.database.db
    .select({ userId: authSessions.userId, at: max(authSessions.createdAt) })
    .from(authSessions)
    .where(inArray(authSessions.userId, userIds))
    .groupBy(authSessions.userId)
    .all();
  return new Map(rows.flatMap((r) => (r.at ? [[r.userId, r.at.toISOString()] as const] : [])));
}

/** Keys never shown in the audit viewer, whatever an event holds. */
const SECRET_KEY = /password|token|secret|hash|jti|cookie/i;

function redact(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(redact);
  if (value && typeof value === 'object') {
    return Object.fromEntries(
      Object.entries(value as Record<string, unknown>)
        .filter(([k]) => !SECRET_KEY.test(k))
        .map(([k, v]) => [k, redact(v)]),
    );
  }
  return value;
}

const parsed = (text: string | null): unknown => {
  if (text === null) return null;
  try {
    return redact(JSON.parse(text));
  } catch {
    return null;
  }
};

/**
 * The audit log of the administrator's units, newest first: events recorded against one of their
 * units, and changes to people all of whose units they administer. The row ledger's own events
 * (hashes) are left out. Paged by the event id: `cursor` is the last id of the page before.
 */
export function auditLog(ctx: AppContext, query: AuditQuery, admin: Admin): AuditPage {
  const { db } = ctx.database;
  if (admin.unitIds.length === 0) return { events: [], nextCursor: null };
  const people = db.select({ userId: userUnits.userId, unitId: userUnits.unitId }).from(userUnits).all();
  const byUser = new Map<string, string[]>();
  for (const p of people) byUser.set(p.userId, [...(byUser.get(p.userId) ?? []), p.unitId]);
  const manageable = [...byUser].filter(([, list]) => list.every((u) => admin.unitIds.includes(u))).map(([id]) => id);
  const scope = or(inArray(auditEvents.unitId, admin.unitIds), and(eq(auditEvents.entityType, 'user'), inArray(auditEvents.entityId, manageable.length ? manageable : [''])));
  const limit = query.limit ?? 50;
  const rows = db
    .select({
      id: auditEvents.id,
      at: auditEvents.at,
      actorId: auditEvents.actorId,
      actorName: users.name,
      action: auditEvents.action,
      entityType: auditEvents.entityType,
      entityId: auditEvents.entityId,
      unitId: auditEvents.unitId,
      unitName: units.name,
      before: auditEvents.before,
      after: auditEvents.after,
    })
    .from(auditEvents)
    .leftJoin(users, eq(users.id, auditEvents.actorId))
    .leftJoin(units, eq(units.id, auditEvents.unitId))
    .where(
      and(
        scope,
        notLike(auditEvents.action, 'row-%'),
        notLike(auditEvents.action, 'ledger-%'),
        query.actorId ? eq(auditEvents.actorId, query.actorId) : undefined,
        query.from ? gte(auditEvents.at, new Date(query.from)) : undefined,
        query.to ? lte(auditEvents.at, new Date(query.to)) : undefined,
        query.cursor ? lt(auditEvents.id, query.cursor) : undefined,
      ),
    )
    .orderBy(desc(auditEvents.id))
    .limit(limit + 1)
    .all();
  const page = rows.slice(0, limit);
  const events: AuditEntry[] = page.map((r) => ({
    id: r.id,
    at: r.at.toISOString(),
    actorId: r.actorId,
    actorName: r.actorName ?? null,
    action: r.action,
    entityType: r.entityType,
    entityId: r.entityId,
    unitId: r.unitId,
    unitName: r.unitName ?? null,
    before: parsed(r.before),
    after: parsed(r.after),
  }));
  return { events, nextCursor: rows.length > limit ? page[page.length - 1]!.id : null };
}
