import type Database from 'better-sqlite3';
import { randomUUID } from 'node:crypto';
import { REVIEW_KINDS, type ReviewKind, type ReviewQueueQuery } from '../../shared/schemas/review';
import { shiftAt } from '../../shared/shifts';
import { eq, inArray } from 'drizzle-orm';
import { flags as flagsTable, reviews, users } from '../../db/schema';
import { median } from '../../shared/reports';
import { FEVER_MIN_CENTI, NORMAL_MAX_CENTI } from '../../shared/thermal/bands';
import { HEART_RATE_HIGH_ABOVE } from '../../shared/thermal/heat-stress';
import { formatTemperature, HEAT_STRESS_SIGN_LABELS, type TempUnit } from '../../shared/thermal';
import type { UnitRangeQuery } from '../../shared/schemas/review';
import type { MyReviewNote, NurseSummaryResponse, NurseSummaryRow, PersonRef, ReviewItemDetail, ReviewNote, ReviewQueueItem, ReviewQueueResponse } from '../../shared/types/review';
import { dbOf } from './flag-lifecycle';
import { loadNotes, reviewStatuses, reviewStatusOf, UNREVIEWED, type ReviewStatusOf } from './review-loop';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { badRequest, forbidden, notFound } from '../errors';
import { bedAtLookup } from './bed-stays';
import { BAND_LABELS } from '../../shared/thermal/bands';

interface FlagRow {
  id: string;
  kind: ReviewKind;
  unit_id: string;
  unit_name: string;
  time_zone: string;
  day_shift_start: string;
  night_shift_start: string;
  infant_id: string;
  infant_name: string;
  bed_label: string | null;
  raised_at: number;
  raised_by_reading_id: string | null;
  detail: string;
  reading_by: string | null;
  reading_by_name: string | null;
  reading_upload_id: string | null;
  hospital_number: string | null;
  first_action_at: number | null;
  closed_at: number | null;
  how: string | null;
  review_count: number;
  last_review_at: number | null;
  reading_recorder: string | null;
  reading_recorder_name: string | null;
}

const MINUTE = 60_000;
const KIND_LIST = REVIEW_KINDS.map((k) => `'${k}'`).join(', ');

/** Local calendar date of an instant in a zone, YYYY-MM-DD. */
export function localDateOf(instant: Date, timeZone: string): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(instant);
}

function loadFlagRows(sqlite: Database.Database, unitIds: string[], flagId?: string): FlagRow[] {
  if (unitIds.length === 0) return [];
  const marks = unitIds.map(() => '?').join(', ');
  return sqlite
    .prepare(
      `SELECT f.id, f.kind, f.unit_id, u.name AS unit_name, u.time_zone, u.day_shift_start, u.night_shift_start,
              f.infant_id, i.display_name AS infant_name, b.label AS bed_label, f.raised_at, f.raised_by_reading_id, f.detail,
              CASE WHEN r.upload_id IS NULL THEN r.recorded_by ELSE r.taken_by END AS reading_by, ru.name AS reading_by_name, r.upload_id AS reading_upload_id,
              r.recorded_by AS reading_recorder, rec.name AS reading_recorder_name, i.hospital_number,
              (SELECT MIN(a.at) FROM actions a WHERE a.flag_id = f.id) AS first_action_at,
              fr.closed_at,
              -- A flag closed before its raising reading was corrected away was withdrawn later (an event).
              CASE WHEN EXISTS (SELECT 1 FROM flag_events e WHERE e.flag_id = f.id AND e.event = 'withdrawn') THEN 'withdrawn' ELSE fr.how END AS how,
              (SELECT COUNT(*) FROM reviews v WHERE v.flag_id = f.id) AS review_count,
              (SELECT MAX(v.created_at) FROM reviews v WHERE v.flag_id = f.id) AS last_review_at
         FROM flags f
         JOIN units u ON u.id = f.unit_id
         JOIN infants i ON i.id = f.infant_id
         LEFT JOIN beds b ON b.id = i.bed_id
         LEFT JOIN readings r ON r.id = f.raised_by_reading_id
         LEFT JOIN users ru ON ru.id = CASE WHEN r.upload_id IS NULL THEN r.recorded_by ELSE r.taken_by END
         LEFT JOIN users rec ON rec.id = r.recorded_by
         LEFT JOIN flag_resolutions fr ON fr.flag_id = f.id
        WHERE f.kind IN (${KIND_LIST}) AND f.unit_id IN (${marks}) ${flagId ? 'AND f.id = ?' : ''}
        ORDER BY f.raised_at DESC, f.id`,
    )
    .all(...unitIds, ...(flagId ? [flagId] : [])) as FlagRow[];
}

