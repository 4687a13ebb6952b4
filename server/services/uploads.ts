import { createHash, randomUUID } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { and, eq, inArray, isNull } from 'drizzle-orm';
import { decodeCsvBytes, parseCsvLines } from '../../shared/uploads/csv-text';
import { toCsv } from '../../shared/csv';
import {
  checkReadingRow,
  checkRosterRow,
  MAX_UPLOAD_ROWS,
  missingColumns,
  READINGS_COLUMNS,
  READINGS_REQUIRED,
  ROSTER_COLUMNS,
  type ParsedReadingRow,
  type Row,
  type RosterRow,
} from '../../shared/uploads/csv-formats';
import type { ImportResult, UploadPreview, UploadRowPreview } from '../../shared/types/admin';
import type { Database_ } from '../../db/client';
import { beds, infants, readings, uploads, userUnits, units, users } from '../../db/schema';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { badRequest, forbidden, notFound } from '../errors';
import { accountFor, createUserRows } from './admin-users';
import { mailLinkSafely, type IssuedLink } from './email-links';
import { syncFlags } from './flags';

export function uploadsDir(ctx: AppContext): string {
  return path.join(ctx.config.dataDir, 'uploads');
}

/** A file the upload route has written under the uploads folder. */
export interface UploadedFile {
  /** Where it is on disk. */
  path: string;
  /** Its name on the uploader's machine. */
  originalName: string;
  size: number;
}

/** Who uploads: the signed-in person and their units. */
export interface Uploader {
  userId: string;
  unitIds: string[];
}

type UploadRow = typeof uploads.$inferSelect;

function removeFile(file: string): void {
  fs.rm(file, { force: true }, () => {});
}

interface ParsedFile {
  rows: { line: number; values: Row }[];
  header: string[];
  /** A row that could not be read (an unclosed quote, a wrong number of cells), by line. */
  parseErrors: Map<number, string>;
}

/** One row per line, comma or semicolon (shared/uploads/csv-text.ts); line numbers count the header as 1. */
export function parseCsv(text: string): ParsedFile {
  const parsed = parseCsvLines(text);
  const parseErrors = new Map<number, string>();
  for (const r of parsed.rows) if (r.error) parseErrors.set(r.line, r.error);
  return { rows: parsed.rows.map(({ line, values }) => ({ line, values })), header: parsed.header, parseErrors };
}

/** The file's text, or a 400 saying why it is not UTF-8 text (the file is removed). */
function readText(file: string, remove: boolean): string {
  const decoded = decodeCsvBytes(fs.readFileSync(file));
  if ('error' in decoded) {
    if (remove) removeFile(file);
    throw badRequest('The file cannot be read as text.', { file: decoded.error });
  }
  return decoded.text;
}

function sha256(file: string): string {
  return createHash('sha256').update(fs.readFileSync(file)).digest('hex');
}

/**
 * Keep a newly uploaded file as an upload row, unless the same content was uploaded before
 * (same kind, same unit): then the new copy is dropped and the earlier upload answers, so a
 * re-upload writes nothing. The row is stored by `saveUploadRow` once the file's header passed.
 */
function registerUpload(ctx: AppContext, file: UploadedFile, uploader: Uploader, kind: 'roster' | 'readings', unitId: string | null): { upload: UploadRow; text: string } {
  const hash = sha256(file.path);
  const text = readText(file.path, true);
  const same = ctx.database.db
    .select()
    .from(uploads)
    .where(and(eq(uploads.kind, kind), eq(uploads.sha256, hash), unitId === null ? isNull(uploads.unitId) : eq(uploads.unitId, unitId)))
    .orderBy(uploads.createdAt)
    .all();
  // The imported one answers if there is one, else the first.
  const earlier = same.find((u) => u.status === 'imported') ?? same[0];
  if (earlier) {
    removeFile(file.path);
    return { upload: earlier, text };
  }
  return {
    upload: {
      id: randomUUID(),
      kind,
      unitId,
      filename: path.basename(file.originalName).slice(0, 200),
      storedName: path.basename(file.path),
      sha256: hash,
      sizeBytes: file.size,
      rowCount: 0,
      status: 'previewed',
      uploadedBy: uploader.userId,
      createdAt: ctx.clock.now(),
      importedAt: null,
    },
    text,
  };
}

