import { z } from 'zod';
import { CSV_BOM, toCsv } from '../../shared/csv';
import { REPORT_TABLE_NAMES, reportTables } from '../../shared/reports';
import {
  compareQuerySchema,
  exportRangeQuerySchema,
  reviewQueueQuerySchema,
  trendQuerySchema,
  unitRangeQuerySchema,
  type CompareQuery,
  type ExportRangeQuery,
  type ReviewQueueQuery,
  type TrendQuery,
  type UnitRangeQuery,
} from '../../shared/schemas/review';
import { admissionMeasure } from '../services/admission-measure';
import type { AppContext } from '../context';
import { notFound } from '../errors';
import { allow, assertUnit, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import { flagsCsvExport, infantFhirBundle, readingsCsv, unitFhirBundle } from '../services/exports';
import { comparePeriods, unitReport, unitTrends } from '../services/reports';

const tableParams = z.object({ table: z.enum(REPORT_TABLE_NAMES as [string, ...string[]], { error: 'No such report table.' }) });

/** A CSV download: UTF-8 with a byte-order mark, so a spreadsheet reads "Inês" and "°C" as written. */
function sendCsv(res: import('express').Response, name: string, body: string): void {
  res.set('Content-Type', 'text/csv; charset=utf-8');
  res.set('Content-Disposition', `attachment; filename="${name}"`);
  res.send(CSV_BOM + body);
}

function sendFhir(res: import('express').Response, name: string, bundle: unknown): void {
  res.set('Content-Type', 'application/fhir+json; charset=utf-8');
  res.set('Content-Disposition', `attachment; filename="${name}"`);
  res.send(JSON.stringify(bundle));
}

const suffixOf = (q: { infantId?: string; from?: string; to?: string }) => `${q.infantId ? `${q.infantId}-` : ''}${q.from ?? 'all'}-${q.to ?? 'all'}`;

/** Reports, mounted at /api/reports: the educator's. (The route '' is /api/reports itself.) */
export function reportsRouter(ctx: AppContext) {
  const router = secureRouter();

  router.get('', allow(ctx, 'review:work'), validate('query', unitRangeQuerySchema), (req, res) => {
    const query = valid<UnitRangeQuery>(req, 'query');
    assertUnit(req, query.unitId);
    const report = unitReport(ctx, query, req.auth!.userId);
    res.json({ report, tables: reportTables(report) });
  });

  router.get('/trends', allow(ctx, 'review:work'), validate('query', trendQuerySchema), (req, res) => {
    const query = valid<TrendQuery>(req, 'query');
    assertUnit(req, query.unitId);
    res.json(unitTrends(ctx, query, req.auth!.userId));
  });

  router.get('/compare', allow(ctx, 'review:work'), validate('query', compareQuerySchema), (req, res) => {
    const query = valid<CompareQuery>(req, 'query');
    assertUnit(req, query.unitId);
    res.json(comparePeriods(ctx, query, req.auth!.userId));
  });

  router.get('/admission-measure', allow(ctx, 'measure:read'), validate('query', unitRangeQuerySchema), (req, res) => {
    const query = valid<UnitRangeQuery>(req, 'query');
    assertUnit(req, query.unitId);
    res.json({ measure: admissionMeasure(ctx, query, req.auth!.userId) });
  });

  router.get('/tables/:table.csv', allow(ctx, 'review:work'), validate('params', tableParams), validate('query', unitRangeQuerySchema), (req, res) => {
    const query = valid<UnitRangeQuery>(req, 'query');
    const { table } = valid<{ table: string }>(req, 'params');
    assertUnit(req, query.unitId);
    const found = reportTables(unitReport(ctx, query, req.auth!.userId)).find((t) => t.name === table);
    if (!found) throw notFound('That table');
    sendCsv(res, `${table}-${query.from}-${query.to}.csv`, toCsv(found.header, found.rows));
  });

  return router;
}

/** Exports, mounted at /api/exports: readings and flags as CSV, FHIR bundles. The educator's. */
export function exportsRouter(ctx: AppContext) {
  const router = secureRouter();

  router.get('/readings.csv', allow(ctx, 'review:work'), validate('query', exportRangeQuerySchema), (req, res) => {
    const query = valid<ExportRangeQuery>(req, 'query');
    assertUnit(req, query.unitId);
    sendCsv(res, `readings-${suffixOf(query)}.csv`, readingsCsv(ctx, query, req.auth!.userId));
  });

  router.get('/fhir', allow(ctx, 'review:work'), validate('query', exportRangeQuerySchema), (req, res) => {
    const query = valid<ExportRangeQuery>(req, 'query');
    assertUnit(req, query.unitId);
    sendFhir(res, `fhir-${suffixOf(query)}.json`, unitFhirBundle(ctx, query, req.auth!.userId));
  });

  /** Flags of the review queue's kinds, with the queue's filters (a date range among them). */
  router.get('/flags.csv', allow(ctx, 'review:work'), validate('query', reviewQueueQuerySchema), (req, res) => {
    const query = valid<ReviewQueueQuery>(req, 'query');
    if (query.unitId) assertUnit(req, query.unitId);
    sendCsv(res, `flags-${suffixOf(query)}.csv`, flagsCsvExport(ctx, req.auth!.unitIds, query, req.auth!.userId));
  });

  router.get('/infants/:infantId/fhir', allow(ctx, 'review:work'), (req, res) => {
    const { infantId } = req.params as { infantId: string };
    sendFhir(res, `fhir-${infantId}.json`, infantFhirBundle(ctx, infantId, req.auth!));
  });

  return router;
}
