import type Database from 'better-sqlite3';
import { randomUUID } from 'node:crypto';
import { REVIEW_KINDS, type ReviewKind, type ReviewQueueQuery, UnitRangeQuery } from '../../shared/schemas/review';
import { shiftAt } from '../../shared/shifts';
import { and, asc, between, desc, eq, inArray, min } from 'drizzle-orm';
import { alias } from 'drizzle-orm/sqlite-core';
import type { Db } from '../../db/client';
import { actions, assignments, beds, flagEvents, flagResolutions, flags as flagsTable, infants, readings, reviews, units, users } from '../../db/schema';
import { median } from '../../shared/reports';
import { FEVER_MIN_CENTI, NORMAL_MAX_CENTI, BAND_LABELS } from '../../shared/thermal/bands';
import { HEART_RATE_HIGH_ABOVE } from '../../shared/thermal/heat-stress';
import { formatTemperature, HEAT_STRESS_SIGN_LABELS, type TempUnit } from '../../shared/thermal';
import type { MyReviewNote, NurseSummaryResponse, NurseSummaryRow, PersonRef, ReviewItemDetail, ReviewNote, ReviewQueueItem, ReviewQueueResponse } from '../../shared/types/review';
import { dbOf } from './flag-lifecycle';
import { closeNoTeachingPoint, loadNotes, reviewStatuses, reviewStatusOf, UNREVIEWED, type ReviewStatusOf } from './review-loop';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { badRequest, forbidden, notFound } from '../errors';
import { bedAtLookup } from './bed-stays';

const MINUTE = 60_000;

function isReviewKind(kind: string): kind is ReviewKind {
  return (REVIEW_KINDS as readonly string[]).includes(kind);
}

/** The stored flag kinds the review queue shows. */
const QUEUE_KINDS = flagsTable.kind.enumValues.filter(isReviewKind);

/** Local calendar date of an instant in a zone, YYYY-MM-DD. */
export function localDateOf(instant: Date, timeZone: string): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(instant);
}

/** The queue's flags of these units (one flag when `flagId` is given), newest first, with what the queue shows of them. */
function loadFlagRows(db: Db, unitIds: string[], flagId?: string) {
  if (unitIds.length === 0) return [];
  const recorder = alias(users, 'recorder');
  const taker = alias(users, 'taker');
  const firstActions = db
    .select({ flagId: actions.flagId, at: min(actions.at).as('first_action_at') })
    .from(actions)
    .groupBy(actions.flagId)
    .as('first_actions');
  const withdrawnLater = db.selectDistinct({ flagId: flagEvents.flagId }).from(flagEvents).where(eq(flagEvents.event, 'withdrawn')).as('withdrawn_later');
  const rows = db
    .select({
      id: flagsTable.id,
      kind: flagsTable.kind,
      unitId: flagsTable.unitId,
      unitName: units.name,
      timeZone: units.timeZone,
      dayShiftStart: units.dayShiftStart,
      nightShiftStart: units.nightShiftStart,
      infantId: flagsTable.infantId,
      infantName: infants.displayName,
      bedLabel: beds.label,
      hospitalNumber: infants.hospitalNumber,
      raisedAt: flagsTable.raisedAt,
      raisedByReadingId: flagsTable.raisedByReadingId,
      detail: flagsTable.detail,
      readingUploadId: readings.uploadId,
      readingRecorder: readings.recordedBy,
      readingRecorderName: recorder.name,
      readingTaker: readings.takenBy,
      readingTakerName: taker.name,
      firstActionAt: firstActions.at,
      closedAt: flagResolutions.closedAt,
      how: flagResolutions.how,
      withdrawnLater: withdrawnLater.flagId,
    })
    .from(flagsTable)
    .innerJoin(units, eq(units.id, flagsTable.unitId))
    .innerJoin(infants, eq(infants.id, flagsTable.infantId))
    .leftJoin(beds, eq(beds.id, infants.bedId))
    .leftJoin(readings, eq(readings.id, flagsTable.raisedByReadingId))
    .leftJoin(recorder, eq(recorder.id, readings.recordedBy))
    .leftJoin(taker, eq(taker.id, readings.takenBy))
    .leftJoin(firstActions, eq(firstActions.flagId, flagsTable.id))
    .leftJoin(flagResolutions, eq(flagResolutions.flagId, flagsTable.id))
    .leftJoin(withdrawnLater, eq(withdrawnLater.flagId, flagsTable.id))
    .where(and(inArray(flagsTable.kind, QUEUE_KINDS), inArray(flagsTable.unitId, unitIds), flagId ? eq(flagsTable.id, flagId) : undefined))
    .orderBy(desc(flagsTable.raisedAt), asc(flagsTable.id))
    .all();
  return rows.flatMap(({ kind, withdrawnLater: withdrawn, readingTaker, readingTakerName, ...r }) => {
    if (!isReviewKind(kind)) return [];
    // A bedside reading was charted by whoever took it; an imported one credits the nurse the file named.
    const bedside = r.readingUploadId === null;
    return [
      {
        ...r,
        kind,
        raisedMs: r.raisedAt.getTime(),
        readingBy: bedside ? r.readingRecorder : readingTaker,
        readingByName: bedside ? r.readingRecorderName : readingTakerName,
        // A flag closed before its raising reading was corrected away was withdrawn later (an event).
        how: withdrawn !== null ? 'withdrawn' : r.how,
      },
    ];
  });
}