function checkHeader(parsed: ParsedFile, required: readonly string[], filePath?: string): void {
  const missing = missingColumns(parsed.header, required);
  if (missing.length) {
    if (filePath) removeFile(filePath);
    throw badRequest('The file does not have the expected columns.', { file: `Missing column${missing.length > 1 ? 's' : ''}: ${missing.join(', ')}.` });
  }
  if (parsed.rows.length === 0) {
    if (filePath) removeFile(filePath);
    throw badRequest('The file has no rows.', { file: 'The file has a header but no rows.' });
  }
  if (parsed.rows.length > MAX_UPLOAD_ROWS) {
    if (filePath) removeFile(filePath);
    throw badRequest('The file has too many rows.', { file: `At most ${MAX_UPLOAD_ROWS} rows per file.` });
  }
}

function saveUploadRow(ctx: AppContext, upload: UploadRow, rowCount: number): void {
  const { db } = ctx.database;
  if (db.select({ id: uploads.id }).from(uploads).where(eq(uploads.id, upload.id)).get()) return;
  upload.rowCount = rowCount;
  db.insert(uploads).values(upload).run();
}

function previewOf(upload: UploadRow, rows: UploadRowPreview[]): UploadPreview {
  const imported = upload.status === 'imported';
  const shown = imported ? rows.map((r) => (r.action === 'create' ? { ...r, action: 'skip' as const, note: 'Imported before' } : r)) : rows;
  return {
    upload: { id: upload.id, kind: upload.kind, filename: upload.filename, sha256: upload.sha256, rowCount: rows.length, status: upload.status },
    alreadyImported: imported,
    rows: shown,
    errorCount: shown.filter((r) => r.action === 'error').length,
    toCreate: shown.filter((r) => r.action === 'create').length,
  };
}

// --------------------------------------------------------------------------------------------
// Roster
// --------------------------------------------------------------------------------------------

function checkRoster(database: Database_, parsed: ParsedFile, adminUnits: string[]): (UploadRowPreview & { value?: RosterRow & { unitId: string } })[] {
  const unitList = database.db.select({ id: units.id, name: units.name }).from(units).all();
  const seen = new Set<string>();
  return parsed.rows.map(({ line, values }) => {
    const parseError = parsed.parseErrors.get(line);
    const { value, errors } = checkRosterRow(values);
    if (parseError) errors.unshift(parseError);
    let unitId: string | undefined;
    if (value) {
      const unit = unitList.find((u) => u.id === value.unit || u.name.toLowerCase() === value.unit.toLowerCase());
      if (!unit) errors.push(`unit: no unit called "${value.unit}"`);
      else if (!adminUnits.includes(unit.id)) errors.push(`unit: "${unit.name}" is not one of your units`);
      else unitId = unit.id;
      if (seen.has(value.email)) errors.push('email: appears more than once in this file');
      seen.add(value.email);
    }
    const shownValues = Object.fromEntries(ROSTER_COLUMNS.map((c) => [c, values[c] ?? '']));
    if (errors.length || !value || !unitId) return { line, values: shownValues, errors, action: 'error' as const };
    // An address with an account only in other units looks like a new one here (accountFor); the import skips it.
    const account = accountFor(database, value.email, adminUnits);
    if (account.visible) return { line, values: shownValues, errors: [], action: 'skip' as const, note: 'Already has an account' };
    if (account.exists) return { line, values: shownValues, errors: [], action: 'create' as const };
    return { line, values: shownValues, errors: [], action: 'create' as const, value: { ...value, unitId } };
  });
}

const strip = <T extends { value?: unknown }>(rows: T[]): UploadRowPreview[] => rows.map(({ value: _v, ...r }) => r as unknown as UploadRowPreview);

export function previewRoster(ctx: AppContext, file: UploadedFile, uploader: Uploader): UploadPreview {
  const { upload, text } = registerUpload(ctx, file, uploader, 'roster', null);
  const parsed = parseCsv(text);
  checkHeader(parsed, ROSTER_COLUMNS, upload.storedName === path.basename(file.path) ? file.path : undefined);
  const rows = checkRoster(ctx.database, parsed, uploader.unitIds);
  saveUploadRow(ctx, upload, rows.length);
  return previewOf(upload, strip(rows));
}

