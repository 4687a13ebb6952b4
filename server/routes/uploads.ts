import type { Request, RequestHandler } from 'express';
import multer from 'multer';
import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import { readingsImportQuerySchema } from '../../shared/schemas/admin';
import { readingsImportBodySchema, type ReadingsImportBody } from '../../shared/schemas/readings-import';
import { MAX_UPLOAD_BYTES } from '../../shared/uploads/csv-formats';
import { unsafeTextReason } from '../../shared/schemas/safe-text';
import type { AppContext } from '../context';
import { ApiError, badRequest } from '../errors';
import { allow, secureRouter } from '../middleware/access';
import { multipartErrorsAs400, valid, validate } from '../middleware/validate';
import { CSV_BOM } from '../../shared/csv';
import { importReadings, previewReadings, readingsErrorsCsv, uploadsDir, type UploadedFile } from '../services/uploads';

const CSV_TYPES = new Set(['text/csv', 'application/csv', 'text/plain', 'application/vnd.ms-excel', 'text/comma-separated-values']);

/** The size limit in words, for the error that refuses a larger file. */
export const UPLOAD_LIMIT_TEXT = `${MAX_UPLOAD_BYTES / (1024 * 1024)} MB (${MAX_UPLOAD_BYTES.toLocaleString('en-GB')} bytes)`;

/** A file over the size limit is refused with the limit stated, not a bare "too large". */
function statingSizeLimit(handler: RequestHandler): RequestHandler {
  return (req, res, next) =>
    handler(req, res, (err?: unknown) => {
      if (err instanceof multer.MulterError && err.code === 'LIMIT_FILE_SIZE') {
        next(
          new ApiError(413, 'payload-too-large', `The file is larger than the limit of ${UPLOAD_LIMIT_TEXT}.`, {
            file: `At most ${UPLOAD_LIMIT_TEXT} per file: split it into smaller files.`,
          }),
        );
        return;
      }
      next(err);
    });
}

/**
 * One CSV file in the field `file`, kept on disk under the data folder; size and type limited.
 * Used here and by the administrator's roster upload (admin.ts).
 * multipartErrorsAs400 stays the outermost wrapper: its mark is what lets the route take multipart.
 */
export function csvUpload(ctx: AppContext) {
  return multipartErrorsAs400(
    statingSizeLimit(
      multer({
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
      }).single('file'),
    ),
  );
}

/** The file multer stored, as the service takes it. */
export function uploadedFile(req: Request): UploadedFile {
  if (!req.file) throw badRequest('Choose a CSV file to upload.', { file: 'Choose a CSV file.' });
  return { path: req.file.path, originalName: req.file.originalname, size: req.file.size };
}

const uploadId = (req: { params: unknown }) => (req.params as { uploadId: string }).uploadId;

/** The charge nurse's readings CSV upload, mounted at /api/readings-import: preview first, then import. */
export function readingsImportRouter(ctx: AppContext) {
  const router = secureRouter();
  const upload = csvUpload(ctx);

  router.post('/preview', allow(ctx, 'readings:import'), validate('query', readingsImportQuerySchema), upload, (req, res) => {
    res.status(201).json(previewReadings(ctx, uploadedFile(req), valid<{ unitId: string }>(req, 'query').unitId, req.auth!));
  });

  router.get('/:uploadId/errors.csv', allow(ctx, 'readings:import'), (req, res) => {
    const { filename, csv } = readingsErrorsCsv(ctx, uploadId(req), req.auth!);
    res.set('Content-Type', 'text/csv; charset=utf-8');
    res.set('Content-Disposition', `attachment; filename="${filename.replace(/[^\w.-]/g, '_')}"`);
    res.send(CSV_BOM + csv);
  });

  router.post('/:uploadId/import', allow(ctx, 'readings:import'), validate('body', readingsImportBodySchema), (req, res) => {
    const { confirmedLines } = valid<ReadingsImportBody>(req, 'body');
    res.json(importReadings(ctx, uploadId(req), req.auth!, confirmedLines));
  });

  return router;
}