type FlagRow = ReturnType<typeof loadFlagRows>[number];

function assignedNurse(db: Db, infantId: string, shiftDate: string, shift: 'day' | 'night'): PersonRef | null {
  const row = db
    .select({ id: users.id, name: users.name })
    .from(assignments)
    .innerJoin(users, eq(users.id, assignments.nurseId))
    .where(and(eq(assignments.infantId, infantId), eq(assignments.shiftDate, shiftDate), eq(assignments.shift, shift)))
    .orderBy(desc(assignments.createdAt))
    .limit(1)
    .get();
  return row ?? null;
}

/** The viewer's own settings: temperatures in °C or °F, times on a 12- or 24-hour clock. */
export interface ViewerPrefs {
  tempUnit: TempUnit;
  clock: '12h' | '24h';
}

export function viewerPrefs(ctx: AppContext, userId: string): ViewerPrefs {
  const row = dbOf(ctx.database.sqlite).select({ tempUnit: users.tempUnit, clock: users.clock }).from(users).where(eq(users.id, userId)).get();
  return { tempUnit: row?.tempUnit === 'F' ? 'F' : 'C', clock: row?.clock === '12h' ? '12h' : '24h' };
}

/** A heat-stress reason in words a nurse reads, not the rule's code, in the viewer's unit. */
function heatReasonLabel(reason: unknown, unit: TempUnit): string {
  const r = (typeof reason === 'string' ? { kind: reason } : reason) as { kind?: string; sign?: string };
  if (r.kind === 'sign' && r.sign) return (HEAT_STRESS_SIGN_LABELS as Record<string, string>)[r.sign]?.toLowerCase() ?? r.sign;
  if (r.kind === 'remote-above-normal') return `remote site above ${formatTemperature(NORMAL_MAX_CENTI, unit)}`;
  if (r.kind === 'heart-rate-high') return `heart rate over ${HEART_RATE_HIGH_ABOVE}/min`;
  return r.kind ?? 'a sign';
}

function summaryOf(kind: ReviewKind, detail: Record<string, unknown>, unit: TempUnit): string {
  const t = (v: unknown) => (typeof v === 'number' ? formatTemperature(v, unit) : '—');
  switch (kind) {
    case 'gap':
      return `Probe ${t(detail.probeCenti)}, remote site ${t(detail.remoteCenti)}`;
    case 'overdue-check':
      return typeof detail.minutesLate === 'number' ? `Remote-site check ${detail.minutesLate} min late` : 'Remote-site check overdue';
    case 'heat-stress':
      return Array.isArray(detail.reasons) ? `Signs: ${detail.reasons.map((r) => heatReasonLabel(r, unit)).join(', ')}` : 'Heat-stress prompt';
    case 'manual-mode':
      return 'Manual mode at high heater output';
    case 'cold-stress':
      return `${typeof detail.band === 'string' ? ((BAND_LABELS as Record<string, string>)[detail.band] ?? 'Cold stress') : 'Cold stress'}: lowest remote site ${t(detail.lowestCenti)}`;
    case 'fever':
      return `Remote site ${t(detail.highestCenti)} (${t(FEVER_MIN_CENTI)} or over)`;
    case 'skin-to-skin-deviation':
      return typeof detail.deviationCenti === 'number'
        ? `${detail.deviationCenti < 0 ? 'Colder' : 'Warmer'} than the reference ${t(detail.referenceCenti)} during skin-to-skin`
        : 'Skin-to-skin deviation';
  }
}