function loadUpload(ctx: AppContext, uploadId: string, kind: 'roster' | 'readings'): { upload: UploadRow; text: string } {
  const upload = ctx.database.db
    .select()
    .from(uploads)
    .where(and(eq(uploads.id, uploadId), eq(uploads.kind, kind)))
    .get();
  if (!upload) throw notFound('That upload');
  const file = path.join(uploadsDir(ctx), upload.storedName);
  if (!fs.existsSync(file)) throw notFound('That uploaded file');
  return { upload, text: readText(file, false) };
}

/** Whether the upload was imported meanwhile: checked again inside the write lock. */
function importedMeanwhile(ctx: AppContext, uploadId: string): boolean {
  return ctx.database.db.select({ status: uploads.status }).from(uploads).where(eq(uploads.id, uploadId)).get()?.status === 'imported';
}

function markImported(ctx: AppContext, uploadId: string, rowCount: number, now: Date): void {
  ctx.database.db.update(uploads).set({ status: 'imported', importedAt: now, rowCount }).where(eq(uploads.id, uploadId)).run();
}

/** Create and invite every new person in one transaction; e-mail the invitations after it commits. */
export async function importRoster(ctx: AppContext, uploadId: string, auth: Uploader): Promise<ImportResult> {
  const { db, sqlite } = ctx.database;
  const { upload, text } = loadUpload(ctx, uploadId, 'roster');
  if (upload.status === 'imported') return { created: 0, skipped: upload.rowCount, alreadyImported: true };
  const parsed = parseCsv(text);
  checkHeader(parsed, ROSTER_COLUMNS);
  const links: IssuedLink[] = [];
  const result = db.transaction(
    () => {
      // Checked again inside the write lock, so two admins importing the same file create nobody twice.
      if (importedMeanwhile(ctx, upload.id)) return { created: 0, skipped: upload.rowCount, alreadyImported: true };
      const rows = checkRoster(ctx.database, parsed, auth.unitIds);
      const bad = rows.filter((r) => r.action === 'error');
      if (bad.length)
        throw badRequest('Some rows have errors; nothing was imported.', {
          file: `${bad.length} row${bad.length > 1 ? 's have' : ' has'} errors (first: line ${bad[0]!.line}). Fix the file and upload it again.`,
        });
      let created = 0;
      for (const r of rows) {
        if (r.action !== 'create' || !r.value) continue;
        const { link } = createUserRows(ctx, { name: r.value.name, email: r.value.email, role: r.value.role, unitIds: [r.value.unitId] }, auth.userId);
        links.push(link);
        created += 1;
      }
      markImported(ctx, upload.id, rows.length, ctx.clock.now());
      appendAudit(sqlite, {
        at: ctx.clock.now(),
        actorId: auth.userId,
        action: 'roster-imported',
        entityType: 'upload',
        entityId: upload.id,
        unitId: null,
        after: { created, skipped: rows.length - created, sha256: upload.sha256 },
      });
      return { created, skipped: rows.length - created, alreadyImported: false };
    },
    { behavior: 'immediate' },
  );
  for (const link of links) await mailLinkSafely(ctx, link);
  return result;
}

// --------------------------------------------------------------------------------------------
// Readings
// --------------------------------------------------------------------------------------------

/** A stable id from the row's content, so the same reading from any file is charted once. */
export function importedReadingId(infantId: string, r: ParsedReadingRow): string {
  const parts: unknown[] = [infantId, r.takenAt.toISOString(), r.probeCenti, r.remoteCenti, r.remoteSite, r.controlMode, r.heaterOutputPct, r.heartRate];
  // Air and set joined the format later: rows without them keep the ids they always had.
  if (r.airCenti !== null || r.setCenti !== null) parts.push(r.airCenti, r.setCenti);
  return `imp-${createHash('sha256').update(parts.join('|')).digest('hex').slice(0, 32)}`;
}

type CheckedReading = UploadRowPreview & { value?: ParsedReadingRow & { infantId: string; id: string; takenById: string | null } };

