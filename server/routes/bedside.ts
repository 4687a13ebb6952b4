import {
  correctReadingSchema,
  createActionSchema,
  endSessionSchema,
  undoActionSchema,
  type CorrectReading,
  type CreateAction,
  type EndSession,
  type UndoActionInput,
} from '../../shared/schemas/bedside';
import type { AppContext } from '../context';
import { allow, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import { correctReading, endSession } from '../services/charting';
import { readFlagHistory, recordAction, undoAction } from '../services/flag-actions';

type IdParams = { id: string };

/** Readings reached by their own id, mounted at /api/readings: corrections. */
export function readingsRouter(ctx: AppContext) {
  const router = secureRouter();

  /** A correction is a new version of the reading; only the current version can be corrected. */
  router.post('/:id/corrections', allow(ctx, 'chart:write'), validate('body', correctReadingSchema), (req, res) => {
    const result = correctReading(ctx, (req.params as IdParams).id, valid<CorrectReading>(req, 'body'), req.auth!);
    res.status(result.created ? 201 : 200).json(result);
  });

  return router;
}

/** Flags reached by their own id, mounted at /api/flags: actions, their undo, and the history. */
export function flagsRouter(ctx: AppContext) {
  const router = secureRouter();

  /** Something done about a flag. Idempotent by the client's id. */
  router.post('/:id/actions', allow(ctx, 'chart:write'), validate('body', createActionSchema), (req, res) => {
    const result = recordAction(ctx, (req.params as IdParams).id, valid<CreateAction>(req, 'body'), req.auth!);
    res.status(result.created ? 201 : 200).json(result);
  });

  /** Undo a mistaken action (marked entered in error; the flag reopens when the action had closed it). */
  router.post('/:flagId/actions/:id/undo', allow(ctx, 'chart:write'), validate('body', undoActionSchema), (req, res) => {
    const { flagId, id } = req.params as { flagId: string; id: string };
    const result = undoAction(ctx, flagId, id, valid<UndoActionInput>(req, 'body'), req.auth!);
    res.status(result.created ? 201 : 200).json(result);
  });

  /** A flag's lifecycle in words (and its earlier rows when it was reopened), oldest first. */
  router.get('/:id/history', allow(ctx, 'chart:read'), async (req, res) => {
    res.json(await readFlagHistory(ctx, (req.params as IdParams).id, req.auth!));
  });

  return router;
}

/** Skin-to-skin sessions reached by their own id, mounted at /api/skin-to-skin. */
export function skinToSkinRouter(ctx: AppContext) {
  const router = secureRouter();

  /** End a skin-to-skin session. Ending an ended session answers with it, unchanged. */
  router.post('/:id/end', allow(ctx, 'chart:write'), validate('body', endSessionSchema), (req, res) => {
    res.status(200).json(endSession(ctx, (req.params as IdParams).id, valid<EndSession>(req, 'body'), req.auth!));
  });

  return router;
}
