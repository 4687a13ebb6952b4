import { randomUUID } from 'node:crypto';
import { and, desc, eq, gt, inArray, isNull } from 'drizzle-orm';
import type { CreateUserInput, UpdateUserInput } from '../../shared/schemas/admin';
import type { AdminUnit, AdminUser } from '../../shared/types/admin';
import type { Database_, Db } from '../../db/client';
import { beds, emailTokens, units, userUnits, users } from '../../db/schema';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { badRequest, conflict, forbidden, notFound } from '../errors';
import { lastSignIns } from './admin-console';
import { nextSessionVersion, revokeAllSessions } from './auth';
import { issueLink, type IssuedLink } from './email-links';

/** What the administration screens show of an account. */
type UserRow = Pick<typeof users.$inferSelect, 'id' | 'name' | 'email' | 'role' | 'active' | 'passwordHash'>;

const userColumns = { id: users.id, name: users.name, email: users.email, role: users.role, active: users.active, passwordHash: users.passwordHash };

function unitsOf(db: Db, userId: string): string[] {
  return db
    .select({ unitId: userUnits.unitId })
    .from(userUnits)
    .where(eq(userUnits.userId, userId))
    .orderBy(userUnits.unitId)
    .all()
    .map((r) => r.unitId);
}

export function toAdminUser(db: Db, row: UserRow, now: Date, adminUnits: readonly string[]): AdminUser {
  const invite = db
    .select({ expiresAt: emailTokens.expiresAt })
    .from(emailTokens)
    .where(and(eq(emailTokens.userId, row.id), eq(emailTokens.kind, 'invite'), isNull(emailTokens.usedAt), gt(emailTokens.expiresAt, now)))
    .orderBy(desc(emailTokens.createdAt))
    .limit(1)
    .get();
  const unitIds = unitsOf(db, row.id);
  return {
    id: row.id,
    name: row.name,
    email: row.email,
    role: row.role,
    active: row.active,
    unitIds,
    manageable: unitIds.every((u) => adminUnits.includes(u)),
    status: !row.active ? 'deactivated' : row.passwordHash ? 'active' : 'invited',
    inviteExpiresAt: invite ? invite.expiresAt.toISOString() : null,
  };
}

/** Users who share a unit with the admin, or belong to none yet. */
export function listUsers(ctx: AppContext, adminUnits: string[], search?: string): AdminUser[] {
  const { db } = ctx.database;
  const rows = db.select(userColumns).from(users).orderBy(users.name).all();
  const now = ctx.clock.now();
  const needle = search?.trim().toLocaleLowerCase() ?? '';
  const listed = rows
    .filter((r) => !needle || r.name.toLocaleLowerCase().includes(needle) || r.email.toLocaleLowerCase().includes(needle))
    .map((r) => toAdminUser(db, r, now, adminUnits))
    .filter((u) => u.unitIds.length === 0 || u.unitIds.some((id) => adminUnits.includes(id)));
  const signIns = lastSignIns(
    ctx,
    listed.map((u) => u.id),
  );
  return listed.map((u) => ({ ...u, lastSignInAt: signIns.get(u.id) ?? null }));
}

function assertUnits(adminUnits: string[], unitIds: string[]): void {
  const outside = unitIds.filter((u) => !adminUnits.includes(u));
  if (outside.length) throw forbidden('You can only place people in your own units.');
}

function assertUnitsExist(db: Db, unitIds: string[]): void {
  if (unitIds.length === 0) return;
  const known = new Set(
    db
      .select({ id: units.id })
      .from(units)
      .where(inArray(units.id, unitIds))
      .all()
      .map((u) => u.id),
  );
  for (const id of unitIds) {
    if (!known.has(id)) throw badRequest('Unknown unit.', { unitIds: `No unit ${id}.` });
  }
}

/**
 * An administrator acts only inside their units: a person who also works in a unit the admin does
 * not administer can be seen (they share a unit) but not changed, since a new role, unit or status,
 * or a reset link, would act in that other unit too. Someone in no unit yet can be placed. Throws
 * 404 for an unknown person and 403 naming the reason otherwise.
 */