/** The nurse concerned with a flag: who charted the raising reading, or for an overdue check the nurse assigned. */
function nurseFor(db: Db, row: FlagRow, slot: { shiftDate: string; shift: 'day' | 'night' }) {
  const recorder = row.readingBy ? { id: row.readingBy, name: row.readingByName ?? '' } : null;
  const importedBy = row.readingUploadId !== null && row.readingBy === null && row.readingRecorder ? { id: row.readingRecorder, name: row.readingRecorderName ?? '' } : null;
  const nurse =
    row.kind === 'overdue-check'
      ? (assignedNurse(db, row.infantId, slot.shiftDate, slot.shift) ?? recorder)
      : importedBy
        ? null
        : (recorder ?? assignedNurse(db, row.infantId, slot.shiftDate, slot.shift));
  return { nurse, importedBy };
}

function toItem(db: Db, row: FlagRow, status: ReviewStatusOf = UNREVIEWED, unit: TempUnit = 'C'): ReviewQueueItem {
  const raisedAt = row.raisedAt;
  const slot = shiftAt(raisedAt, row);
  const detail = JSON.parse(row.detail) as Record<string, unknown>;
  // An imported reading credits the nurse the file named; a file that named nobody credits no nurse, and the uploader is shown as who imported it.
  const { nurse, importedBy } = nurseFor(db, row, slot);
  const mins = (at: Date | null) => (at === null ? null : Math.max(0, Math.round((at.getTime() - row.raisedMs) / MINUTE)));
  return {
    flagId: row.id,
    kind: row.kind,
    unitId: row.unitId,
    unitName: row.unitName,
    timeZone: row.timeZone,
    infantId: row.infantId,
    infantName: row.infantName,
    bedLabel: row.bedLabel,
    raisedAt: raisedAt.toISOString(),
    shift: slot.shift,
    shiftDate: slot.shiftDate,
    nurse,
    importedBy,
    // A withdrawn overdue check was on time after all: it never describes itself as late.
    summary: row.how === 'withdrawn' && row.kind === 'overdue-check' ? 'Remote-site check charted on time (withdrawn)' : summaryOf(row.kind, detail, unit),
    firstActionAt: row.firstActionAt === null ? null : row.firstActionAt.toISOString(),
    closedAt: row.closedAt === null ? null : row.closedAt.toISOString(),
    // A late entry or correction showed it should not have been raised: never a late check.
    withdrawn: row.how === 'withdrawn',
    minutesToFirstAction: mins(row.firstActionAt),
    minutesToResolution: row.how === 'withdrawn' ? null : mins(row.closedAt),
    reviewCount: status.current,
    lastReviewedAt: status.lastAt === null ? null : new Date(status.lastAt).toISOString(),
    reviewState: status.state,
  };
}

const encodeCursor = (row: { raisedMs: number; id: string }) => Buffer.from(`${row.raisedMs}.${row.id}`, 'utf8').toString('base64url');

function decodeCursor(cursor: string): { at: number; id: string } {
  const text = Buffer.from(cursor, 'base64url').toString('utf8');
  const dot = text.indexOf('.');
  const at = Number(text.slice(0, dot));
  if (dot < 1 || !Number.isSafeInteger(at)) throw badRequest('That page marker is not valid.', { cursor: 'Start again from the first page.' });
  return { at, id: text.slice(dot + 1) };
}

/**
 * The queue items in the given units, every filter applied, newest first, one page at a time:
 * `nextCursor` continues where the page ended (null on the last page); `limit: 'all'` is for
 * exports, which are never cut. The bed is the bed at the time the flag was raised. The nurse
 * filter list comes from the unfiltered set.
 */