function assignedNurse(sqlite: Database.Database, infantId: string, shiftDate: string, shift: string): PersonRef | null {
  const row = sqlite
    .prepare(
      `SELECT n.id, n.name FROM assignments a JOIN users n ON n.id = a.nurse_id
        WHERE a.infant_id = ? AND a.shift_date = ? AND a.shift = ? ORDER BY a.created_at DESC LIMIT 1`,
    )
    .get(infantId, shiftDate, shift) as PersonRef | undefined;
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
      return `${typeof detail.band === 'string' ? (BAND_LABELS as Record<string, string>)[detail.band] ?? 'Cold stress' : 'Cold stress'}: lowest remote site ${t(detail.lowestCenti)}`;
    case 'fever':
      return `Remote site ${t(detail.highestCenti)} (${t(FEVER_MIN_CENTI)} or over)`;
    case 'skin-to-skin-deviation':
      return typeof detail.deviationCenti === 'number'
        ? `${detail.deviationCenti < 0 ? 'Colder' : 'Warmer'} than the reference ${t(detail.referenceCenti)} during skin-to-skin`
        : 'Skin-to-skin deviation';
  }
}

/** The nurse concerned with a flag: who charted the raising reading, or for an overdue check the nurse assigned. */
function nurseFor(sqlite: Database.Database, row: FlagRow, slot: { shiftDate: string; shift: string }) {
  const recorder = row.reading_by ? { id: row.reading_by, name: row.reading_by_name ?? '' } : null;
  const importedBy = row.reading_upload_id !== null && row.reading_by === null && row.reading_recorder ? { id: row.reading_recorder, name: row.reading_recorder_name ?? '' } : null;
  const nurse =
    row.kind === 'overdue-check'
      ? (assignedNurse(sqlite, row.infant_id, slot.shiftDate, slot.shift) ?? recorder)
      : importedBy
        ? null
        : (recorder ?? assignedNurse(sqlite, row.infant_id, slot.shiftDate, slot.shift));
  return { nurse, importedBy };
}

function toItem(sqlite: Database.Database, row: FlagRow, status: ReviewStatusOf = UNREVIEWED, unit: TempUnit = 'C'): ReviewQueueItem {
  const raisedAt = new Date(row.raised_at);
  const slot = shiftAt(raisedAt, { dayShiftStart: row.day_shift_start, nightShiftStart: row.night_shift_start, timeZone: row.time_zone });
  const detail = JSON.parse(row.detail) as Record<string, unknown>;
  // An imported reading credits the nurse the file named; a file that named nobody credits no nurse, and the uploader is shown as who imported it.
  const { nurse, importedBy } = nurseFor(sqlite, row, slot);
  const mins = (at: number | null) => (at === null ? null : Math.max(0, Math.round((at - row.raised_at) / MINUTE)));
  return {
    flagId: row.id,
    kind: row.kind,
    unitId: row.unit_id,
    unitName: row.unit_name,
    timeZone: row.time_zone,
    infantId: row.infant_id,
    infantName: row.infant_name,
    bedLabel: row.bed_label,
    raisedAt: raisedAt.toISOString(),
    shift: slot.shift,
    shiftDate: slot.shiftDate,
    nurse,
    importedBy,
    // A withdrawn overdue check was on time after all: it never describes itself as late.
    summary: row.how === 'withdrawn' && row.kind === 'overdue-check' ? 'Remote-site check charted on time (withdrawn)' : summaryOf(row.kind, detail, unit),
    firstActionAt: row.first_action_at === null ? null : new Date(row.first_action_at).toISOString(),
    closedAt: row.closed_at === null ? null : new Date(row.closed_at).toISOString(),
    // A late entry or correction showed it should not have been raised: never a late check.
    withdrawn: row.how === 'withdrawn',
    minutesToFirstAction: mins(row.first_action_at),
    minutesToResolution: row.how === 'withdrawn' ? null : mins(row.closed_at),
    reviewCount: status.current,
    lastReviewedAt: status.lastAt === null ? null : new Date(status.lastAt).toISOString(),
    reviewState: status.state,
  };
}

