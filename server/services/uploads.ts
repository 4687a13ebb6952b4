import type Database from 'better-sqlite3';
import type { Request } from 'express';
import multer from 'multer';
import { createHash, randomUUID } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import Papa from 'papaparse';
import { checkReadingRow, checkRosterRow, MAX_UPLOAD_BYTES, MAX_UPLOAD_ROWS, missingColumns, READINGS_REQUIRED, ROSTER_COLUMNS, type ParsedReadingRow, type Row, type RosterRow } from '../../shared/uploads/csv-formats';
import type { ImportResult, UploadPreview, UploadRowPreview } from '../../shared/types/admin';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { badRequest, forbidden, notFound } from '../errors';
import type { Database_ } from '../../db/client';
import { accountFor, createUserRows } from './admin-users';
import { mailLinkSafely, type IssuedLink } from './email-links';
import { syncFlags } from './flags';
import { unsafeTextReason } from '../../shared/schemas/safe-text';
import { multipartErrorsAs400 } from '../middleware/validate';

const CSV_TYPES = new Set(['text/csv', 'application/csv', 'text/plain', 'application/vnd.ms-excel', 'text/comma-separated-values']);

export function uploadsDir(ctx: AppContext): string {
  return path.join(ctx.config.dataDir, 'uploads');
}

/** One CSV file in the field `file`, kept on disk under the data folder; size and type limited. */
export function csvUpload(ctx: AppContext) {
  return multipartErrorsAs400(multer({
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
  }).single('file'));
}

function removeFile(file: string): void {
  fs.rm(file, { force: true }, () => {});
}

interface ParsedFile {
  rows: Array<{ line: number; values: Row }>;
  header: string[];
  parseErrors: Map<number, string>;
}

/** papaparse with a header row; data line numbers count the header as line 1. */
export function parseCsv(text: string): ParsedFile {
  const result = Papa.parse<Row>(text.replace(/^\uFEFF/, ''), {
    header: true,
    skipEmptyLines: 'greedy',
    transformHeader: (h) => h.trim().toLowerCase(),
    transform: (v) => v.trim(),
  });
  const parseErrors = new Map<number, string>();
  for (const e of result.errors) {
    if (typeof e.row === 'number') parseErrors.set(e.row, e.code === 'TooFewFields' || e.code === 'TooManyFields' ? `row: ${e.message.toLowerCase()}` : `row: ${e.message}`);
  }
  // Lines: without multi-line quoted cells the data row index i sits on line i + 2.
  return { rows: result.data.map((values, i) => ({ line: i + 2, values })), header: result.meta.fields ?? [], parseErrors };
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
  const text = fs.readFileSync(file.path, 'utf8');
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
    const parseError = parsed.parseErrors.get(line - 2);
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
  return { upload, text: fs.readFileSync(file, 'utf8') };
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
  const key = [infantId, r.takenAt.toISOString(), r.probeCenti, r.remoteCenti, r.remoteSite, r.controlMode, r.heaterOutputPct, r.heartRate].join('|');
  return `imp-${createHash('sha256').update(key).digest('hex').slice(0, 32)}`;
}

type CheckedReading = UploadRowPreview & { value?: ParsedReadingRow & { infantId: string; id: string } };

