import {
  noTeachingPointSchema,
  reviewQueueQuerySchema,
  teachingNoteSchema,
  unitRangeQuerySchema,
  withdrawNoteSchema,
  type NoTeachingPointInput,
  type ReviewQueueQuery,
  type TeachingNoteInput,
  type UnitRangeQuery,
  type WithdrawNoteInput,
} from '../../shared/schemas/review';
import type { AppContext } from '../context';
import { allow, assertUnit, secureRouter } from '../middleware/access';
import { auditListRead } from '../read-audit';
import { valid, validate } from '../middleware/validate';
import {
  addTeachingNote,
  closeWithNoTeachingPoint,
  infantsOfFlags,
  myReviewNotes,
  nurseConcerned,
  nurseSummary,
  reviewItemDetail,
  reviewQueue,
  viewerPrefs,
} from '../services/review';
import { acknowledgeNote, amendNote, withdrawNote } from '../services/review-loop';

/** The educator's review queue and its items, mounted at /api/review. */
export function reviewRouter(ctx: AppContext) {
  const router = secureRouter();

  router.get('/queue', allow(ctx, 'review:work'), validate('query', reviewQueueQuerySchema), async (req, res) => {
    const query = valid<ReviewQueueQuery>(req, 'query');
    // A unit outside the user's own is refused, never answered with an empty queue.
    if (query.unitId) assertUnit(req, query.unitId);
    const queue = reviewQueue(ctx, req.auth!.unitIds, query, viewerPrefs(ctx, req.auth!.userId).tempUnit);
    const { sqlite } = ctx.database;
    await auditListRead(sqlite, {
      at: ctx.clock.now(),
      actorId: req.auth!.userId,
      view: 'review-queue',
      infants: queue.items.map((i) => ({ infantId: i.infantId, unitId: i.unitId })),
      filter: query,
    });
    res.json(queue);
  });

  router.get('/items/:flagId', allow(ctx, 'review:work'), (req, res) => {
    res.json(reviewItemDetail(ctx, (req.params as { flagId: string }).flagId, req.auth!, viewerPrefs(ctx, req.auth!.userId).tempUnit));
  });

  router.post('/items/:flagId/notes', allow(ctx, 'review:work'), validate('body', teachingNoteSchema), (req, res) => {
    const { note } = valid<TeachingNoteInput>(req, 'body');
    res.status(201).json({ review: addTeachingNote(ctx, (req.params as { flagId: string }).flagId, note, req.auth!) });
  });

  /** Close the item with no teaching point: the review's status, not the flag's. */
  router.post('/items/:flagId/no-teaching-point', allow(ctx, 'review:work'), validate('body', noTeachingPointSchema), (req, res) => {
    const { comment } = valid<NoTeachingPointInput>(req, 'body');
    const status = closeWithNoTeachingPoint(ctx, (req.params as { flagId: string }).flagId, comment, req.auth!);
    res.status(201).json({ reviewState: status.state, noTeachingPoint: status.noTeachingPoint });
  });

  /** Per nurse concerned over a range: flags, review outcomes, median minutes to first action. */
  router.get('/nurses', allow(ctx, 'review:work'), validate('query', unitRangeQuerySchema), (req, res) => {
    const query = valid<UnitRangeQuery>(req, 'query');
    assertUnit(req, query.unitId);
    res.json(nurseSummary(ctx, query));
  });

  return router;
}

/** Teaching notes, mounted at /api/reviews: amended and withdrawn by the educator, read by the nurse they are for. */
export function reviewsRouter(ctx: AppContext) {
  const router = secureRouter();

  /** Amend a note: a new version (the old text stays in the record). */
  router.post('/:id/amend', allow(ctx, 'review:work'), validate('body', teachingNoteSchema), (req, res) => {
    const { note } = valid<TeachingNoteInput>(req, 'body');
    res.status(201).json({ review: amendNote(ctx, (req.params as { id: string }).id, note, req.auth!) });
  });

  router.post('/:id/withdraw', allow(ctx, 'review:work'), validate('body', withdrawNoteSchema), (req, res) => {
    const { reason } = valid<WithdrawNoteInput>(req, 'body');
    res.status(201).json({ review: withdrawNote(ctx, (req.params as { id: string }).id, reason, req.auth!) });
  });

  /** The nurse the note is for says she read it (its current version). */
  router.post('/:id/acknowledge', allow(ctx, 'signed-in'), (req, res) => {
    res.status(201).json({ review: acknowledgeNote(ctx, (req.params as { id: string }).id, req.auth!, (flagId) => nurseConcerned(ctx, flagId)) });
  });

  router.get('/mine', allow(ctx, 'signed-in'), async (req, res) => {
    const notes = myReviewNotes(ctx, req.auth!);
    const shown = infantsOfFlags(ctx, [...new Set(notes.map((n) => n.flagId))]);
    await auditListRead(ctx.database.sqlite, { at: ctx.clock.now(), actorId: req.auth!.userId, view: 'my-review-notes', infants: shown });
    res.json({ notes });
  });

  return router;
}