const encodeCursor = (row: { raised_at: number; id: string }) => Buffer.from(`${row.raised_at}.${row.id}`, 'utf8').toString('base64url');

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
  const { sqlite } = ctx.database;
  const units = unitIds.length
    ? (sqlite.prepare(`SELECT id, name FROM units WHERE id IN (${unitIds.map(() => '?').join(', ')}) ORDER BY name`).all(...unitIds) as Array<{ id: string; name: string }>)
    : [];
  const scope = query.unitId ? unitIds.filter((u) => u === query.unitId) : unitIds;
  const loaded = loadFlagRows(sqlite, scope);
  const bedAt = bedAtLookup(ctx.database.db, loaded.map((r) => r.infant_id));
  for (const r of loaded) r.bed_label = bedAt(r.infant_id, r.raised_at) ?? r.bed_label;
  const statuses = reviewStatuses(dbOf(sqlite), scope);
  const statusOf = (flagId: string) => statuses.get(flagId) ?? UNREVIEWED;
  const needle = query.q?.trim().toLowerCase();
  const rows = loaded.filter((r) => {
    if (query.kind && r.kind !== query.kind) return false;
    if (query.infantId && r.infant_id !== query.infantId) return false;
    if (needle && ![r.infant_name, r.bed_label ?? '', r.hospital_number ?? ''].some((v) => v.toLowerCase().includes(needle))) return false;
    if (query.from || query.to) {
      const date = localDateOf(new Date(r.raised_at), r.time_zone);
      if (query.from && date < query.from) return false;
      if (query.to && date > query.to) return false;
    }
    // Reviewed: a current teaching note, or closed with no teaching point (the review's own status).
    if (query.status === 'reviewed' && statusOf(r.id).state === 'unreviewed') return false;
    if (query.status === 'unreviewed' && statusOf(r.id).state !== 'unreviewed') return false;
    return true;
  });
  const all = rows.map((r) => ({ row: r, item: toItem(sqlite, r, statusOf(r.id), unit) }));
  const nurses = new Map<string, PersonRef>();
  for (const { item } of all) if (item.nurse) nurses.set(item.nurse.id, item.nurse);
  const matching = all.filter(({ item: i }) => (!query.shift || i.shift === query.shift) && (!query.nurseId || i.nurse?.id === query.nurseId));
  const after = query.cursor ? decodeCursor(query.cursor) : null;
  const rest = after ? matching.filter(({ row }) => row.raised_at < after.at || (row.raised_at === after.at && row.id > after.id)) : matching;
  const limit = query.limit === 'all' ? rest.length : (query.limit ?? 200);
  const page = rest.slice(0, limit);
  const last = page[page.length - 1];
  return {
    items: page.map((p) => p.item),
    total: matching.length,
    nextCursor: rest.length > page.length && last ? encodeCursor(last.row) : null,
    nurses: [...nurses.values()].sort((a, b) => a.name.localeCompare(b.name)),
    units,
  };
}

/** The teaching notes of the flags with their versions, withdrawal and acknowledgement. */
export function loadReviews(sqlite: Database.Database, flagIds: string[]): ReviewNote[] {
  return loadNotes(dbOf(sqlite), flagIds);
}

/** Finds a queue flag; 404 when it does not exist, 403 when it belongs to another unit. */
export function findFlag(ctx: AppContext, flagId: string, unitIds: string[]): FlagRow {
  const { sqlite } = ctx.database;
  const unit = sqlite.prepare(`SELECT unit_id FROM flags WHERE id = ? AND kind IN (${KIND_LIST})`).get(flagId) as { unit_id: string } | undefined;
  if (!unit) throw notFound('That review item');
  if (!unitIds.includes(unit.unit_id)) throw forbidden('This item belongs to a unit you are not part of.');
  return loadFlagRows(sqlite, [unit.unit_id], flagId)[0]!;
}

