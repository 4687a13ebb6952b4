import { reviewQueueQuerySchema, teachingNoteSchema, type ReviewQueueQuery, type TeachingNoteInput } from '../../shared/schemas/review';
import { inArray } from 'drizzle-orm';
import { flags } from '../../db/schema';
import type { AppContext } from '../context';
import { allow, assertUnit, secureRouter } from '../middleware/access';
import { auditListRead } from '../read-audit';
import { valid, validate } from '../middleware/validate';
import { addTeachingNote, myReviewNotes, reviewItemDetail, reviewQueue } from '../services/review';

/** The educator's review queue and teaching notes; the nurse's own notes. */
export function reviewRouter(ctx: AppContext) {
  const router = secureRouter();

  router.get('/review/queue', allow(ctx, 'review:work'), validate('query', reviewQueueQuerySchema), async (req, res) => {
    const query = valid<ReviewQueueQuery>(req, 'query');
    // A unit outside the user's own is refused, never answered with an empty queue.
    if (query.unitId) assertUnit(req, query.unitId);
    const queue = reviewQueue(ctx, req.auth!.unitIds, query);
    const { sqlite } = ctx.database;
    await auditListRead(sqlite, { at: ctx.clock.now(), actorId: req.auth!.userId, view: 'review-queue', infants: queue.items.map((i) => ({ infantId: i.infantId, unitId: i.unitId })), filter: query });
    res.json(queue);
  });

  router.get('/review/items/:flagId', allow(ctx, 'review:work'), (req, res) => {
    res.json(reviewItemDetail(ctx, (req.params as { flagId: string }).flagId, req.auth!));
  });

  router.post('/review/items/:flagId/notes', allow(ctx, 'review:work'), validate('body', teachingNoteSchema), (req, res) => {
    const { note } = valid<TeachingNoteInput>(req, 'body');
    res.status(201).json({ review: addTeachingNote(ctx, (req.params as { flagId: string }).flagId, note, req.auth!) });
  });

  router.get('/reviews/mine', allow(ctx, 'signed-in'), async (req, res) => {
    const notes = myReviewNotes(ctx, req.auth!);
    const flagIds = [...new Set(notes.map((n) => n.flagId))];
    const shown = flagIds.length ? ctx.database.db.select({ infantId: flags.infantId, unitId: flags.unitId }).from(flags).where(inArray(flags.id, flagIds)).all() : [];
    await auditListRead(ctx.database.sqlite, { at: ctx.clock.now(), actorId: req.auth!.userId, view: 'my-review-notes', infants: shown });
    res.json({ notes });
  });

  return router;
}
