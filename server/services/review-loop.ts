/**
 * The rest of the educator's loop after a teaching note is written: amendments and withdrawal
 * (append-only versions in review_events), the nurse's acknowledgement, and "no teaching point"
 * closing a review item without a note. The review status derived here is the review's own,
 * apart from the flag's lifecycle (flag_events / flag_resolutions).
 */
import { randomUUID } from 'node:crypto';
import { asc, eq, inArray } from 'drizzle-orm';
import { alias } from 'drizzle-orm/sqlite-core';
import { reviewEvents, reviews, users } from '../../db/schema';
import type { Db } from '../../db/client';
import type { PersonRef, ReviewNote, ReviewState } from '../../shared/types/review';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { badRequest, conflict, forbidden, notFound } from '../errors';
import { dbOf } from './flag-lifecycle';

type EventRow = typeof reviewEvents.$inferSelect & { actorName: string };

const iso = (d: Date) => d.toISOString();

/** Notes and review events of the given flags (or of every flag in the given units). */
function loadRaw(db: Db, where: { flagIds?: string[]; unitIds?: string[] }) {
  const reviewer = alias(users, 'reviewer');
  const actor = alias(users, 'actor');
  const noteFilter = where.flagIds ? inArray(reviews.flagId, where.flagIds) : inArray(reviews.unitId, where.unitIds ?? []);
  const eventFilter = where.flagIds ? inArray(reviewEvents.flagId, where.flagIds) : inArray(reviewEvents.unitId, where.unitIds ?? []);
  const notes = db
    .select({ id: reviews.id, flagId: reviews.flagId, note: reviews.note, createdAt: reviews.createdAt, reviewerId: reviewer.id, reviewerName: reviewer.name })
    .from(reviews)
    .innerJoin(reviewer, eq(reviewer.id, reviews.reviewerId))
    .where(noteFilter)
    .orderBy(asc(reviews.createdAt), asc(reviews.id))
    .all();
  const events: EventRow[] = db
    .select({
      id: reviewEvents.id,
      flagId: reviewEvents.flagId,
      unitId: reviewEvents.unitId,
      reviewId: reviewEvents.reviewId,
      event: reviewEvents.event,
      note: reviewEvents.note,
      version: reviewEvents.version,
      actorId: reviewEvents.actorId,
      createdAt: reviewEvents.createdAt,
      actorName: actor.name,
    })
    .from(reviewEvents)
    .innerJoin(actor, eq(actor.id, reviewEvents.actorId))
    .where(eventFilter)
    .orderBy(asc(reviewEvents.createdAt), asc(reviewEvents.id))
    .all();
  return { notes, events };
}

function buildNotes(raw: ReturnType<typeof loadRaw>): ReviewNote[] {
  return raw.notes.map((n) => {
    const reviewer: PersonRef = { id: n.reviewerId, name: n.reviewerName };
    const mine = raw.events.filter((e) => e.reviewId === n.id);
    const versions = [{ version: 1, note: n.note, at: iso(n.createdAt), by: reviewer }];
    let withdrawn: ReviewNote['withdrawn'] = null;
    let acknowledged: ReviewNote['acknowledged'] = null;
    for (const e of mine) {
      const by = { id: e.actorId, name: e.actorName };
      if (e.event === 'amended' && e.note !== null) {
        versions.push({ version: versions.length + 1, note: e.note, at: iso(e.createdAt), by });
        acknowledged = null; // an amendment needs reading again
      } else if (e.event === 'withdrawn') withdrawn = { at: iso(e.createdAt), by, reason: e.note };
      else if (e.event === 'acknowledged' && e.version === versions.length) acknowledged = { at: iso(e.createdAt), by, version: e.version };
    }
    const current = versions[versions.length - 1]!;
    return { id: n.id, flagId: n.flagId, note: current.note, reviewer, createdAt: iso(n.createdAt), version: current.version, versions, withdrawn, acknowledged };
  });
}

/** Every teaching note of the flags, with versions, withdrawal and acknowledgement; oldest first. */
export function loadNotes(db: Db, flagIds: string[]): ReviewNote[] {
  if (flagIds.length === 0) return [];
  return buildNotes(loadRaw(db, { flagIds }));
}

export interface ReviewStatusOf {
  state: ReviewState;
  /** Current (not withdrawn) notes. */
  current: number;
  lastAt: number | null;
  noTeachingPoint: { at: string; by: PersonRef; comment: string | null } | null;
}

function statusFrom(notes: ReviewNote[], events: EventRow[]): ReviewStatusOf {
  const current = notes.filter((n) => !n.withdrawn);
  const ntp = events.filter((e) => e.event === 'no-teaching-point').at(-1);
  const noTeachingPoint = ntp ? { at: iso(ntp.createdAt), by: { id: ntp.actorId, name: ntp.actorName }, comment: ntp.note } : null;
  const times = [...notes.map((n) => Date.parse(n.versions.at(-1)!.at)), ...events.filter((e) => e.event !== 'acknowledged').map((e) => e.createdAt.getTime())];
  const lastAt = times.length ? Math.max(...times) : null;
  let state: ReviewState = 'unreviewed';
  if (current.length > 0) state = current.every((n) => n.acknowledged) ? 'acknowledged' : 'noted';
  else if (noTeachingPoint) state = 'no-teaching-point';
  return { state, current: current.length, lastAt, noTeachingPoint };
}