export function reviewQueue(ctx: AppContext, unitIds: string[], query: Omit<ReviewQueueQuery, 'limit'> & { limit?: number | 'all' }, unit: TempUnit = 'C'): ReviewQueueResponse {
  const { db } = ctx.database;
  const unitList = unitIds.length ? db.select({ id: units.id, name: units.name }).from(units).where(inArray(units.id, unitIds)).orderBy(asc(units.name)).all() : [];
  const scope = query.unitId ? unitIds.filter((u) => u === query.unitId) : unitIds;
  const loaded = loadFlagRows(db, scope);
  const bedAt = bedAtLookup(
    db,
    loaded.map((r) => r.infantId),
  );
  for (const r of loaded) r.bedLabel = bedAt(r.infantId, r.raisedMs) ?? r.bedLabel;
  const statuses = reviewStatuses(db, scope);
  const statusOf = (flagId: string) => statuses.get(flagId) ?? UNREVIEWED;
  const needle = query.q?.trim().toLowerCase();
  const rows = loaded.filter((r) => {
    if (query.kind && r.kind !== query.kind) return false;
    if (query.infantId && r.infantId !== query.infantId) return false;
    if (needle && ![r.infantName, r.bedLabel ?? '', r.hospitalNumber ?? ''].some((v) => v.toLowerCase().includes(needle))) return false;
    if (query.from || query.to) {
      const date = localDateOf(r.raisedAt, r.timeZone);
      if (query.from && date < query.from) return false;
      if (query.to && date > query.to) return false;
    }
    // Reviewed: a current teaching note, or closed with no teaching point (the review's own status).
    if (query.status === 'reviewed' && statusOf(r.id).state === 'unreviewed') return false;
    if (query.status === 'unreviewed' && statusOf(r.id).state !== 'unreviewed') return false;
    return true;
  });
  const all = rows.map((r) => ({ row: r, item: toItem(db, r, statusOf(r.id), unit) }));
  const nurses = new Map<string, PersonRef>();
  for (const { item } of all) if (item.nurse) nurses.set(item.nurse.id, item.nurse);
  const matching = all.filter(({ item: i }) => (!query.shift || i.shift === query.shift) && (!query.nurseId || i.nurse?.id === query.nurseId));
  const after = query.cursor ? decodeCursor(query.cursor) : null;
  const rest = after ? matching.filter(({ row }) => row.raisedMs < after.at || (row.raisedMs === after.at && row.id > after.id)) : matching;
  const limit = query.limit === 'all' ? rest.length : (query.limit ?? 200);
  const page = rest.slice(0, limit);
  const last = page[page.length - 1];
  return {
    items: page.map((p) => p.item),
    total: matching.length,
    nextCursor: rest.length > page.length && last ? encodeCursor(last.row) : null,
    nurses: [...nurses.values()].sort((a, b) => a.name.localeCompare(b.name)),
    units: unitList,
  };
}

/** The teaching notes of the flags with their versions, withdrawal and acknowledgement. */
export function loadReviews(sqlite: Database.Database, flagIds: string[]): ReviewNote[] {
  return loadNotes(dbOf(sqlite), flagIds);
}

/** Finds a queue flag; 404 when it does not exist, 403 when it belongs to another unit. */
function findFlag(ctx: AppContext, flagId: string, unitIds: string[]): FlagRow {
  const { db } = ctx.database;
  const unit = db
    .select({ unitId: flagsTable.unitId })
    .from(flagsTable)
    .where(and(eq(flagsTable.id, flagId), inArray(flagsTable.kind, QUEUE_KINDS)))
    .get();
  if (!unit) throw notFound('That review item');
  if (!unitIds.includes(unit.unitId)) throw forbidden('This item belongs to a unit you are not part of.');
  return loadFlagRows(db, [unit.unitId], flagId)[0]!;
}

/** Close a review item with no teaching point (the review's status, not the flag's). */
export function closeWithNoTeachingPoint(ctx: AppContext, flagId: string, comment: string | undefined, auth: { userId: string; unitIds: string[] }) {
  const row = findFlag(ctx, flagId, auth.unitIds);
  return closeNoTeachingPoint(ctx, { id: row.id, unitId: row.unitId }, comment, auth);
}

