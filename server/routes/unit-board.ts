import type { RequestHandler } from 'express';
import { admitInfantSchema, assignNurseSchema, type AdmitInfant } from '../../shared/schemas/unit';
import type { AppContext } from '../context';
import { allow, assertUnit, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import { admitInfant, assignNurse, listAssignableNurses } from '../services/admissions';
import { readBoard } from '../services/board-cache';

type UnitParams = { unitId: string };

/** The unit in the path must be one of the signed-in user's units; checked before the body. */
const unitMember: RequestHandler = (req, _res, next) => {
  assertUnit(req, (req.params as UnitParams).unitId);
  next();
};

/** The charge nurse's unit, mounted at /api/units/:unitId: the board, admissions and assignments. */
export function unitBoardRouter(ctx: AppContext) {
  const router = secureRouter({ mergeParams: true });
  const { sqlite } = ctx.database;

  router.get('/board', allow(ctx, 'chart:read'), unitMember, async (req, res) => {
    const body = await readBoard(sqlite, (req.params as UnitParams).unitId, req.auth!.userId, ctx.clock.now());
    body.send(req, res);
  });

  router.get('/nurses', allow(ctx, 'unit:manage'), unitMember, (req, res) => {
    res.json({ nurses: listAssignableNurses(ctx, (req.params as UnitParams).unitId) });
  });

  router.post('/assignments', allow(ctx, 'unit:manage'), unitMember, validate('body', assignNurseSchema), (req, res) => {
    const input = valid<{ infantId: string; nurseId: string; shift: 'current' | 'next' }>(req, 'body');
    res.status(201).json({ assignment: assignNurse(ctx, (req.params as UnitParams).unitId, input, req.auth!.userId) });
  });

  router.post('/infants', allow(ctx, 'unit:manage'), unitMember, validate('body', admitInfantSchema), (req, res) => {
    const input = valid<AdmitInfant>(req, 'body');
    const { id } = admitInfant(ctx, (req.params as UnitParams).unitId, input, req.auth!.userId);
    res.status(201).json({ infant: { id, bedId: input.bedId, displayName: input.displayName } });
  });

  return router;
}
