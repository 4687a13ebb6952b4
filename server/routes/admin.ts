import { bedActiveSchema, createBedSchema, createUserSchema, unitSettingsSchema, updateUserSchema, type CreateBedInput, type CreateUserInput, type UnitSettingsInput, type UpdateUserInput } from '../../shared/schemas/admin';
import { randomUUID } from 'node:crypto';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { badRequest, conflict, notFound } from '../errors';
import { allow, assertUnit, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import { createUser, listUnits, listUsers, sendLinkFor, setUserActive, updateUser } from '../services/admin-users';
import { sendWeeklyDigests } from '../services/digest';
import { mailLinkSafely } from '../services/email-links';
import { recordUnitSettingsChange } from '../services/flag-lifecycle';
import { loadUnitRow, policyForUnit, type UnitRow } from '../services/flags';

const SETTING_COLUMNS: Record<string, string> = {
  name: 'name',
  checkIntervalMinutes: 'check_interval_minutes',
  dueSoonMinutes: 'due_soon_minutes',
  gapLimitCenti: 'gap_limit_centi',
  escalationDelayMinutes: 'escalation_delay_minutes',
  dayShiftStart: 'day_shift_start',
  nightShiftStart: 'night_shift_start',
  timeZone: 'time_zone',
  escalationFallbackEmail: 'escalation_fallback_email',
};

/** Users, invitations, units, beds and settings: the administrator's. Admins never chart. */
export function adminRouter(ctx: AppContext) {
  const router = secureRouter();
  const id = (req: { params: unknown }, name = 'id') => (req.params as Record<string, string>)[name]!;

  router.get('/admin/users', allow(ctx, 'admin:manage'), (req, res) => {
    res.json({ users: listUsers(ctx, req.auth!.unitIds) });
  });

  router.post('/admin/users', allow(ctx, 'admin:manage'), validate('body', createUserSchema), async (req, res) => {
    const { user, link } = createUser(ctx, valid<CreateUserInput>(req, 'body'), req.auth!);
    const mailed = await mailLinkSafely(ctx, link);
    res.status(201).json({ user, mailed });
  });

  router.patch('/admin/users/:id', allow(ctx, 'admin:manage'), validate('body', updateUserSchema), (req, res) => {
    res.json({ user: updateUser(ctx, id(req), valid<UpdateUserInput>(req, 'body'), req.auth!) });
  });

  router.post('/admin/users/:id/deactivate', allow(ctx, 'admin:manage'), (req, res) => {
    res.json({ user: setUserActive(ctx, id(req), false, req.auth!) });
  });

  router.post('/admin/users/:id/reactivate', allow(ctx, 'admin:manage'), (req, res) => {
    res.json({ user: setUserActive(ctx, id(req), true, req.auth!) });
  });

  router.post('/admin/users/:id/invitation', allow(ctx, 'admin:manage'), async (req, res) => {
    const link = sendLinkFor(ctx, id(req), 'invite', req.auth!);
    res.status(202).json({ mailed: await mailLinkSafely(ctx, link), expiresAt: link.expiresAt.toISOString() });
  });

  router.post('/admin/users/:id/password-reset', allow(ctx, 'admin:manage'), async (req, res) => {
    const link = sendLinkFor(ctx, id(req), 'reset', req.auth!);
    res.status(202).json({ mailed: await mailLinkSafely(ctx, link), expiresAt: link.expiresAt.toISOString() });
  });

  router.get('/admin/units', allow(ctx, 'admin:manage'), (req, res) => {
    res.json({ units: listUnits(ctx, req.auth!.unitIds) });
  });

  router.patch('/admin/units/:id', allow(ctx, 'admin:manage'), validate('body', unitSettingsSchema), (req, res) => {
    const unitId = id(req);
    const { sqlite } = ctx.database;
    const before = sqlite.prepare('SELECT * FROM units WHERE id = ?').get(unitId) as Record<string, unknown> | undefined;
    if (!before) throw notFound('That unit');
    assertUnit(req, unitId);
    const input = valid<UnitSettingsInput>(req, 'body');
    const day = input.dayShiftStart ?? (before.day_shift_start as string);
    const night = input.nightShiftStart ?? (before.night_shift_start as string);
    if (day >= night) throw badRequest('The night shift must start later in the day than the day shift.', { nightShiftStart: 'Must be later than the day shift start.' });
    // Settings the unit row has no column for live only in the settings versions.
    const { escalationDelays, recheckSettleMinutes, ...columns } = input;
    const entries = Object.entries(columns).filter(([, v]) => v !== undefined);
    sqlite
      .transaction(() => {
        if (entries.length) sqlite.prepare(`UPDATE units SET ${entries.map(([k]) => `${SETTING_COLUMNS[k]} = ?`).join(', ')} WHERE id = ?`).run(...entries.map(([, v]) => v as string | number | null), unitId);
        // Settings are versions: earlier judgements keep the settings in force when they were made.
        const after = loadUnitRow(sqlite, unitId)!;
        recordUnitSettingsChange(sqlite, unitId, policyForUnit(before as unknown as UnitRow), policyForUnit(after), req.auth!.userId, ctx.clock.now(), { escalationDelays, recheckSettleMinutes });
        appendAudit(sqlite, { at: ctx.clock.now(), actorId: req.auth!.userId, action: 'unit-settings', entityType: 'unit', entityId: unitId, unitId, before, after: input });
      })
      .immediate();
    res.json({ unit: listUnits(ctx, [unitId])[0] });
  });

  router.post('/admin/units/:id/beds', allow(ctx, 'admin:manage'), validate('body', createBedSchema), (req, res) => {
    const unitId = id(req);
    const { sqlite } = ctx.database;
    if (!sqlite.prepare('SELECT 1 FROM units WHERE id = ?').get(unitId)) throw notFound('That unit');
    assertUnit(req, unitId);
    const { label } = valid<CreateBedInput>(req, 'body');
    const bedId = randomUUID();
    sqlite
      .transaction(() => {
        if (sqlite.prepare('SELECT 1 FROM beds WHERE unit_id = ? AND label = ?').get(unitId, label)) throw conflict('That bed label is taken.', { label: 'This unit already has a bed with this label.' });
        const order = (sqlite.prepare('SELECT COALESCE(MAX(sort_order), 0) + 1 AS n FROM beds WHERE unit_id = ?').get(unitId) as { n: number }).n;
        sqlite.prepare('INSERT INTO beds (id, unit_id, label, sort_order, active) VALUES (?, ?, ?, ?, 1)').run(bedId, unitId, label, order);
        appendAudit(sqlite, { at: ctx.clock.now(), actorId: req.auth!.userId, action: 'bed-created', entityType: 'bed', entityId: bedId, unitId, after: { label } });
      })
      .immediate();
    res.status(201).json({ bed: { id: bedId, label, active: true } });
  });

  router.patch('/admin/beds/:id', allow(ctx, 'admin:manage'), validate('body', bedActiveSchema), (req, res) => {
    const bedId = id(req);
    const { sqlite } = ctx.database;
    const bed = sqlite.prepare('SELECT id, unit_id, label, active FROM beds WHERE id = ?').get(bedId) as { id: string; unit_id: string; label: string; active: number } | undefined;
    if (!bed) throw notFound('That bed');
    assertUnit(req, bed.unit_id);
    const { active } = valid<{ active: boolean }>(req, 'body');
    if (!active && sqlite.prepare("SELECT 1 FROM infants WHERE bed_id = ? AND status = 'admitted'").get(bedId)) {
      throw conflict('An infant is in this bed; move the infant first.', { active: 'An infant is in this bed.' });
    }
    sqlite
      .transaction(() => {
        sqlite.prepare('UPDATE beds SET active = ? WHERE id = ?').run(active ? 1 : 0, bedId);
        appendAudit(sqlite, { at: ctx.clock.now(), actorId: req.auth!.userId, action: 'bed-updated', entityType: 'bed', entityId: bedId, unitId: bed.unit_id, before: { active: bed.active === 1 }, after: { active } });
      })
      .immediate();
    res.json({ bed: { id: bedId, label: bed.label, active } });
  });

  /** The weekly digest, now, to the educators of the admin's units. */
  router.post('/admin/digest/send', allow(ctx, 'admin:manage'), async (req, res) => {
    const result = await sendWeeklyDigests(ctx, ctx.clock.now(), { unitIds: req.auth!.unitIds, force: true, actorId: req.auth!.userId });
    res.json(result);
  });

  return router;
}
