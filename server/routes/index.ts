import type { Router } from 'express';
import type { AppContext } from '../context';
import { admissionsRouter } from './admissions';
import { accountLinksRouter } from './account-links';
import { adminRouter } from './admin';
import { authRouter } from './auth';
import { bedWarmingRouter } from './bed-warming';
import { handoverPlanRouter, unitShiftWorkRouter } from './shift-work';
import { flagsRouter, readingsRouter, skinToSkinRouter } from './bedside';
import { escalationsRouter } from './escalations';
import { infantHandoverRouter, nursesRouter, unitHandoverRouter } from './handover';
import { healthRouter } from './health';
import { infantsRouter } from './infants';
import { mailboxRouter } from './mailbox';
import { exportsRouter, reportsRouter } from './reports';
import { reviewRouter, reviewsRouter } from './review';
import { unitBoardRouter } from './unit-board';
import { readingsImportRouter, rosterUploadsRouter } from './uploads';

/** Every API router and where it is mounted under /api. Add new resources here. */
export function apiRouters(ctx: AppContext): [string, Router][] {
  return [
    // Health and ping stay at the root: /api/health and /api/ping are two one-word probes, not a resource.
    ['/', healthRouter(ctx)],
    ['/auth', authRouter(ctx)],
    ['/auth', accountLinksRouter(ctx)],
    ['/infants', infantsRouter(ctx)],
    ['/infants', admissionsRouter(ctx)],
    ['/infants', infantHandoverRouter(ctx)],
    ['/infants', handoverPlanRouter(ctx)],
    // Routers under the unit read :unitId from the mount path (each is built with mergeParams).
    ['/units/:unitId', unitBoardRouter(ctx)],
    ['/units/:unitId', bedWarmingRouter(ctx)],
    ['/units/:unitId', unitHandoverRouter(ctx)],
    ['/units/:unitId', unitShiftWorkRouter(ctx)],
    ['/nurses', nursesRouter(ctx)],
    ['/readings', readingsRouter(ctx)],
    ['/flags', flagsRouter(ctx)],
    ['/skin-to-skin', skinToSkinRouter(ctx)],
    ['/escalations', escalationsRouter(ctx)],
    ['/review', reviewRouter(ctx)],
    ['/reviews', reviewsRouter(ctx)],
    ['/reports', reportsRouter(ctx)],
    ['/exports', exportsRouter(ctx)],
    ['/admin', adminRouter(ctx)],
    ['/admin', rosterUploadsRouter(ctx)],
    ['/readings-import', readingsImportRouter(ctx)],
    // The demo's mailbox only: production has no mail catcher, and /api/mailbox answers 404 there.
    ...(ctx.config.mode === 'demo' ? ([['/mailbox', mailboxRouter(ctx)]] as [string, Router][]) : []),
  ];
}
