import {
  auditQuerySchema,
  createBedSchema,
  createUnitSchema,
  createUserSchema,
  membershipSchema,
  unitSettingsConflicts,
  unitSettingsSchema,
  updateBedSchema,
  updateUserSchema,
  userSearchSchema,
  type AuditQuery,
  type CreateBedInput,
  type CreateUnitInput,
  type CreateUserInput,
  type MembershipInput,
  type UnitSettingsInput,
  type UpdateBedInput,
  type UpdateUserInput,
  type UserSearch,
} from '../../shared/schemas/admin';
import type { AppContext } from '../context';
import { badRequest, zodFields } from '../errors';
import { allow, assertUnit, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import { addMembership, auditLog, createBed, createUnit, removeMembership, unitSettingsOf, updateBed, updateUnitSettings } from '../services/admin-console';
import { createUser, listUnits, listUsers, sendLinkFor, setUserActive, updateUser } from '../services/admin-users';
import { sendWeeklyDigests } from '../services/digest';
import { mailLinkSafely } from '../services/email-links';
import { importRoster, previewRoster } from '../services/uploads';
import { csvUpload, uploadedFile } from './uploads';

/** The settings checked across fields; one left out of a change is taken as stored. */
type CrossChecked = 'checkIntervalMinutes' | 'dueSoonMinutes' | 'dayShiftStart' | 'nightShiftStart';

/** Users, invitations, units, beds, settings, the digest and the roster upload, mounted at /api/admin: the administrator's. Admins never chart. */
export function adminRouter(ctx: AppContext) {
  const router = secureRouter();
  const id = (req: { params: unknown }, name = 'id') => (req.params as Record<string, string>)[name]!;

  router.get('/users', allow(ctx, 'admin:manage'), validate('query', userSearchSchema), (req, res) => {
    res.json({ users: listUsers(ctx, req.auth!.unitIds, valid<UserSearch>(req, 'query').q) });
  });

  /** One unit membership added or removed; the person's other units stay as they are. */
  router.post('/users/:id/units', allow(ctx, 'admin:manage'), validate('body', membershipSchema), (req, res) => {
    res.status(201).json({ unitIds: addMembership(ctx, id(req), valid<MembershipInput>(req, 'body').unitId, req.auth!) });
  });

  router.delete('/users/:id/units/:unit', allow(ctx, 'admin:manage'), (req, res) => {
    res.json({ unitIds: removeMembership(ctx, id(req), id(req, 'unit'), req.auth!) });
  });

  /** Who changed what in the administrator's units, newest first, by cursor. */
  router.get('/audit', allow(ctx, 'admin:manage'), validate('query', auditQuerySchema), (req, res) => {
    res.json(auditLog(ctx, valid<AuditQuery>(req, 'query'), req.auth!));
  });

  router.post('/units', allow(ctx, 'admin:manage'), validate('body', createUnitSchema), (req, res) => {
    const { id: unitId } = createUnit(ctx, valid<CreateUnitInput>(req, 'body'), req.auth!);
    res.status(201).json({ unit: listUnits(ctx, [unitId])[0] });
  });

  router.post('/users', allow(ctx, 'admin:manage'), validate('body', createUserSchema), async (req, res) => {
    const { user, link } = createUser(ctx, valid<CreateUserInput>(req, 'body'), req.auth!);
    const mailed = await mailLinkSafely(ctx, link);
    res.status(201).json({ user, mailed });
  });

  router.patch('/users/:id', allow(ctx, 'admin:manage'), validate('body', updateUserSchema), (req, res) => {
    res.json({ user: updateUser(ctx, id(req), valid<UpdateUserInput>(req, 'body'), req.auth!) });
  });

  router.post('/users/:id/deactivate', allow(ctx, 'admin:manage'), (req, res) => {
    res.json({ user: setUserActive(ctx, id(req), false, req.auth!) });
  });

  router.post('/users/:id/reactivate', allow(ctx, 'admin:manage'), (req, res) => {
    res.json({ user: setUserActive(ctx, id(req), true, req.auth!) });
  });

  router.post('/users/:id/invitation', allow(ctx, 'admin:manage'), async (req, res) => {
    const link = sendLinkFor(ctx, id(req), 'invite', req.auth!);
    res.status(202).json({ mailed: await mailLinkSafely(ctx, link), expiresAt: link.expiresAt.toISOString() });
  });

  router.post('/users/:id/password-reset', allow(ctx, 'admin:manage'), async (req, res) => {
    const link = sendLinkFor(ctx, id(req), 'reset', req.auth!);
    res.status(202).json({ mailed: await mailLinkSafely(ctx, link), expiresAt: link.expiresAt.toISOString() });
  });

  router.get('/units', allow(ctx, 'admin:manage'), (req, res) => {
    res.json({ units: listUnits(ctx, req.auth!.unitIds) });
  });

  router.patch('/units/:id', allow(ctx, 'admin:manage'), (req, res) => {
    const unitId = id(req);
    const stored = unitSettingsOf(ctx, unitId);
    assertUnit(req, unitId);
    // Each field's own checks and the checks across fields together, so every field at fault is named at once.
    const parsed = unitSettingsSchema.safeParse(req.body ?? {});
    const fields = parsed.success ? {} : zodFields(parsed.error);
    const raw = (req.body ?? {}) as Record<string, unknown>;
    const pick = <K extends CrossChecked>(key: K) => (key in raw && !(key in fields) ? raw[key] : stored[key]) as (typeof stored)[K];
    Object.assign(
      fields,
      Object.fromEntries(
        Object.entries(
          unitSettingsConflicts({
            checkIntervalMinutes: pick('checkIntervalMinutes'),
            dueSoonMinutes: pick('dueSoonMinutes'),
            dayShiftStart: pick('dayShiftStart'),
            nightShiftStart: pick('nightShiftStart'),
          }),
        ).filter(([k]) => !(k in fields)),
      ),
    );
    const bad = Object.keys(fields);
    if (bad.length || !parsed.success) throw badRequest(`${bad.length === 1 ? 'One setting needs' : `${bad.length} settings need`} attention: ${bad.join(', ')}.`, fields);
    const input: UnitSettingsInput = parsed.data;
    updateUnitSettings(ctx, unitId, input, req.auth!);
    res.json({ unit: listUnits(ctx, [unitId])[0] });
  });

  router.post('/units/:id/beds', allow(ctx, 'admin:manage'), (req, res) => {
    const unitId = id(req);
    unitSettingsOf(ctx, unitId);
    assertUnit(req, unitId);
    const parsed = createBedSchema.safeParse(req.body ?? {});
    if (!parsed.success) {
      // Name the bed and the reason, not only "some fields".
      const fields = zodFields(parsed.error);
      const given = (req.body as { label?: unknown } | undefined)?.label;
      const which = typeof given === 'string' && given.trim() ? `Bed "${given.slice(0, 40)}"` : 'The bed label';
      throw badRequest(`${which}: ${fields.label ?? Object.values(fields)[0]}`, fields);
    }
    const { label }: CreateBedInput = parsed.data;
    res.status(201).json({ bed: createBed(ctx, unitId, label, req.auth!) });
  });

  /** Rename a bed, take it out of use or back, or move it up or down the unit's order. */
  router.patch('/beds/:id', allow(ctx, 'admin:manage'), validate('body', updateBedSchema), (req, res) => {
    res.json({ bed: updateBed(ctx, id(req), valid<UpdateBedInput>(req, 'body'), req.auth!) });
  });

  /** The weekly digest, now, to the educators of the admin's units. */
  router.post('/digest/send', allow(ctx, 'admin:manage'), async (req, res) => {
    const result = await sendWeeklyDigests(ctx, ctx.clock.now(), { unitIds: req.auth!.unitIds, force: true, actorId: req.auth!.userId });
    res.json(result);
  });

  // The roster CSV upload: preview first, then import.
  const upload = csvUpload(ctx);

  router.post('/roster/preview', allow(ctx, 'admin:manage'), upload, (req, res) => {
    res.status(201).json(previewRoster(ctx, uploadedFile(req), req.auth!));
  });

  router.post('/roster/:uploadId/import', allow(ctx, 'admin:manage'), async (req, res) => {
    res.json(await importRoster(ctx, id(req, 'uploadId'), req.auth!));
  });

  return router;
}
