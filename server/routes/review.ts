import { reviewQueueQuerySchema, teachingNoteSchema, type ReviewQueueQuery, type TeachingNoteInput } from '../../shared/schemas/review';
import type { AppContext } from '../context';
import { allow, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import { addTeachingNote, myReviewNotes, reviewItemDetail, reviewQueue } from '../services/review';

/** The educator's review queue and teaching notes; the nurse's own notes. */
export function reviewRouter(ctx: AppContext) {
  const router = secureRouter();

  router.get('/review/queue', allow(ctx, 'review:work'), validate('query', reviewQueueQuerySchema), (req, res) => {
    const query = valid<ReviewQueueQuery>(req, 'query');
    res.json(reviewQueue(ctx, req.auth!.unitIds, query));
  });

  router.get('/review/items/:flagId', allow(ctx, 'review:work'), (req, res) => {
    res.json(reviewItemDetail(ctx, (req.params as { flagId: string }).flagId, req.auth!));
  });

  router.post('/review/items/:flagId/notes', allow(ctx, 'review:work'), validate('body', teachingNoteSchema), (req, res) => {
    const { note } = valid<TeachingNoteInput>(req, 'body');
    res.status(201).json({ review: addTeachingNote(ctx, (req.params as { flagId: string }).flagId, note, req.auth!) });
  });

  router.get('/reviews/mine', allow(ctx, 'signed-in'), (req, res) => {
    res.json({ notes: myReviewNotes(ctx, req.auth!) });
  });

  return router;
}