export function assertManageable(database: Database_, userId: string, adminUnits: readonly string[]): void {
  const person = database.db.select({ name: users.name }).from(users).where(eq(users.id, userId)).get();
  if (!person) throw notFound('That user');
  const memberships = database.db
    .select({ id: units.id, name: units.name })
    .from(userUnits)
    .innerJoin(units, eq(units.id, userUnits.unitId))
    .where(eq(userUnits.userId, userId))
    .orderBy(units.name)
    .all();
  const outside = memberships.filter((u) => !adminUnits.includes(u.id));
  if (outside.length === 0) return;
  if (outside.length === memberships.length) throw forbidden('That person works in a unit you do not administer.');
  throw forbidden(
    `${person.name} also works in ${outside.map((u) => u.name).join(' and ')}, which you do not administer. ` +
      'Only an administrator of every unit a person works in can change their role, units or status or send them a link.',
  );
}

/**
 * Whether an e-mail address has an account, and whether the administrator may be told: yes when
 * the account works in one of their units or in none yet; an account only in other units is not
 * revealed (the roster preview shows it as it shows a new address).
 */
export function accountFor(database: Database_, email: string, adminUnits: readonly string[]): { exists: boolean; visible: boolean } {
  const account = database.db.select({ id: users.id }).from(users).where(eq(users.email, email)).get();
  if (!account) return { exists: false, visible: false };
  const memberships = database.db.select({ unitId: userUnits.unitId }).from(userUnits).where(eq(userUnits.userId, account.id)).all();
  return { exists: true, visible: memberships.length === 0 || memberships.some((m) => adminUnits.includes(m.unitId)) };
}

function readUser(db: Db, userId: string): UserRow {
  const user = db.select(userColumns).from(users).where(eq(users.id, userId)).get();
  if (!user) throw notFound('That user');
  return user;
}

function loadUser(ctx: AppContext, userId: string, adminUnits: string[]): UserRow {
  assertManageable(ctx.database, userId, adminUnits);
  return readUser(ctx.database.db, userId);
}

/**
 * Create an account without a password and an invitation link for it. Call inside a write
 * transaction; the caller mails the link after commit.
 */
export function createUserRows(ctx: AppContext, input: CreateUserInput, actorId: string): { user: UserRow; link: IssuedLink } {
  const { db, sqlite } = ctx.database;
  const now = ctx.clock.now();
  const id = randomUUID();
  db.insert(users)
    .values({ id, email: input.email, name: input.name, role: input.role, passwordHash: null, active: true, sessionVersion: 1, createdAt: now, updatedAt: now })
    .run();
  for (const unitId of new Set(input.unitIds)) db.insert(userUnits).values({ userId: id, unitId }).run();
  appendAudit(sqlite, {
    at: now,
    actorId,
    action: 'user-created',
    entityType: 'user',
    entityId: id,
    unitId: input.unitIds[0] ?? null,
    after: { email: input.email, name: input.name, role: input.role, unitIds: input.unitIds },
  });
  const link = issueLink(ctx, id, 'invite', actorId);
  return { user: { id, name: input.name, email: input.email, role: input.role, active: true, passwordHash: null }, link };
}

export function createUser(ctx: AppContext, input: CreateUserInput, admin: { userId: string; unitIds: string[] }): { user: AdminUser; link: IssuedLink } {
  const { db } = ctx.database;
  assertUnits(admin.unitIds, input.unitIds);
  assertUnitsExist(db, input.unitIds);
  return db.transaction(
    (tx) => {
      if (tx.select({ id: users.id }).from(users).where(eq(users.email, input.email)).get())
        throw conflict('Someone already has that e-mail.', { email: 'An account with this e-mail exists.' });
      const { user, link } = createUserRows(ctx, input, admin.userId);
      return { user: toAdminUser(db, user, ctx.clock.now(), admin.unitIds), link };
    },
    { behavior: 'immediate' },
  );
}