function checkReadings(ctx: AppContext, parsed: ParsedFile, unitId: string): CheckedReading[] {
  const { sqlite } = ctx.database;
  const infants = sqlite
    .prepare("SELECT i.id, i.admitted_at, b.label FROM infants i LEFT JOIN beds b ON b.id = i.bed_id WHERE i.unit_id = ? AND i.status = 'admitted'")
    .all(unitId) as Array<{ id: string; admitted_at: number; label: string | null }>;
  const now = ctx.clock.now().getTime();
  const seen = new Set<string>();
  return parsed.rows.map(({ line, values }) => {
    const { value, errors } = checkReadingRow(values);
    const parseError = parsed.parseErrors.get(line - 2);
    if (parseError) errors.unshift(parseError);
    let infantId: string | undefined;
    if (value) {
      const infant = infants.find((i) => i.id === value.infant || (i.label !== null && i.label.toLowerCase() === value.infant.toLowerCase()));
      if (!infant) errors.push(`infant: no admitted infant "${value.infant}" in this unit`);
      else {
        infantId = infant.id;
        if (value.takenAt.getTime() < infant.admitted_at) errors.push('time: before the infant was admitted');
      }
      // A few minutes of clock difference between devices is allowed.
      if (value.takenAt.getTime() > now + 5 * 60_000) errors.push('time: in the future');
    }
    if (errors.length || !value || !infantId) return { line, values, errors, action: 'error' as const };
    const id = importedReadingId(infantId, value);
    if (seen.has(id)) return { line, values, errors: [], action: 'skip' as const, note: 'Same reading earlier in this file' };
    seen.add(id);
    if (sqlite.prepare('SELECT 1 FROM readings WHERE id = ?').get(id)) return { line, values, errors: [], action: 'skip' as const, note: 'Already charted' };
    return { line, values, errors: [], action: 'create' as const, value: { ...value, infantId, id } };
  });
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
  return previewOf(upload, strip(rows));
}

/** All rows or none, in one transaction; then the rules run once per infant touched. */
export function importReadings(ctx: AppContext, uploadId: string, auth: { userId: string; unitIds: string[] }): ImportResult {
  const { sqlite } = ctx.database;
  const { upload, text } = loadUpload(ctx, uploadId, 'readings');
  if (!upload.unit_id || !auth.unitIds.includes(upload.unit_id)) throw forbidden('This upload is for a unit you are not part of.');
  if (upload.status === 'imported') return { created: 0, skipped: upload.row_count, alreadyImported: true };
  const parsed = parseCsv(text);
  checkHeader(parsed, READINGS_REQUIRED);
  const unitId = upload.unit_id;
  return sqlite
    .transaction(() => {
      const fresh = sqlite.prepare('SELECT status FROM uploads WHERE id = ?').get(upload.id) as { status: string };
      if (fresh.status === 'imported') return { created: 0, skipped: upload.row_count, alreadyImported: true };
      const rows = checkReadings(ctx, parsed, unitId);
      const bad = rows.filter((r) => r.action === 'error');
      if (bad.length) throw badRequest('Some rows have errors; nothing was imported.', { file: `${bad.length} row${bad.length > 1 ? 's have' : ' has'} errors (first: line ${bad[0]!.line}: ${bad[0]!.errors[0]}).` });
      const now = ctx.clock.now();
      const insert = sqlite.prepare(
        `INSERT INTO readings (id, infant_id, unit_id, taken_at, recorded_at, recorded_by, probe_centi, remote_centi, remote_site, control_mode, heater_output_pct, heart_rate, heat_signs, note, entered_unit, late_reason)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, '[]', NULL, ?, ?)`,
      );
      const infants = new Set<string>();
      const ids: string[] = [];
      for (const r of rows) {
        if (r.action !== 'create' || !r.value) continue;
        const v = r.value;
        insert.run(v.id, v.infantId, unitId, v.takenAt.getTime(), now.getTime(), auth.userId, v.probeCenti, v.remoteCenti, v.remoteSite, v.controlMode, v.heaterOutputPct, v.heartRate, v.unit, `Imported from ${upload.filename}`);
        infants.add(v.infantId);
        ids.push(v.id);
      }
      appendAudit(sqlite, { at: now, actorId: auth.userId, action: 'readings-imported', entityType: 'upload', entityId: upload.id, unitId, after: { created: ids.length, readingIds: ids, sha256: upload.sha256 } });
      for (const infantId of infants) syncFlags(sqlite, infantId, now, auth.userId);
      sqlite.prepare("UPDATE uploads SET status = 'imported', imported_at = ?, row_count = ? WHERE id = ?").run(now.getTime(), rows.length, upload.id);
      return { created: ids.length, skipped: rows.length - ids.length, alreadyImported: false };
    })
    .immediate();
}