/** The event in full: readings from 3 hours before the flag to an hour after it closed (or was raised). An audited chart read. */
export function reviewItemDetail(ctx: AppContext, flagId: string, auth: { userId: string; unitIds: string[] }, unit: TempUnit = 'C'): ReviewItemDetail {
  const { sqlite } = ctx.database;
  const row = findFlag(ctx, flagId, auth.unitIds);
  const status = reviewStatusOf(dbOf(sqlite), flagId);
  const item = toItem(sqlite, row, status, unit);
  const from = row.raised_at - 3 * 60 * MINUTE;
  const to = Math.max(row.closed_at ?? row.raised_at, row.first_action_at ?? 0, row.raised_at) + 60 * MINUTE;
  const readings = (
    sqlite
      .prepare(
        `SELECT r.id, r.taken_at, r.recorded_by, u.name AS by_name, r.probe_centi, r.remote_centi, r.remote_site, r.control_mode, r.heater_output_pct,
                r.heart_rate, r.note, EXISTS (SELECT 1 FROM readings c WHERE c.replaces_id = r.id) AS replaced
           FROM readings r JOIN users u ON u.id = r.recorded_by
          WHERE r.infant_id = ? AND r.taken_at BETWEEN ? AND ? ORDER BY r.taken_at, r.recorded_at`,
      )
      .all(row.infant_id, from, to) as Array<{
      id: string; taken_at: number; recorded_by: string; by_name: string; probe_centi: number | null; remote_centi: number | null; remote_site: string | null;
      control_mode: string | null; heater_output_pct: number | null; heart_rate: number | null; note: string | null; replaced: number;
    }>
  ).map((r) => ({
    id: r.id,
    takenAt: new Date(r.taken_at).toISOString(),
    recordedBy: { id: r.recorded_by, name: r.by_name },
    probeCenti: r.probe_centi,
    remoteCenti: r.remote_centi,
    remoteSite: r.remote_site,
    controlMode: r.control_mode,
    heaterOutputPct: r.heater_output_pct,
    heartRate: r.heart_rate,
    note: r.note,
    raisedFlag: r.id === row.raised_by_reading_id,
    replaced: r.replaced === 1,
  }));
  const actions = (
    sqlite
      .prepare('SELECT a.id, a.kind, a.note, a.at, u.id AS by_id, u.name AS by_name FROM actions a JOIN users u ON u.id = a.recorded_by WHERE a.flag_id = ? ORDER BY a.at, a.id')
      .all(flagId) as Array<{ id: string; kind: string; note: string | null; at: number; by_id: string; by_name: string }>
  ).map((a) => ({ id: a.id, kind: a.kind, note: a.note, at: new Date(a.at).toISOString(), by: { id: a.by_id, name: a.by_name } }));
  ctx.database.sqlite
    .transaction(() =>
      appendAudit(sqlite, { at: ctx.clock.now(), actorId: auth.userId, action: 'chart-read', entityType: 'flag', entityId: flagId, unitId: row.unit_id, after: { view: 'review-item' } }),
    )
    .immediate();
  return { item, detail: JSON.parse(row.detail) as Record<string, unknown>, readings, actions, reviews: loadReviews(sqlite, [flagId]), noTeachingPoint: status.noTeachingPoint };
}

/** Append a teaching note (reviews are append-only: a second note is a new row). */
export function addTeachingNote(ctx: AppContext, flagId: string, note: string, auth: { userId: string; unitIds: string[] }): ReviewNote {
  const { sqlite } = ctx.database;
  const row = findFlag(ctx, flagId, auth.unitIds);
  const id = randomUUID();
  const now = ctx.clock.now();
  sqlite
    .transaction(() => {
      dbOf(sqlite).insert(reviews).values({ id, flagId, unitId: row.unit_id, reviewerId: auth.userId, note, createdAt: now }).run();
      appendAudit(sqlite, { at: now, actorId: auth.userId, action: 'review-note', entityType: 'review', entityId: id, unitId: row.unit_id, after: { flagId, note } });
    })
    .immediate();
  return loadReviews(sqlite, [flagId]).find((r) => r.id === id)!;
}

/** The nurse concerned with a flag (the queue's rule), or null. */
export function nurseConcerned(ctx: AppContext, flagId: string): string | null {
  const { sqlite } = ctx.database;
  const unit = dbOf(sqlite).select({ unitId: flagsTable.unitId }).from(flagsTable).where(eq(flagsTable.id, flagId)).get();
  const row = unit ? loadFlagRows(sqlite, [unit.unitId], flagId)[0] : undefined;
  if (!row) return null;
  const slot = shiftAt(new Date(row.raised_at), { dayShiftStart: row.day_shift_start, nightShiftStart: row.night_shift_start, timeZone: row.time_zone });
  return nurseFor(sqlite, row, slot).nurse?.id ?? null;
}

/**
 * Teaching notes on flags where the signed-in nurse is the nurse concerned, newest first.
 * A withdrawn note is no longer shown to her; an amended one shows its current version.
 */
export function myReviewNotes(ctx: AppContext, auth: { userId: string; unitIds: string[] }): MyReviewNote[] {
  const { sqlite } = ctx.database;
  const db = dbOf(sqlite);
  const flagIds = auth.unitIds.length ? [...new Set(db.select({ flagId: reviews.flagId }).from(reviews).where(inArray(reviews.unitId, auth.unitIds)).all().map((r) => r.flagId))] : [];
  const notes: MyReviewNote[] = [];
  for (const flagId of flagIds) {
    const unit = db.select({ unitId: flagsTable.unitId }).from(flagsTable).where(eq(flagsTable.id, flagId)).get();
    const row = unit ? loadFlagRows(sqlite, [unit.unitId], flagId)[0] : undefined;
    if (!row) continue;
    const item = toItem(sqlite, row);
    if (item.nurse?.id !== auth.userId) continue;
    for (const n of loadReviews(sqlite, [flagId])) if (!n.withdrawn) notes.push({ ...n, kind: item.kind, infantName: item.infantName, raisedAt: item.raisedAt });
  }
  return notes.sort((a, b) => (a.createdAt < b.createdAt ? 1 : a.createdAt > b.createdAt ? -1 : 0));
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
