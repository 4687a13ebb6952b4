import { readingsImportQuerySchema } from '../../shared/schemas/admin';
import { readingsImportBodySchema, type ReadingsImportBody } from '../../shared/schemas/readings-import';
import type { AppContext } from '../context';
import { allow, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import { CSV_BOM } from '../../shared/csv';
import { csvUpload, importReadings, importRoster, previewReadings, previewRoster, readingsErrorsCsv } from '../services/uploads';

/** Roster (admin) and readings (charge nurse) CSV uploads: preview first, then import. */
export function uploadsRouter(ctx: AppContext) {
  const router = secureRouter();
  const upload = csvUpload(ctx);
  const uploadId = (req: { params: unknown }) => (req.params as { uploadId: string }).uploadId;

  router.post('/admin/roster/preview', allow(ctx, 'admin:manage'), upload, (req, res) => {
    res.status(201).json(previewRoster(ctx, req));
  });

  router.post('/admin/roster/:uploadId/import', allow(ctx, 'admin:manage'), async (req, res) => {
    res.json(await importRoster(ctx, uploadId(req), req.auth!));
  });

  router.post('/readings-import/preview', allow(ctx, 'readings:import'), validate('query', readingsImportQuerySchema), upload, (req, res) => {
    res.status(201).json(previewReadings(ctx, req, valid<{ unitId: string }>(req, 'query').unitId));
  });

  router.get('/readings-import/:uploadId/errors.csv', allow(ctx, 'readings:import'), (req, res) => {
    const { filename, csv } = readingsErrorsCsv(ctx, uploadId(req), req.auth!);
    res.set('Content-Type', 'text/csv; charset=utf-8');
    res.set('Content-Disposition', `attachment; filename="${filename.replace(/[^\w.-]/g, '_')}"`);
    res.send(CSV_BOM + csv);
  });

  router.post('/readings-import/:uploadId/import', allow(ctx, 'readings:import'), validate('body', readingsImportBodySchema), (req, res) => {
    const { confirmedLines } = valid<ReadingsImportBody>(req, 'body');
    res.json(importReadings(ctx, uploadId(req), req.auth!, confirmedLines));
  });

  return router;
}