function checkReadings(ctx: AppContext, parsed: ParsedFile, unitId: string): CheckedReading[] {
  const { db } = ctx.database;
  const unit = db.select({ timeZone: units.timeZone }).from(units).where(eq(units.id, unitId)).get();
  if (!unit) throw notFound('That unit');
  const admitted = db
    .select({ id: infants.id, admittedAt: infants.admittedAt, label: beds.label })
    .from(infants)
    .leftJoin(beds, eq(beds.id, infants.bedId))
    .where(and(eq(infants.unitId, unitId), eq(infants.status, 'admitted')))
    .all();
  // Who may be named in `taken_by`: active nurses and charge nurses of this unit.
  const staff = new Map(
    db
      .select({ id: users.id, email: users.email })
      .from(users)
      .innerJoin(userUnits, eq(userUnits.userId, users.id))
      .where(and(eq(userUnits.unitId, unitId), eq(users.active, true), inArray(users.role, ['nurse', 'charge'])))
      .all()
      .map((u) => [u.email.toLowerCase(), u.id]),
  );
  const now = ctx.clock.now().getTime();
  const seen = new Set<string>();
  const checked: CheckedReading[] = parsed.rows.map(({ line, values }) => {
    const { value, errors } = checkReadingRow(values, unit.timeZone);
    const parseError = parsed.parseErrors.get(line);
    if (parseError) errors.unshift(parseError);
    let infantId: string | undefined;
    let takenById: string | null = null;
    if (value) {
      const infant = admitted.find((i) => i.id === value.infant || (i.label !== null && i.label.toLowerCase() === value.infant.toLowerCase()));
      if (!infant) errors.push(`infant: no admitted infant "${value.infant}" in this unit`);
      else {
        infantId = infant.id;
        if (value.takenAt.getTime() < infant.admittedAt.getTime()) errors.push('time: before the infant was admitted');
      }
      // A few minutes of clock difference between devices is allowed.
      if (value.takenAt.getTime() > now + 5 * 60_000) errors.push('time: in the future');
      if (value.takenBy) {
        takenById = staff.get(value.takenBy) ?? null;
        if (!takenById) errors.push(`taken_by: no nurse of this unit has the e-mail ${value.takenBy}`);
      }
    }
    if (errors.length || !value || !infantId) return { line, values, errors, action: 'error' as const };
    const id = importedReadingId(infantId, value);
    if (seen.has(id)) return { line, values, errors: [], action: 'skip' as const, note: 'Same reading earlier in this file' };
    seen.add(id);
    return { line, values, errors: [], action: 'create' as const, ...(value.unusual.length ? { unusual: value.unusual } : {}), value: { ...value, infantId, id, takenById } };
  });
  const charted = chartedAlready(
    ctx,
    checked.flatMap((r) => (r.value ? [r.value.id] : [])),
  );
  return checked.map((r) => (r.value && charted.has(r.value.id) ? { line: r.line, values: r.values, errors: [], action: 'skip' as const, note: 'Already charted' } : r));
}

/** Which of these reading ids are stored already (an earlier import of the same rows). */
function chartedAlready(ctx: AppContext, ids: string[]): Set<string> {
  const found = new Set<string>();
  for (let i = 0; i < ids.length; i += 500) {
    const some = ids.slice(i, i + 500);
    for (const r of ctx.database.db.select({ id: readings.id }).from(readings).where(inArray(readings.id, some)).all()) found.add(r.id);
  }
  return found;
}

function readingsPreview(upload: UploadRow, rows: CheckedReading[]): UploadPreview {
  const preview = previewOf(upload, strip(rows));
  return { ...preview, toConfirm: preview.rows.filter((r) => r.action === 'create' && r.unusual?.length).map((r) => r.line) };
}

export function previewReadings(ctx: AppContext, file: UploadedFile, unitId: string, uploader: Uploader): UploadPreview {
  if (!uploader.unitIds.includes(unitId)) {
    removeFile(file.path);
    throw forbidden('This unit is not one of yours.');
  }
  if (!ctx.database.db.select({ id: units.id }).from(units).where(eq(units.id, unitId)).get()) {
    removeFile(file.path);
    throw notFound('That unit');
  }
  const { upload, text } = registerUpload(ctx, file, uploader, 'readings', unitId);
  const parsed = parseCsv(text);
  checkHeader(parsed, READINGS_REQUIRED, upload.storedName === path.basename(file.path) ? file.path : undefined);
  const rows = checkReadings(ctx, parsed, unitId);
  saveUploadRow(ctx, upload, rows.length);
  return readingsPreview(upload, rows);
}

/**
 * All rows or none, in one transaction; then the rules run once per infant touched. A row with
 * an unusual value imports only when its line is among `confirmedLines`. The reading is
 * recorded by the charge nurse who imports it and credited to the nurse the file names in
 * `taken_by`; a row that names nobody is credited to no nurse.
 */