/** The event in full: readings from 3 hours before the flag to an hour after it closed (or was raised). An audited chart read. */
export function reviewItemDetail(ctx: AppContext, flagId: string, auth: { userId: string; unitIds: string[] }, unit: TempUnit = 'C'): ReviewItemDetail {
  const { sqlite, db } = ctx.database;
  const row = findFlag(ctx, flagId, auth.unitIds);
  const status = reviewStatusOf(db, flagId);
  const item = toItem(db, row, status, unit);
  const from = row.raisedMs - 3 * 60 * MINUTE;
  const to = Math.max(row.closedAt?.getTime() ?? row.raisedMs, row.firstActionAt?.getTime() ?? 0, row.raisedMs) + 60 * MINUTE;
  const correction = alias(readings, 'correction');
  const around = db
    .select({
      id: readings.id,
      takenAt: readings.takenAt,
      recordedBy: readings.recordedBy,
      byName: users.name,
      probeCenti: readings.probeCenti,
      remoteCenti: readings.remoteCenti,
      remoteSite: readings.remoteSite,
      controlMode: readings.controlMode,
      heaterOutputPct: readings.heaterOutputPct,
      heartRate: readings.heartRate,
      note: readings.note,
      correctedBy: correction.id,
    })
    .from(readings)
    .innerJoin(users, eq(users.id, readings.recordedBy))
    .leftJoin(correction, eq(correction.replacesId, readings.id))
    .where(and(eq(readings.infantId, row.infantId), between(readings.takenAt, new Date(from), new Date(to))))
    .orderBy(asc(readings.takenAt), asc(readings.recordedAt))
    .all()
    .map((r) => ({
      id: r.id,
      takenAt: r.takenAt.toISOString(),
      recordedBy: { id: r.recordedBy, name: r.byName },
      probeCenti: r.probeCenti,
      remoteCenti: r.remoteCenti,
      remoteSite: r.remoteSite,
      controlMode: r.controlMode,
      heaterOutputPct: r.heaterOutputPct,
      heartRate: r.heartRate,
      note: r.note,
      raisedFlag: r.id === row.raisedByReadingId,
      replaced: r.correctedBy !== null,
    }));
  const done = db
    .select({ id: actions.id, kind: actions.kind, note: actions.note, at: actions.at, byId: users.id, byName: users.name })
    .from(actions)
    .innerJoin(users, eq(users.id, actions.recordedBy))
    .where(eq(actions.flagId, flagId))
    .orderBy(asc(actions.at), asc(actions.id))
    .all()
    .map((a) => ({ id: a.id, kind: a.kind, note: a.note, at: a.at.toISOString(), by: { id: a.byId, name: a.byName } }));
  sqlite
    .transaction(() =>
      appendAudit(sqlite, {
        at: ctx.clock.now(),
        actorId: auth.userId,
        action: 'chart-read',
        entityType: 'flag',
        entityId: flagId,
        unitId: row.unitId,
        after: { view: 'review-item' },
      }),
    )
    .immediate();
  return {
    item,
    detail: JSON.parse(row.detail) as Record<string, unknown>,
    readings: around,
    actions: done,
    reviews: loadReviews(sqlite, [flagId]),
    noTeachingPoint: status.noTeachingPoint,
  };
}

/** Append a teaching note (reviews are append-only: a second note is a new row). */
export function addTeachingNote(ctx: AppContext, flagId: string, note: string, auth: { userId: string; unitIds: string[] }): ReviewNote {
  const { sqlite } = ctx.database;
  const row = findFlag(ctx, flagId, auth.unitIds);
  const id = randomUUID();
  const now = ctx.clock.now();
  sqlite
    .transaction(() => {
      dbOf(sqlite).insert(reviews).values({ id, flagId, unitId: row.unitId, reviewerId: auth.userId, note, createdAt: now }).run();
      appendAudit(sqlite, { at: now, actorId: auth.userId, action: 'review-note', entityType: 'review', entityId: id, unitId: row.unitId, after: { flagId, note } });
    })
    .immediate();
  return loadReviews(sqlite, [flagId]).find((r) => r.id === id)!;
}

