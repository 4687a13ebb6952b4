import type Database from 'better-sqlite3';
import type { Request, RequestHandler } from 'express';
import multer from 'multer';
import { createHash, randomUUID } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { decodeCsvBytes, parseCsvLines } from '../../shared/uploads/csv-text';
import { toCsv } from '../../shared/csv';
import { checkReadingRow, checkRosterRow, MAX_UPLOAD_BYTES, MAX_UPLOAD_ROWS, missingColumns, READINGS_COLUMNS, READINGS_REQUIRED, ROSTER_COLUMNS, type ParsedReadingRow, type Row, type RosterRow } from '../../shared/uploads/csv-formats';
import type { ImportResult, UploadPreview, UploadRowPreview } from '../../shared/types/admin';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { ApiError, badRequest, forbidden, notFound } from '../errors';
import type { Database_ } from '../../db/client';
import { accountFor, createUserRows } from './admin-users';
import { mailLinkSafely, type IssuedLink } from './email-links';
import { syncFlags } from './flags';
import { and, eq, inArray } from 'drizzle-orm';
import { beds, infants, readings, userUnits, units, users } from '../../db/schema';
import { unsafeTextReason } from '../../shared/schemas/safe-text';
import { multipartErrorsAs400 } from '../middleware/validate';

const CSV_TYPES = new Set(['text/csv', 'application/csv', 'text/plain', 'application/vnd.ms-excel', 'text/comma-separated-values']);

export function uploadsDir(ctx: AppContext): string {
  return path.join(ctx.config.dataDir, 'uploads');
}

/** The size limit in words, for the error that refuses a larger file. */
export const UPLOAD_LIMIT_TEXT = `${MAX_UPLOAD_BYTES / (1024 * 1024)} MB (${MAX_UPLOAD_BYTES.toLocaleString('en-GB')} bytes)`;

/** A file over the size limit is refused with the limit stated, not a bare "too large". */
function statingSizeLimit(handler: RequestHandler): RequestHandler {
  return (req, res, next) =>
    handler(req, res, (err?: unknown) => {
      if (err instanceof multer.MulterError && err.code === 'LIMIT_FILE_SIZE') {
        next(new ApiError(413, 'payload-too-large', `The file is larger than the limit of ${UPLOAD_LIMIT_TEXT}.`, { file: `At most ${UPLOAD_LIMIT_TEXT} per file: split it into smaller files.` }));
        return;
      }
      next(err);
    });
}

/**
 * One CSV file in the field `file`, kept on disk under the data folder; size and type limited.
 * multipartErrorsAs400 stays the outermost wrapper: its mark is what lets the route take multipart.
 */
export function csvUpload(ctx: AppContext) {
  return multipartErrorsAs400(statingSizeLimit(multer({
    storage: multer.diskStorage({
      destination: (_req, _file, cb) => {
        const dir = uploadsDir(ctx);
        fs.mkdir(dir, { recursive: true }, (err) => cb(err, dir));
      },
      filename: (_req, _file, cb) => cb(null, `${randomUUID()}.csv`),
    }),
    limits: { fileSize: MAX_UPLOAD_BYTES, files: 1, fields: 5, parts: 8 },
    fileFilter: (_req, file, cb) => {
      const unsafeName = unsafeTextReason(file.originalname);
      if (unsafeName) {
        cb(badRequest('The file name cannot be stored.', { file: `File name: ${unsafeName}` }));
        return;
      }
      if (!/\.csv$/i.test(file.originalname) || !CSV_TYPES.has(file.mimetype)) {
        cb(badRequest('Only CSV files can be uploaded.', { file: 'Choose a .csv file (comma-separated text).' }));
        return;
      }
      cb(null, true);
    },
  }).single('file')));
}

function removeFile(file: string): void {
  fs.rm(file, { force: true }, () => {});
}