export function importReadings(ctx: AppContext, uploadId: string, auth: Uploader, confirmedLines: readonly number[] = []): ImportResult {
  const { db, sqlite } = ctx.database;
  const { upload, text } = loadUpload(ctx, uploadId, 'readings');
  if (!upload.unitId || !auth.unitIds.includes(upload.unitId)) throw forbidden('This upload is for a unit you are not part of.');
  if (upload.status === 'imported') return { created: 0, skipped: upload.rowCount, alreadyImported: true };
  const parsed = parseCsv(text);
  checkHeader(parsed, READINGS_REQUIRED);
  const unitId = upload.unitId;
  const confirmed = new Set(confirmedLines);
  return db.transaction(
    (tx) => {
      if (importedMeanwhile(ctx, upload.id)) return { created: 0, skipped: upload.rowCount, alreadyImported: true };
      const rows = checkReadings(ctx, parsed, unitId);
      const bad = rows.filter((r) => r.action === 'error');
      if (bad.length)
        throw badRequest('Some rows have errors; nothing was imported.', {
          file: `${bad.length} row${bad.length > 1 ? 's have' : ' has'} errors (first: line ${bad[0]!.line}: ${bad[0]!.errors[0]}).`,
        });
      const unconfirmed = rows.filter((r) => r.action === 'create' && r.unusual?.length && !confirmed.has(r.line));
      if (unconfirmed.length) {
        throw badRequest('Confirm each unusual value first; nothing was imported.', {
          confirmedLines: unconfirmed.map((r) => `line ${r.line}: ${r.unusual!.join('; ')}`).join(' · '),
        });
      }
      const now = ctx.clock.now();
      const infantsTouched = new Set<string>();
      const ids: string[] = [];
      for (const r of rows) {
        if (r.action !== 'create' || !r.value) continue;
        const v = r.value;
        tx.insert(readings)
          .values({
            id: v.id,
            infantId: v.infantId,
            unitId,
            takenAt: v.takenAt,
            recordedAt: now,
            recordedBy: auth.userId,
            takenBy: v.takenById,
            uploadId: upload.id,
            probeCenti: v.probeCenti,
            remoteCenti: v.remoteCenti,
            remoteSite: v.remoteSite,
            airCenti: v.airCenti,
            setCenti: v.setCenti,
            controlMode: v.controlMode,
            heaterOutputPct: v.heaterOutputPct,
            heartRate: v.heartRate,
            heatSigns: '[]',
            note: null,
            enteredUnit: v.unit,
            lateReason: `Imported from ${upload.filename}`,
          })
          .run();
        infantsTouched.add(v.infantId);
        ids.push(v.id);
      }
      const confirmedUsed = rows.filter((r) => r.action === 'create' && r.unusual?.length).map((r) => r.line);
      appendAudit(sqlite, {
        at: now,
        actorId: auth.userId,
        action: 'readings-imported',
        entityType: 'upload',
        entityId: upload.id,
        unitId,
        after: { created: ids.length, readingIds: ids, sha256: upload.sha256, confirmedLines: confirmedUsed },
      });
      for (const infantId of infantsTouched) syncFlags(sqlite, infantId, now, auth.userId);
      markImported(ctx, upload.id, rows.length, now);
      return { created: ids.length, skipped: rows.length - ids.length, alreadyImported: false };
    },
    { behavior: 'immediate' },
  );
}

/** Every refused row of a previewed readings file as CSV: line, field, reason and the row as it was. */
export function readingsErrorsCsv(ctx: AppContext, uploadId: string, auth: { unitIds: string[] }): { filename: string; csv: string } {
  const { upload, text } = loadUpload(ctx, uploadId, 'readings');
  if (!upload.unitId || !auth.unitIds.includes(upload.unitId)) throw forbidden('This upload is for a unit you are not part of.');
  const parsed = parseCsv(text);
  const rows = checkReadings(ctx, parsed, upload.unitId);
  const out: [number, string, string, string][] = [];
  for (const r of rows) {
    for (const e of r.errors) {
      const colon = e.indexOf(': ');
      out.push([r.line, colon > 0 ? e.slice(0, colon) : 'row', colon > 0 ? e.slice(colon + 2) : e, READINGS_COLUMNS.map((c) => r.values[c] ?? '').join(',')]);
    }
  }
  return { filename: `${upload.filename.replace(/\.csv$/i, '')}-errors.csv`, csv: toCsv(['line', 'field', 'reason', 'row'], out) };
}