/** The nurse concerned with a flag (the queue's rule), or null. */
export function nurseConcerned(ctx: AppContext, flagId: string): string | null {
  const { db } = ctx.database;
  const unit = db.select({ unitId: flagsTable.unitId }).from(flagsTable).where(eq(flagsTable.id, flagId)).get();
  const row = unit ? loadFlagRows(db, [unit.unitId], flagId)[0] : undefined;
  if (!row) return null;
  return nurseFor(db, row, shiftAt(row.raisedAt, row)).nurse?.id ?? null;
}

/**
 * Teaching notes on flags where the signed-in nurse is the nurse concerned, newest first.
 * A withdrawn note is no longer shown to her; an amended one shows its current version.
 */
export function myReviewNotes(ctx: AppContext, auth: { userId: string; unitIds: string[] }): MyReviewNote[] {
  const { sqlite, db } = ctx.database;
  const flagIds = auth.unitIds.length
    ? [
        ...new Set(
          db
            .select({ flagId: reviews.flagId })
            .from(reviews)
            .where(inArray(reviews.unitId, auth.unitIds))
            .all()
            .map((r) => r.flagId),
        ),
      ]
    : [];
  const notes: MyReviewNote[] = [];
  for (const flagId of flagIds) {
    const unit = db.select({ unitId: flagsTable.unitId }).from(flagsTable).where(eq(flagsTable.id, flagId)).get();
    const row = unit ? loadFlagRows(db, [unit.unitId], flagId)[0] : undefined;
    if (!row) continue;
    const item = toItem(db, row);
    if (item.nurse?.id !== auth.userId) continue;
    for (const n of loadReviews(sqlite, [flagId])) if (!n.withdrawn) notes.push({ ...n, kind: item.kind, infantName: item.infantName, raisedAt: item.raisedAt });
  }
  return notes.sort((a, b) => (a.createdAt < b.createdAt ? 1 : a.createdAt > b.createdAt ? -1 : 0));
}

/** The infants (and their units) these flags are about, for the read's audit. */
export function infantsOfFlags(ctx: AppContext, flagIds: string[]): { infantId: string; unitId: string }[] {
  if (flagIds.length === 0) return [];
  return ctx.database.db.select({ infantId: flagsTable.infantId, unitId: flagsTable.unitId }).from(flagsTable).where(inArray(flagsTable.id, flagIds)).all();
}

/** Per nurse concerned, over a range of local dates in one unit: flags, review outcomes and the median minutes to first action. */
export function nurseSummary(ctx: AppContext, query: UnitRangeQuery): NurseSummaryResponse {
  const { items } = reviewQueue(ctx, [query.unitId], { unitId: query.unitId, from: query.from, to: query.to, status: 'all', limit: 'all' });
  const byNurse = new Map<string, { nurse: PersonRef; items: ReviewQueueItem[] }>();
  let withoutNurse = 0;
  for (const i of items) {
    if (i.withdrawn) continue; // withdrawn flags are not the nurse's to learn from
    if (!i.nurse) {
      withoutNurse += 1;
      continue;
    }
    const entry = byNurse.get(i.nurse.id) ?? { nurse: i.nurse, items: [] };
    entry.items.push(i);
    byNurse.set(i.nurse.id, entry);
  }
  const nurses: NurseSummaryRow[] = [...byNurse.values()]
    .map(({ nurse, items: mine }) => {
      const byKind: Record<string, number> = {};
      for (const i of mine) byKind[i.kind] = (byKind[i.kind] ?? 0) + 1;
      const count = (state: string) => mine.filter((i) => i.reviewState === state).length;
      return {
        nurse,
        flags: mine.length,
        byKind,
        noted: count('noted') + count('acknowledged'),
        acknowledged: count('acknowledged'),
        noTeachingPoint: count('no-teaching-point'),
        unreviewed: count('unreviewed'),
        medianMinutesToAction: median(mine.filter((i) => i.minutesToFirstAction !== null).map((i) => i.minutesToFirstAction!)),
      };
    })
    .sort((a, b) => a.nurse.name.localeCompare(b.nurse.name));
  return { unitId: query.unitId, from: query.from, to: query.to, nurses, withoutNurse };
}
