import { z } from 'zod';
import { safeNote, safeText } from './safe-text';
import { REVIEW_KINDS, REVIEW_PAGE_MAX, REVIEW_STATUSES, TEACHING_NOTE_MAX } from '../vocabulary';

export { REVIEW_KIND_LABELS, REVIEW_KINDS, REVIEW_PAGE_MAX, REVIEW_STATUSES, TEACHING_NOTE_MAX, type ReviewKind } from '../vocabulary';

/** A local calendar date in the unit's time zone. */
export const localDateSchema = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'Use a date as YYYY-MM-DD.')
  .refine((v) => !Number.isNaN(Date.parse(`${v}T00:00:00Z`)) && new Date(`${v}T00:00:00Z`).toISOString().startsWith(v), 'That date does not exist.');

const id = z.string().min(1).max(100);

function rangeOk(v: { from?: string; to?: string }) {
  return !v.from || !v.to || v.from <= v.to;
}
const RANGE_MESSAGE = { message: 'The end date must not be before the start date.', path: ['to'] };

export const reviewQueueQuerySchema = z
  .strictObject({
    unitId: id.optional(),
    from: localDateSchema.optional(),
    to: localDateSchema.optional(),
    shift: z.enum(['day', 'night'], { error: 'Choose day or night.' }).optional(),
    kind: z.enum(REVIEW_KINDS, { error: 'Choose a kind of flag.' }).optional(),
    nurseId: id.optional(),
    status: z.enum(REVIEW_STATUSES, { error: 'Choose reviewed, unreviewed or all.' }).default('all'),
    /** One infant only. */
    infantId: id.optional(),
    /** Search: part of the infant's name, the bed label or the hospital number. */
    q: safeText({ error: 'Search for an infant or a bed.' }).max(60, 'Search with at most 60 characters.').optional(),
    /** Where the previous page ended (its `nextCursor`). */
    cursor: z
      .string()
      .max(200)
      .regex(/^[A-Za-z0-9_-]+$/, 'That page marker is not valid.')
      .optional(),
    /** A page is capped, so one request can never pull the whole history. */
    limit: z.coerce.number({ error: 'Limit must be a number.' }).int('Use a whole number.').min(1, 'At least 1.').max(REVIEW_PAGE_MAX, `At most ${REVIEW_PAGE_MAX}.`).default(200),
  })
  .refine(rangeOk, RANGE_MESSAGE);
export type ReviewQueueQuery = z.infer<typeof reviewQueueQuerySchema>;

export const teachingNoteSchema = z.strictObject({
  note: safeNote('Write a teaching note.').min(3, 'Write a teaching note of a few words at least.').max(TEACHING_NOTE_MAX, `Keep the note under ${TEACHING_NOTE_MAX} characters.`),
});
export type TeachingNoteInput = z.infer<typeof teachingNoteSchema>;

const withinYear = (from: string, to: string) => Date.parse(to) - Date.parse(from) <= 366 * 86_400_000;

const unitRangeShape = { unitId: id, from: localDateSchema, to: localDateSchema };

/** An inclusive range of local dates: the end not before the start, at most a year. */
function checkRange(v: { from: string; to: string }, ctx: z.RefinementCtx): void {
  if (!rangeOk(v)) ctx.addIssue({ code: 'custom', ...RANGE_MESSAGE });
  else if (!withinYear(v.from, v.to)) ctx.addIssue({ code: 'custom', message: 'Choose at most a year.', path: ['to'] });
}

/** Reports and exports: one unit, an inclusive range of local dates (at most a year). */
export const unitRangeQuerySchema = z.strictObject(unitRangeShape).superRefine(checkRange);
export type UnitRangeQuery = z.infer<typeof unitRangeQuerySchema>;

/** Exports: a unit and a range of local dates, optionally one infant of the unit. */
export const exportRangeQuerySchema = z.strictObject({ ...unitRangeShape, infantId: id.optional() }).superRefine(checkRange);
export type ExportRangeQuery = z.infer<typeof exportRangeQuerySchema>;

/** Withdrawing a teaching note: an optional reason, kept with the note. */
export const withdrawNoteSchema = z.strictObject({
  reason: safeNote('Write the reason in plain words.').max(500, 'Keep the reason under 500 characters.').optional(),
});
export type WithdrawNoteInput = z.infer<typeof withdrawNoteSchema>;

/** Closing a review item as "no teaching point": an optional comment, no note forced. */
export const noTeachingPointSchema = z.strictObject({
  comment: safeNote('Write the comment in plain words.').max(500, 'Keep the comment under 500 characters.').optional(),
});
export type NoTeachingPointInput = z.infer<typeof noTeachingPointSchema>;

/** Trends: a unit's figures by week (Monday to Sunday) or by calendar month over a range. */
export const trendQuerySchema = z.strictObject({ ...unitRangeShape, by: z.enum(['week', 'month'], { error: 'Choose week or month.' }).default('month') }).superRefine(checkRange);
export type TrendQuery = z.infer<typeof trendQuerySchema>;

/** Two periods of one unit side by side. */
export const compareQuerySchema = z
  .strictObject({
    unitId: id,
    aFrom: localDateSchema,
    aTo: localDateSchema,
    bFrom: localDateSchema,
    bTo: localDateSchema,
  })
  .refine((v) => v.aFrom <= v.aTo, { message: 'The end date must not be before the start date.', path: ['aTo'] })
  .refine((v) => v.bFrom <= v.bTo, { message: 'The end date must not be before the start date.', path: ['bTo'] })
  .refine((v) => withinYear(v.aFrom, v.aTo), { message: 'Choose at most a year.', path: ['aTo'] })
  .refine((v) => withinYear(v.bFrom, v.bTo), { message: 'Choose at most a year.', path: ['bTo'] });
export type CompareQuery = z.infer<typeof compareQuerySchema>;