/** Role or unit changes end the person's sessions, so the change holds from their next request. */
export function updateUser(ctx: AppContext, userId: string, input: UpdateUserInput, admin: { userId: string; unitIds: string[] }): AdminUser {
  const { db, sqlite } = ctx.database;
  const before = loadUser(ctx, userId, admin.unitIds);
  if (userId === admin.userId && (input.role !== undefined || input.unitIds !== undefined)) {
    throw badRequest('You cannot change your own role or units.', { role: 'Ask another administrator to change your own role or units.' });
  }
  if (input.unitIds) {
    assertUnits(admin.unitIds, input.unitIds);
    assertUnitsExist(db, input.unitIds);
  }
  const now = ctx.clock.now();
  db.transaction(
    (tx) => {
      const beforeUnits = unitsOf(tx, userId);
      const roleChanged = input.role !== undefined && input.role !== before.role;
      const unitsChanged = input.unitIds !== undefined && [...new Set(input.unitIds)].sort().join() !== beforeUnits.join();
      if (input.name !== undefined) tx.update(users).set({ name: input.name, updatedAt: now }).where(eq(users.id, userId)).run();
      if (roleChanged) tx.update(users).set({ role: input.role, updatedAt: now }).where(eq(users.id, userId)).run();
      if (unitsChanged) {
        tx.delete(userUnits).where(eq(userUnits.userId, userId)).run();
        for (const unitId of new Set(input.unitIds)) tx.insert(userUnits).values({ userId, unitId }).run();
      }
      if (roleChanged || unitsChanged) {
        tx.update(users).set({ sessionVersion: nextSessionVersion }).where(eq(users.id, userId)).run();
        revokeAllSessions(ctx, userId);
      }
      appendAudit(sqlite, {
        at: now,
        actorId: admin.userId,
        action: 'user-updated',
        entityType: 'user',
        entityId: userId,
        unitId: null,
        before: { name: before.name, role: before.role, unitIds: beforeUnits },
        after: { name: input.name ?? before.name, role: input.role ?? before.role, unitIds: unitsOf(tx, userId) },
      });
    },
    { behavior: 'immediate' },
  );
  return toAdminUser(db, readUser(db, userId), now, admin.unitIds);
}

/** Accounts are never deleted: deactivation ends every session and blocks sign-in. */
export function setUserActive(ctx: AppContext, userId: string, active: boolean, admin: { userId: string; unitIds: string[] }): AdminUser {
  const { db, sqlite } = ctx.database;
  const before = loadUser(ctx, userId, admin.unitIds);
  if (userId === admin.userId) throw badRequest('You cannot deactivate yourself.', { _: 'Ask another administrator.' });
  const now = ctx.clock.now();
  db.transaction(
    (tx) => {
      tx.update(users).set({ active, sessionVersion: nextSessionVersion, updatedAt: now }).where(eq(users.id, userId)).run();
      revokeAllSessions(ctx, userId);
      if (!active)
        tx.update(emailTokens)
          .set({ usedAt: now })
          .where(and(eq(emailTokens.userId, userId), isNull(emailTokens.usedAt)))
          .run();
      appendAudit(sqlite, {
        at: now,
        actorId: admin.userId,
        action: active ? 'user-reactivated' : 'user-deactivated',
        entityType: 'user',
        entityId: userId,
        unitId: null,
        before: { active: before.active },
        after: { active },
      });
    },
    { behavior: 'immediate' },
  );
  return toAdminUser(db, { ...before, active }, now, admin.unitIds);
}

/** A new invitation (no password yet) or a reset link (has one). */
export function sendLinkFor(ctx: AppContext, userId: string, kind: 'invite' | 'reset', admin: { userId: string; unitIds: string[] }): IssuedLink {
  const user = loadUser(ctx, userId, admin.unitIds);
  if (!user.active) throw conflict('This account is deactivated; reactivate it first.');
  if (kind === 'invite' && user.passwordHash) throw conflict('This person has already set a password; send a reset link instead.');
  if (kind === 'reset' && !user.passwordHash) throw conflict('This person has not accepted the invitation yet; send the invitation again.');
  return ctx.database.db.transaction(() => issueLink(ctx, userId, kind, admin.userId), { behavior: 'immediate' });
}

export function listUnits(ctx: AppContext, unitIds: string[]): AdminUnit[] {
  const { db } = ctx.database;
  if (unitIds.length === 0) return [];
  const rows = db
    .select({
      id: units.id,
      name: units.name,
      hospitalName: units.hospitalName,
      timeZone: units.timeZone,
      checkIntervalMinutes: units.checkIntervalMinutes,
      dueSoonMinutes: units.dueSoonMinutes,
      gapLimitCenti: units.gapLimitCenti,
      escalationDelayMinutes: units.escalationDelayMinutes,
      dayShiftStart: units.dayShiftStart,
      nightShiftStart: units.nightShiftStart,
    })
    .from(units)
    .where(inArray(units.id, unitIds))
    .orderBy(units.name)
    .all();
  return rows.map((u) => ({
    ...u,
    beds: db.select({ id: beds.id, label: beds.label, active: beds.active }).from(beds).where(eq(beds.unitId, u.id)).orderBy(beds.sortOrder, beds.label).all(),
  }));
}
