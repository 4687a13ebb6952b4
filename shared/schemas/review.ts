import { z } from 'zod';
import { safeNote, safeText } from './safe-text';
import { REVIEW_KINDS, REVIEW_PAGE_MAX, REVIEW_STATUSES, TEACHING_NOTE_MAX } from '../vocabulary';

export { REVIEW_KIND_LABELS, REVIEW_KINDS, REVIEW_PAGE_MAX, REVIEW_STATUSES, TEACHING_NOTE_MAX, type ReviewKind, type ReviewStatus } from '../vocabulary';

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
    cursor: z.string().max(200).regex(/^[A-Za-z0-9_-]+$/, 'That page marker is not valid.').optional(),
    /** A page is capped, so one request can never pull the whole history. */
    limit: z.coerce.number({ error: 'Limit must be a number.' }).int('Use a whole number.').min(1, 'At least 1.').max(REVIEW_PAGE_MAX, `At most ${REVIEW_PAGE_MAX}.`).default(200),
  })
  .refine(rangeOk, RANGE_MESSAGE);
export type ReviewQueueQuery = z.infer<typeof reviewQueueQuerySchema>;

export const teachingNoteSchema = z.strictObject({
  note: safeNote('Write a teaching note.')
    .min(3, 'Write a teaching note of a few words at least.')
    .max(TEACHING_NOTE_MAX, `Keep the note under ${TEACHING_NOTE_MAX} characters.`),
});
export type TeachingNoteInput = z.infer<typeof teachingNoteSchema>;

/** Reports and exports: one unit, an inclusive range of local dates (at most a year). */
export const unitRangeQuerySchema = z
  .strictObject({
    unitId: id,
    from: localDateSchema,
    to: localDateSchema,
  })
  .refine(rangeOk, RANGE_MESSAGE)
  .refine((v) => Date.parse(v.to) - Date.parse(v.from) <= 366 * 86_400_000, { message: 'Choose at most a year.', path: ['to'] });
export type UnitRangeQuery = z.infer<typeof unitRangeQuerySchema>;

/** Exports: a unit and a range of local dates, optionally one infant of the unit. */
export const exportRangeQuerySchema = z
  .strictObject({
    unitId: id,
    from: localDateSchema,
    to: localDateSchema,
    infantId: id.optional(),
  })
  .refine(rangeOk, RANGE_MESSAGE)
  .refine((v) => Date.parse(v.to) - Date.parse(v.from) <= 366 * 86_400_000, { message: 'Choose at most a year.', path: ['to'] });
export type ExportRangeQuery = z.infer<typeof exportRangeQuerySchema>;
