import type { Bundle } from 'fhir/r4';
import { and, asc, eq, gte, lt } from 'drizzle-orm';
import { alias } from 'drizzle-orm/sqlite-core';
import { writeTx } from '../../db/client';
import { infants, readings, users } from '../../db/schema';
import { toCsv } from '../../shared/csv';
import type { ReviewNote, ReviewQueueItem } from '../../shared/types/review';
import type { ReviewQueueQuery, UnitRangeQuery } from '../../shared/schemas/review';
import { appendAudit, type AuditInput } from '../audit';
import type { AppContext } from '../context';
import { badRequest, forbidden, notFound } from '../errors';
import { bedAtLookup } from './bed-stays';
import { fhirBundle, infantsWithReadings } from './fhir';
import { unitWindow } from './reports';
import { loadReviews, reviewQueue } from './review';

export { LOINC, SNOMED, UCUM, WARMFOLD_CODES } from './fhir';

const c = (centi: number | null) => (centi === null ? null : centi / 100);

function audit(ctx: AppContext, input: Omit<AuditInput, 'at'>): void {
  const { sqlite } = ctx.database;
  writeTx(sqlite, () => appendAudit(sqlite, { at: ctx.clock.now(), ...input }));
}

/** An infant of the unit named in the query, or a 400 naming `infantId`. */
function infantOfUnit(ctx: AppContext, unitId: string, infantId: string): { id: string; displayName: string } {
  const row = ctx.database.db.select({ id: infants.id, displayName: infants.displayName, unitId: infants.unitId }).from(infants).where(eq(infants.id, infantId)).get();
  if (!row || row.unitId !== unitId) throw badRequest('Choose an infant of this unit.', { infantId: 'No infant with this id in this unit.' });
  return row;
}

/**
 * Every reading row (corrections and withdrawn rows included, so the file is the whole record)
 * of a unit in a range of local dates, or of one infant of it; the bed is the bed at the time.
 */
export function readingsCsv(ctx: AppContext, query: UnitRangeQuery & { infantId?: string }, actorId: string): string {
  const { db, sqlite } = ctx.database;
  const w = unitWindow(sqlite, query);
  if (query.infantId) infantOfUnit(ctx, w.unit.id, query.infantId);
  const recorder = alias(users, 'recorder');
  const taker = alias(users, 'taker');
  const rows = db
    .select({ r: readings, infant: infants.displayName, recorder: recorder.name, taker: taker.name })
    .from(readings)
    .innerJoin(infants, eq(infants.id, readings.infantId))
    .innerJoin(recorder, eq(recorder.id, readings.recordedBy))
    .leftJoin(taker, eq(taker.id, readings.takenBy))
    .where(
      and(
        eq(readings.unitId, w.unit.id),
        gte(readings.takenAt, new Date(w.fromMs)),
        lt(readings.takenAt, new Date(w.toMs)),
        query.infantId ? eq(readings.infantId, query.infantId) : undefined,
      ),
    )
    .orderBy(asc(readings.takenAt), asc(readings.recordedAt), asc(readings.id))
    .all();
  const bedAt = bedAtLookup(
    db,
    rows.map((x) => x.r.infantId),
  );
  audit(ctx, {
    actorId,
    action: 'export-readings-csv',
    entityType: query.infantId ? 'infant' : 'unit',
    entityId: query.infantId ?? w.unit.id,
    unitId: w.unit.id,
    after: { ...query, rows: rows.length, infantIds: [...new Set(rows.map((x) => x.r.infantId))] },
  });
  return toCsv(
    [
      'reading_id',
      'infant_id',
      'infant',
      'bed',
      'taken_at',
      'recorded_at',
      'recorded_by',
      'taken_by',
      'source',
      'probe_c',
      'remote_c',
      'remote_site',
      'air_c',
      'set_c',
      'control_mode',
      'heater_output_pct',
      'heart_rate',
      'note',
      'replaces_id',
      'correction_reason',
      'entered_in_error',
    ],
    rows.map(({ r, infant, recorder: by, taker: takenBy }) => [
      r.id,
      r.infantId,
      infant,
      bedAt(r.infantId, r.takenAt),
      r.takenAt.toISOString(),
      r.recordedAt.toISOString(),
      by,
      // A bedside row was taken by whoever charted it; an imported row only by the nurse the file named.
      r.uploadId === null ? by : takenBy,
      r.uploadId === null ? 'bedside' : 'import',
      c(r.probeCenti),
      c(r.remoteCenti),
      r.remoteSite,
      c(r.airCenti),
      c(r.setCenti),
      r.controlMode,
      r.heaterOutputPct,
      r.heartRate,
      r.note,
      r.replacesId,
      r.correctionReason,
      r.enteredInError,
    ]),
  );
}

