import type Database from 'better-sqlite3';
import { randomUUID } from 'node:crypto';
import type { Role } from '../../shared/roles';
import type { CreateUserInput, UpdateUserInput } from '../../shared/schemas/admin';
import type { AdminUnit, AdminUser } from '../../shared/types/admin';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { badRequest, conflict, forbidden, notFound } from '../errors';
import { eq } from 'drizzle-orm';
import type { Database_ } from '../../db/client';
import { units, userUnits, users } from '../../db/schema';
import { lastSignIns } from './admin-console';
import { revokeAllSessions } from './auth';
import { issueLink, type IssuedLink } from './email-links';

interface UserRow {
  id: string;
  name: string;
  email: string;
  role: Role;
  active: number;
  password_hash: string | null;
}

function unitsOf(sqlite: Database.Database, userId: string): string[] {
  return (sqlite.prepare('SELECT unit_id FROM user_units WHERE user_id = ? ORDER BY unit_id').all(userId) as Array<{ unit_id: string }>).map((r) => r.unit_id);
}

export function toAdminUser(sqlite: Database.Database, row: UserRow, now: number, adminUnits: readonly string[]): AdminUser {
  const invite = sqlite
    .prepare("SELECT expires_at FROM email_tokens WHERE user_id = ? AND kind = 'invite' AND used_at IS NULL AND expires_at > ? ORDER BY created_at DESC LIMIT 1")
    .get(row.id, now) as { expires_at: number } | undefined;
  const unitIds = unitsOf(sqlite, row.id);
  return {
    id: row.id,
    name: row.name,
    email: row.email,
    role: row.role,
    active: row.active === 1,
    unitIds,
    manageable: unitIds.every((u) => adminUnits.includes(u)),
    status: row.active !== 1 ? 'deactivated' : row.password_hash ? 'active' : 'invited',
    inviteExpiresAt: invite ? new Date(invite.expires_at).toISOString() : null,
  };
}

/** Users who share a unit with the admin, or belong to none yet. */
export function listUsers(ctx: AppContext, adminUnits: string[], search?: string): AdminUser[] {
  const { sqlite } = ctx.database;
  const rows = sqlite.prepare('SELECT id, name, email, role, active, password_hash FROM users ORDER BY name').all() as UserRow[];
  const now = ctx.clock.now().getTime();
  const needle = search?.trim().toLocaleLowerCase() ?? '';
  const listed = rows
    .filter((r) => !needle || r.name.toLocaleLowerCase().includes(needle) || r.email.toLocaleLowerCase().includes(needle))
    .map((r) => toAdminUser(sqlite, r, now, adminUnits))
    .filter((u) => u.unitIds.length === 0 || u.unitIds.some((id) => adminUnits.includes(id)));
  const signIns = lastSignIns(ctx, listed.map((u) => u.id));
  return listed.map((u) => ({ ...u, lastSignInAt: signIns.get(u.id) ?? null }));
}

function assertUnits(adminUnits: string[], unitIds: string[]): void {
  const outside = unitIds.filter((u) => !adminUnits.includes(u));
  if (outside.length) throw forbidden('You can only place people in your own units.');
}

