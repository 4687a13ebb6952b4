import type { RequestHandler } from 'express';
import { admitInfantSchema, assignNurseSchema, type AdmitInfant } from '../../shared/schemas/unit';
import type { AppContext } from '../context';
import { notFound } from '../errors';
import { allow, assertUnit, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import { admitInfant, assignNurse, listAssignableNurses } from '../services/admissions';
import { auditRead } from '../read-audit';
import { boardBody, boardInfantIds } from '../services/board-cache';

type UnitParams = { unitId: string };

/** The unit in the path must be one of the signed-in user's units; checked before the body. */
const unitMember: RequestHandler = (req, _res, next) => {
  assertUnit(req, (req.params as UnitParams).unitId);
  next();
};

/** The charge nurse's unit: the board, admissions and assignments. */
export function unitBoardRouter(ctx: AppContext) {
  const router = secureRouter();
  const { sqlite } = ctx.database;

  router.get('/units/:unitId/board', allow(ctx, 'chart:read'), unitMember, async (req, res) => {
    const { unitId } = req.params as UnitParams;
    const now = ctx.clock.now();
    const body = boardBody(sqlite, unitId, now);
    if (body === null) throw notFound('That unit');
    await auditRead(sqlite, { at: now, actorId: req.auth!.userId, action: 'board-read', entityType: 'unit', entityId: unitId, unitId, after: { infantIds: boardInfantIds(body) } });
    body.send(req, res);
  });

  router.get('/units/:unitId/nurses', allow(ctx, 'unit:manage'), unitMember, (req, res) => {
    res.json({ nurses: listAssignableNurses(ctx, (req.params as UnitParams).unitId) });
  });

  router.post('/units/:unitId/assignments', allow(ctx, 'unit:manage'), unitMember, validate('body', assignNurseSchema), (req, res) => {
    const input = valid<{ infantId: string; nurseId: string; shift: 'current' | 'next' }>(req, 'body');
    res.status(201).json({ assignment: assignNurse(ctx, (req.params as UnitParams).unitId, input, req.auth!.userId) });
  });

  router.post('/units/:unitId/infants', allow(ctx, 'unit:manage'), unitMember, validate('body', admitInfantSchema), (req, res) => {
    const input = valid<AdmitInfant>(req, 'body');
    const { id } = admitInfant(ctx, (req.params as UnitParams).unitId, input, req.auth!.userId);
    res.status(201).json({ infant: { id, bedId: input.bedId, displayName: input.displayName } });
  });

  return router;
}