/** The flags with their teaching notes written out (reviewer, date and text), one cell per flag. */
export function flagsCsv(items: ReviewQueueItem[], notes: ReviewNote[]): string {
  const byFlag = new Map<string, ReviewNote[]>();
  for (const n of notes) byFlag.set(n.flagId, [...(byFlag.get(n.flagId) ?? []), n]);
  return toCsv(
    [
      'flag_id',
      'kind',
      'unit',
      'infant',
      'bed',
      'raised_at',
      'shift',
      'shift_date',
      'nurse',
      'imported_by',
      'summary',
      'first_action_at',
      'closed_at',
      'minutes_to_first_action',
      'minutes_to_resolution',
      'teaching_note_count',
      'teaching_notes',
    ],
    items.map((i) => [
      i.flagId,
      i.kind,
      i.unitName,
      i.infantName,
      i.bedLabel,
      i.raisedAt,
      i.shift,
      i.shiftDate,
      i.nurse?.name ?? null,
      i.importedBy?.name ?? null,
      i.summary,
      i.firstActionAt,
      i.closedAt,
      i.minutesToFirstAction,
      i.minutesToResolution,
      i.reviewCount,
      (byFlag.get(i.flagId) ?? [])
        .map((n) => `${n.createdAt.slice(0, 10)} ${n.reviewer.name}: ${n.note}${n.version > 1 ? ` (amended, version ${n.version})` : ''}${n.withdrawn ? ' (withdrawn)' : ''}`)
        .join('\n') || null,
    ]),
  );
}

/** Every flag of the queue's filters (never one page of them) with its teaching notes, as CSV; an audited export. */
export function flagsCsvExport(ctx: AppContext, unitIds: string[], query: ReviewQueueQuery, actorId: string): string {
  const { items } = reviewQueue(ctx, unitIds, { ...query, cursor: undefined, limit: 'all' });
  const after = { ...query, rows: items.length, infantIds: [...new Set(items.map((i) => i.infantId))] };
  audit(ctx, { actorId, action: 'export-flags-csv', entityType: 'flag', entityId: null, unitId: query.unitId ?? null, after });
  return flagsCsv(
    items,
    loadReviews(
      ctx.database.sqlite,
      items.map((i) => i.flagId),
    ),
  );
}

/** One infant's whole record as a FHIR R4 collection Bundle; an audited export. */
export function infantFhirBundle(ctx: AppContext, infantId: string, auth: { userId: string; unitIds: string[] }): Bundle {
  const infant = ctx.database.db.select({ id: infants.id, unitId: infants.unitId }).from(infants).where(eq(infants.id, infantId)).get();
  if (!infant) throw notFound('That infant');
  if (!auth.unitIds.includes(infant.unitId)) throw forbidden('This infant belongs to a unit you are not part of.');
  const { bundle, observations } = fhirBundle(ctx.database.db, [infant.id], ctx.clock.now());
  audit(ctx, { actorId: auth.userId, action: 'export-fhir', entityType: 'infant', entityId: infant.id, unitId: infant.unitId, after: { observations } });
  return bundle;
}

/** The readings of a unit in a range of local dates (or of one infant of it) as a FHIR R4 collection Bundle. */
export function unitFhirBundle(ctx: AppContext, query: UnitRangeQuery & { infantId?: string }, actorId: string): Bundle {
  const { db, sqlite } = ctx.database;
  const w = unitWindow(sqlite, query);
  if (query.infantId) infantOfUnit(ctx, w.unit.id, query.infantId);
  const ids = query.infantId ? [query.infantId] : infantsWithReadings(db, w.unit.id, w);
  const { bundle, observations } = fhirBundle(db, ids, ctx.clock.now(), w);
  audit(ctx, {
    actorId,
    action: 'export-fhir',
    entityType: query.infantId ? 'infant' : 'unit',
    entityId: query.infantId ?? w.unit.id,
    unitId: w.unit.id,
    after: { ...query, patients: ids.length, infantIds: ids, observations },
  });
  return bundle;
}