function assertUnitsExist(sqlite: Database.Database, unitIds: string[]): void {
  for (const id of unitIds) {
    if (!sqlite.prepare('SELECT 1 FROM units WHERE id = ?').get(id)) throw badRequest('Unknown unit.', { unitIds: `No unit ${id}.` });
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

function loadUser(ctx: AppContext, userId: string, adminUnits: string[]): UserRow {
  assertManageable(ctx.database, userId, adminUnits);
  return ctx.database.sqlite.prepare('SELECT id, name, email, role, active, password_hash FROM users WHERE id = ?').get(userId) as UserRow;
}

/**
 * Create an account without a password and an invitation link for it, in one transaction.
 * The caller mails the link after commit.
 */
export function createUserRows(ctx: AppContext, sqlite: Database.Database, input: CreateUserInput, actorId: string): { user: UserRow; link: IssuedLink } {
  const now = ctx.clock.now();
  const id = randomUUID();
  sqlite
    .prepare('INSERT INTO users (id, email, name, role, password_hash, active, session_version, created_at, updated_at) VALUES (?, ?, ?, ?, NULL, 1, 1, ?, ?)')
    .run(id, input.email, input.name, input.role, now.getTime(), now.getTime());
  const member = sqlite.prepare('INSERT INTO user_units (user_id, unit_id) VALUES (?, ?)');
  for (const unitId of new Set(input.unitIds)) member.run(id, unitId);
  appendAudit(sqlite, { at: now, actorId, action: 'user-created', entityType: 'user', entityId: id, unitId: input.unitIds[0] ?? null, after: { email: input.email, name: input.name, role: input.role, unitIds: input.unitIds } });
  const link = issueLink(ctx, sqlite, id, 'invite', actorId);
  return { user: { id, name: input.name, email: input.email, role: input.role, active: 1, password_hash: null }, link };
}

export function createUser(ctx: AppContext, input: CreateUserInput, admin: { userId: string; unitIds: string[] }): { user: AdminUser; link: IssuedLink } {
  const { sqlite } = ctx.database;
  assertUnits(admin.unitIds, input.unitIds);
  assertUnitsExist(sqlite, input.unitIds);
  return sqlite
    .transaction(() => {
      if (sqlite.prepare('SELECT 1 FROM users WHERE email = ?').get(input.email)) throw conflict('Someone already has that e-mail.', { email: 'An account with this e-mail exists.' });
      const { user, link } = createUserRows(ctx, sqlite, input, admin.userId);
      return { user: toAdminUser(sqlite, user, ctx.clock.now().getTime(), admin.unitIds), link };
    })
    .immediate();
}

/** Role or unit changes end the person's sessions, so the change holds from their next request. */
export function updateUser(ctx: AppContext, userId: string, input: UpdateUserInput, admin: { userId: string; unitIds: string[] }): AdminUser {
  const { sqlite } = ctx.database;
  const before = loadUser(ctx, userId, admin.unitIds);
  if (userId === admin.userId && (input.role !== undefined || input.unitIds !== undefined)) {
    throw badRequest('You cannot change your own role or units.', { role: 'Ask another administrator to change your own role or units.' });
  }
  if (input.unitIds) {
    assertUnits(admin.unitIds, input.unitIds);
    assertUnitsExist(sqlite, input.unitIds);
  }
  const now = ctx.clock.now();
  sqlite
    .transaction(() => {
      const beforeUnits = unitsOf(sqlite, userId);
      const roleChanged = input.role !== undefined && input.role !== before.role;
      const unitsChanged = input.unitIds !== undefined && [...new Set(input.unitIds)].sort().join() !== beforeUnits.join();
      if (input.name !== undefined) sqlite.prepare('UPDATE users SET name = ?, updated_at = ? WHERE id = ?').run(input.name, now.getTime(), userId);
      if (roleChanged) sqlite.prepare('UPDATE users SET role = ?, updated_at = ? WHERE id = ?').run(input.role, now.getTime(), userId);
      if (unitsChanged) {
        sqlite.prepare('DELETE FROM user_units WHERE user_id = ?').run(userId);
        const member = sqlite.prepare('INSERT INTO user_units (user_id, unit_id) VALUES (?, ?)');
        for (const unitId of new Set(input.unitIds)) member.run(userId, unitId);
      }
      if (roleChanged || unitsChanged) {
        sqlite.prepare('UPDATE users SET session_version = session_version + 1 WHERE id = ?').run(userId);
        revokeAllSessions(ctx, userId);
      }
      appendAudit(sqlite, {
        at: now, actorId: admin.userId, action: 'user-updated', entityType: 'user', entityId: userId, unitId: null,
        before: { name: before.name, role: before.role, unitIds: beforeUnits },
        after: { name: input.name ?? before.name, role: input.role ?? before.role, unitIds: unitsOf(sqlite, userId) },
      });
    })
    .immediate();
  return toAdminUser(sqlite, sqlite.prepare('SELECT id, name, email, role, active, password_hash FROM users WHERE id = ?').get(userId) as UserRow, now.getTime(), admin.unitIds);
}

/** Accounts are never deleted: deactivation ends every session and blocks sign-in. */
export function setUserActive(ctx: AppContext, userId: string, active: boolean, admin: { userId: string; unitIds: string[] }): AdminUser {
  const { sqlite } = ctx.database;
  const before = loadUser(ctx, userId, admin.unitIds);
  if (userId === admin.userId) throw badRequest('You cannot deactivate yourself.', { _: 'Ask another administrator.' });
  const now = ctx.clock.now();
  sqlite
    .transaction(() => {
      sqlite.prepare('UPDATE users SET active = ?, session_version = session_version + 1, updated_at = ? WHERE id = ?').run(active ? 1 : 0, now.getTime(), userId);
      revokeAllSessions(ctx, userId);
      if (!active) sqlite.prepare('UPDATE email_tokens SET used_at = ? WHERE user_id = ? AND used_at IS NULL').run(now.getTime(), userId);
      appendAudit(sqlite, { at: now, actorId: admin.userId, action: active ? 'user-reactivated' : 'user-deactivated', entityType: 'user', entityId: userId, unitId: null, before: { active: before.active === 1 }, after: { active } });
    })
    .immediate();
  return toAdminUser(sqlite, { ...before, active: active ? 1 : 0 }, now.getTime(), admin.unitIds);
}

/** A new invitation (no password yet) or a reset link (has one). */
export function sendLinkFor(ctx: AppContext, userId: string, kind: 'invite' | 'reset', admin: { userId: string; unitIds: string[] }): IssuedLink {
  const { sqlite } = ctx.database;
  const user = loadUser(ctx, userId, admin.unitIds);
  if (user.active !== 1) throw conflict('This account is deactivated; reactivate it first.');
  if (kind === 'invite' && user.password_hash) throw conflict('This person has already set a password; send a reset link instead.');
  if (kind === 'reset' && !user.password_hash) throw conflict('This person has not accepted the invitation yet; send the invitation again.');
  return sqlite.transaction(() => issueLink(ctx, sqlite, userId, kind, admin.userId)).immediate();
}

interface UnitDbRow {
  id: string; name: string; hospital_name: string; time_zone: string; check_interval_minutes: number; due_soon_minutes: number;
  gap_limit_centi: number; escalation_delay_minutes: number; day_shift_start: string; night_shift_start: string;
}

export function listUnits(ctx: AppContext, unitIds: string[]): AdminUnit[] {
  const { sqlite } = ctx.database;
  const rows = sqlite.prepare('SELECT * FROM units ORDER BY name').all() as UnitDbRow[];
  return rows
    .filter((u) => unitIds.includes(u.id))
    .map((u) => ({
      id: u.id, name: u.name, hospitalName: u.hospital_name, timeZone: u.time_zone, checkIntervalMinutes: u.check_interval_minutes,
      dueSoonMinutes: u.due_soon_minutes, gapLimitCenti: u.gap_limit_centi, escalationDelayMinutes: u.escalation_delay_minutes,
      dayShiftStart: u.day_shift_start, nightShiftStart: u.night_shift_start,
      beds: (sqlite.prepare('SELECT id, label, active FROM beds WHERE unit_id = ? ORDER BY sort_order, label').all(u.id) as Array<{ id: string; label: string; active: number }>).map((b) => ({ id: b.id, label: b.label, active: b.active === 1 })),
    }));
}
