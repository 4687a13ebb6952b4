import type { Router } from 'express';
import type { AppContext } from '../context';
import { admissionsRouter } from './admissions';
import { accountLinksRouter } from './account-links';
import { adminRouter } from './admin';
import { authRouter } from './auth';
import { bedWarmingRouter } from './bed-warming';
import { shiftWorkRouter } from './shift-work';
import { flagsRouter, readingsRouter, skinToSkinRouter } from './bedside';
import { escalationsRouter } from './escalations';
import { handoverRouter } from './handover';
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
    ['/', healthRouter(ctx)],
    ['/auth', authRouter(ctx)],
    ['/infants', infantsRouter(ctx)],
    ['/readings', readingsRouter(ctx)],
    ['/flags', flagsRouter(ctx)],
    ['/skin-to-skin', skinToSkinRouter(ctx)],
    ['/', unitBoardRouter(ctx)],
    ['/', admissionsRouter(ctx)],
    ['/', bedWarmingRouter(ctx)],
    ['/', shiftWorkRouter(ctx)],
    ['/escalations', escalationsRouter(ctx)],
    ['/', handoverRouter(ctx)],
    ['/auth', accountLinksRouter(ctx)],
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