interface ParsedFile {
  rows: Array<{ line: number; values: Row }>;
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

function requireFile(req: Request): Express.Multer.File {
  if (!req.file) throw badRequest('Choose a CSV file to upload.', { file: 'Choose a CSV file.' });
  return req.file;
}

function sha256(file: string): string {
  return createHash('sha256').update(fs.readFileSync(file)).digest('hex');
}

interface UploadRow {
  id: string;
  kind: 'roster' | 'readings';
  unit_id: string | null;
  filename: string;
  stored_name: string;
  sha256: string;
  row_count: number;
  status: 'previewed' | 'imported' | 'rejected';
  uploaded_by: string;
}

/**
 * Keep a newly uploaded file as an upload row, unless the same content was uploaded before
 * (same kind, same unit): then the new copy is dropped and the earlier upload answers, so a
 * re-upload writes nothing.
 */
function registerUpload(ctx: AppContext, req: Request, kind: 'roster' | 'readings', unitId: string | null): { upload: UploadRow; text: string } {
  const file = requireFile(req);
  const { sqlite } = ctx.database;
  const hash = sha256(file.path);
  const text = readText(file.path, true);
  const earlier = sqlite
    .prepare("SELECT * FROM uploads WHERE kind = ? AND sha256 = ? AND COALESCE(unit_id, '') = ? ORDER BY CASE status WHEN 'imported' THEN 0 ELSE 1 END, created_at LIMIT 1")
    .get(kind, hash, unitId ?? '') as UploadRow | undefined;
  if (earlier) {
    removeFile(file.path);
    return { upload: earlier, text };
  }
  return {
    upload: { id: randomUUID(), kind, unit_id: unitId, filename: path.basename(file.originalname).slice(0, 200), stored_name: path.basename(file.path), sha256: hash, row_count: 0, status: 'previewed', uploaded_by: req.auth!.userId },
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

function saveUploadRow(ctx: AppContext, upload: UploadRow, rowCount: number, sizeBytes: number): void {
  const { sqlite } = ctx.database;
  if (sqlite.prepare('SELECT 1 FROM uploads WHERE id = ?').get(upload.id)) return;
  sqlite
    .prepare('INSERT INTO uploads (id, kind, unit_id, filename, stored_name, sha256, size_bytes, row_count, status, uploaded_by, created_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)')
    .run(upload.id, upload.kind, upload.unit_id, upload.filename, upload.stored_name, upload.sha256, sizeBytes, rowCount, 'previewed', upload.uploaded_by, ctx.clock.now().getTime());
  upload.row_count = rowCount;
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

function checkRoster(database: Database_, parsed: ParsedFile, adminUnits: string[]): Array<UploadRowPreview & { value?: RosterRow & { unitId: string } }> {
  const { sqlite } = database;
  const units = sqlite.prepare('SELECT id, name FROM units').all() as Array<{ id: string; name: string }>;
  const seen = new Set<string>();
  return parsed.rows.map(({ line, values }) => {
    const parseError = parsed.parseErrors.get(line);
    const { value, errors } = checkRosterRow(values);
    if (parseError) errors.unshift(parseError);
    let unitId: string | undefined;
    if (value) {
      const unit = units.find((u) => u.id === value.unit || u.name.toLowerCase() === value.unit.toLowerCase());
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

export function previewRoster(ctx: AppContext, req: Request): UploadPreview {
  const file = requireFile(req);
  const { upload, text } = registerUpload(ctx, req, 'roster', null);
  const parsed = parseCsv(text);
  checkHeader(parsed, ROSTER_COLUMNS, upload.stored_name === path.basename(file.path) ? file.path : undefined);
  const rows = checkRoster(ctx.database, parsed, req.auth!.unitIds);
  saveUploadRow(ctx, upload, rows.length, file.size);
  return previewOf(upload, strip(rows));
}

function loadUpload(ctx: AppContext, uploadId: string, kind: 'roster' | 'readings'): { upload: UploadRow; text: string } {
  const upload = ctx.database.sqlite.prepare('SELECT * FROM uploads WHERE id = ? AND kind = ?').get(uploadId, kind) as UploadRow | undefined;
  if (!upload) throw notFound('That upload');
  const file = path.join(uploadsDir(ctx), upload.stored_name);
  if (!fs.existsSync(file)) throw notFound('That uploaded file');
  return { upload, text: readText(file, false) };
}

/** Create and invite every new person in one transaction; e-mail the invitations after it commits. */
export async function importRoster(ctx: AppContext, uploadId: string, auth: { userId: string; unitIds: string[] }): Promise<ImportResult> {
  const { sqlite } = ctx.database;
  const { upload, text } = loadUpload(ctx, uploadId, 'roster');
  if (upload.status === 'imported') return { created: 0, skipped: upload.row_count, alreadyImported: true };
  const parsed = parseCsv(text);
  checkHeader(parsed, ROSTER_COLUMNS);
  const links: IssuedLink[] = [];
  const result = sqlite
    .transaction(() => {
      // Checked again inside the write lock, so two admins importing the same file create nobody twice.
      const fresh = sqlite.prepare('SELECT status FROM uploads WHERE id = ?').get(upload.id) as { status: string };
      if (fresh.status === 'imported') return { created: 0, skipped: upload.row_count, alreadyImported: true };
      const rows = checkRoster(ctx.database, parsed, auth.unitIds);
      const bad = rows.filter((r) => r.action === 'error');
      if (bad.length) throw badRequest('Some rows have errors; nothing was imported.', { file: `${bad.length} row${bad.length > 1 ? 's have' : ' has'} errors (first: line ${bad[0]!.line}). Fix the file and upload it again.` });
      let created = 0;
      for (const r of rows) {
        if (r.action !== 'create' || !r.value) continue;
        const { link } = createUserRows(ctx, sqlite, { name: r.value.name, email: r.value.email, role: r.value.role, unitIds: [r.value.unitId] }, auth.userId);
        links.push(link);
        created += 1;
      }
      sqlite.prepare("UPDATE uploads SET status = 'imported', imported_at = ?, row_count = ? WHERE id = ?").run(ctx.clock.now().getTime(), rows.length, upload.id);
      appendAudit(sqlite, { at: ctx.clock.now(), actorId: auth.userId, action: 'roster-imported', entityType: 'upload', entityId: upload.id, unitId: null, after: { created, skipped: rows.length - created, sha256: upload.sha256 } });
      return { created, skipped: rows.length - created, alreadyImported: false };
    })
    .immediate();
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
  const { db, sqlite } = ctx.database;
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
  return parsed.rows.map(({ line, values }) => {
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
    if (sqlite.prepare('SELECT 1 FROM readings WHERE id = ?').get(id)) return { line, values, errors: [], action: 'skip' as const, note: 'Already charted' };
    return { line, values, errors: [], action: 'create' as const, ...(value.unusual.length ? { unusual: value.unusual } : {}), value: { ...value, infantId, id, takenById } };
  });
}

function readingsPreview(upload: UploadRow, rows: CheckedReading[]): UploadPreview {
  const preview = previewOf(upload, strip(rows));
  return { ...preview, toConfirm: preview.rows.filter((r) => r.action === 'create' && r.unusual?.length).map((r) => r.line) };
}

export function previewReadings(ctx: AppContext, req: Request, unitId: string): UploadPreview {
  const file = requireFile(req);
  if (!req.auth!.unitIds.includes(unitId)) {
    removeFile(file.path);
    throw forbidden('This unit is not one of yours.');
  }
  if (!ctx.database.sqlite.prepare('SELECT 1 FROM units WHERE id = ?').get(unitId)) {
    removeFile(file.path);
    throw notFound('That unit');
  }
  const { upload, text } = registerUpload(ctx, req, 'readings', unitId);
  const parsed = parseCsv(text);
  checkHeader(parsed, READINGS_REQUIRED, upload.stored_name === path.basename(file.path) ? file.path : undefined);
  const rows = checkReadings(ctx, parsed, unitId);
  saveUploadRow(ctx, upload, rows.length, file.size);
  return readingsPreview(upload, rows);
}

/**
 * All rows or none, in one transaction; then the rules run once per infant touched. A row with
 * an unusual value imports only when its line is among `confirmedLines`. The reading is
 * recorded by the charge nurse who imports it and credited to the nurse the file names in
 * `taken_by`; a row that names nobody is credited to no nurse.
 */
export function importReadings(ctx: AppContext, uploadId: string, auth: { userId: string; unitIds: string[] }, confirmedLines: readonly number[] = []): ImportResult {
  const { db, sqlite } = ctx.database;
  const { upload, text } = loadUpload(ctx, uploadId, 'readings');
  if (!upload.unit_id || !auth.unitIds.includes(upload.unit_id)) throw forbidden('This upload is for a unit you are not part of.');
  if (upload.status === 'imported') return { created: 0, skipped: upload.row_count, alreadyImported: true };
  const parsed = parseCsv(text);
  checkHeader(parsed, READINGS_REQUIRED);
  const unitId = upload.unit_id;
  const confirmed = new Set(confirmedLines);
  return sqlite
    .transaction(() => {
      const fresh = sqlite.prepare('SELECT status FROM uploads WHERE id = ?').get(upload.id) as { status: string };
      if (fresh.status === 'imported') return { created: 0, skipped: upload.row_count, alreadyImported: true };
      const rows = checkReadings(ctx, parsed, unitId);
      const bad = rows.filter((r) => r.action === 'error');
      if (bad.length) throw badRequest('Some rows have errors; nothing was imported.', { file: `${bad.length} row${bad.length > 1 ? 's have' : ' has'} errors (first: line ${bad[0]!.line}: ${bad[0]!.errors[0]}).` });
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
        db.insert(readings)
          .values({
            id: v.id, infantId: v.infantId, unitId, takenAt: v.takenAt, recordedAt: now, recordedBy: auth.userId, takenBy: v.takenById, uploadId: upload.id,
            probeCenti: v.probeCenti, remoteCenti: v.remoteCenti, remoteSite: v.remoteSite, airCenti: v.airCenti, setCenti: v.setCenti, controlMode: v.controlMode,
            heaterOutputPct: v.heaterOutputPct, heartRate: v.heartRate, heatSigns: '[]', note: null, enteredUnit: v.unit, lateReason: `Imported from ${upload.filename}`,
          })
          .run();
        infantsTouched.add(v.infantId);
        ids.push(v.id);
      }
      const confirmedUsed = rows.filter((r) => r.action === 'create' && r.unusual?.length).map((r) => r.line);
      appendAudit(sqlite, { at: now, actorId: auth.userId, action: 'readings-imported', entityType: 'upload', entityId: upload.id, unitId, after: { created: ids.length, readingIds: ids, sha256: upload.sha256, confirmedLines: confirmedUsed } });
      for (const infantId of infantsTouched) syncFlags(sqlite, infantId, now, auth.userId);
      sqlite.prepare("UPDATE uploads SET status = 'imported', imported_at = ?, row_count = ? WHERE id = ?").run(now.getTime(), rows.length, upload.id);
      return { created: ids.length, skipped: rows.length - ids.length, alreadyImported: false };
    })
    .immediate();
}

/** Every refused row of a previewed readings file as CSV: line, field, reason and the row as it was. */
export function readingsErrorsCsv(ctx: AppContext, uploadId: string, auth: { unitIds: string[] }): { filename: string; csv: string } {
  const { upload, text } = loadUpload(ctx, uploadId, 'readings');
  if (!upload.unit_id || !auth.unitIds.includes(upload.unit_id)) throw forbidden('This upload is for a unit you are not part of.');
  const parsed = parseCsv(text);
  const rows = checkReadings(ctx, parsed, upload.unit_id);
  const out: Array<[number, string, string, string]> = [];
  for (const r of rows) {
    for (const e of r.errors) {
      const colon = e.indexOf(': ');
      out.push([r.line, colon > 0 ? e.slice(0, colon) : 'row', colon > 0 ? e.slice(colon + 2) : e, READINGS_COLUMNS.map((c) => r.values[c] ?? '').join(',')]);
    }
  }
  return { filename: `${upload.filename.replace(/\.csv$/i, '')}-errors.csv`, csv: toCsv(['line', 'field', 'reason', 'row'], out) };
}