/** The review status of every flag with a note or event in the units, by flag id (absent: unreviewed). */
export function reviewStatuses(db: Db, unitIds: string[]): Map<string, ReviewStatusOf> {
  const out = new Map<string, ReviewStatusOf>();
  if (unitIds.length === 0) return out;
  const raw = loadRaw(db, { unitIds });
  const notes = buildNotes(raw);
  const flagIds = new Set([...raw.notes.map((n) => n.flagId), ...raw.events.map((e) => e.flagId)]);
  for (const flagId of flagIds) {
    out.set(
      flagId,
      statusFrom(
        notes.filter((n) => n.flagId === flagId),
        raw.events.filter((e) => e.flagId === flagId),
      ),
    );
  }
  return out;
}

export const UNREVIEWED: ReviewStatusOf = { state: 'unreviewed', current: 0, lastAt: null, noTeachingPoint: null };

export function reviewStatusOf(db: Db, flagId: string): ReviewStatusOf {
  const raw = loadRaw(db, { flagIds: [flagId] });
  return statusFrom(buildNotes(raw), raw.events);
}

function findNote(db: Db, reviewId: string): ReviewNote & { unitId: string } {
  const row = db.select({ unitId: reviews.unitId, flagId: reviews.flagId }).from(reviews).where(eq(reviews.id, reviewId)).get();
  if (!row) throw notFound('That teaching note');
  const note = loadNotes(db, [row.flagId]).find((n) => n.id === reviewId)!;
  return { ...note, unitId: row.unitId };
}

function append(ctx: AppContext, actorId: string, values: Omit<typeof reviewEvents.$inferInsert, 'id' | 'createdAt' | 'actorId'>, action: string): void {
  const { sqlite } = ctx.database;
  const db = dbOf(sqlite);
  const id = randomUUID();
  const now = ctx.clock.now();
  sqlite
    .transaction(() => {
      db.insert(reviewEvents)
        .values({ ...values, id, actorId, createdAt: now })
        .run();
      appendAudit(sqlite, {
        at: now,
        actorId,
        action,
        entityType: 'review',
        entityId: values.reviewId ?? id,
        unitId: values.unitId,
        after: { flagId: values.flagId, event: values.event, note: values.note ?? null, version: values.version ?? null },
      });
    })
    .immediate();
}

/** The educator amends a note: a new version; the nurse's acknowledgement of the old one no longer counts. */
export function amendNote(ctx: AppContext, reviewId: string, note: string, auth: { userId: string }): ReviewNote {
  const db = dbOf(ctx.database.sqlite);
  const found = findNote(db, reviewId);
  if (found.withdrawn) throw conflict('This note was withdrawn; write a new one instead.');
  if (found.note === note) throw badRequest('The note is unchanged.', { note: 'Change the text to amend it.' });
  append(ctx, auth.userId, { flagId: found.flagId, unitId: found.unitId, reviewId, event: 'amended', note, version: found.version + 1 }, 'review-note-amend');
  return findNote(db, reviewId);
}

export function withdrawNote(ctx: AppContext, reviewId: string, reason: string | undefined, auth: { userId: string }): ReviewNote {
  const db = dbOf(ctx.database.sqlite);
  const found = findNote(db, reviewId);
  if (found.withdrawn) throw conflict('This note is already withdrawn.');
  append(ctx, auth.userId, { flagId: found.flagId, unitId: found.unitId, reviewId, event: 'withdrawn', note: reason ?? null, version: found.version }, 'review-note-withdraw');
  return findNote(db, reviewId);
}

/**
 * The nurse concerned acknowledges the current version of a note. `nurseOf` names the nurse
 * concerned for the flag (the review queue's rule); anyone else is refused.
 */
export function acknowledgeNote(ctx: AppContext, reviewId: string, auth: { userId: string }, nurseOf: (flagId: string) => string | null): ReviewNote {
  const db = dbOf(ctx.database.sqlite);
  const found = findNote(db, reviewId);
  if (nurseOf(found.flagId) !== auth.userId) throw forbidden('Only the nurse this note is for can acknowledge it.');
  if (found.withdrawn) throw conflict('This note was withdrawn.');
  if (found.acknowledged) return found;
  append(ctx, auth.userId, { flagId: found.flagId, unitId: found.unitId, reviewId, event: 'acknowledged', version: found.version }, 'review-note-acknowledge');
  return findNote(db, reviewId);
}

/** Closes a review item with no teaching point (no note needed). Refused when it already has a current note or is closed so. */
export function closeNoTeachingPoint(ctx: AppContext, flag: { id: string; unitId: string }, comment: string | undefined, auth: { userId: string }): ReviewStatusOf {
  const db = dbOf(ctx.database.sqlite);
  const status = reviewStatusOf(db, flag.id);
  if (status.state === 'no-teaching-point') throw conflict('This item is already closed with no teaching point.');
  if (status.current > 0) throw conflict('This item has a teaching note; withdraw it first to close the item with no teaching point.');
  append(ctx, auth.userId, { flagId: flag.id, unitId: flag.unitId, reviewId: null, event: 'no-teaching-point', note: comment ?? null }, 'review-no-teaching-point');
  return reviewStatusOf(db, flag.id);
}
