import type { Router } from 'express';
import type { AppContext } from '../context';
import { adminRouter } from './admin';
import { authRouter } from './auth';
import { flagsRouter, readingsRouter, skinToSkinRouter } from './bedside';
import { escalationsRouter } from './escalations';
import { healthRouter } from './health';
import { infantsRouter } from './infants';
import { mailboxRouter } from './mailbox';
import { nursesRouter } from './nurses';
import { exportsRouter, reportsRouter } from './reports';
import { reviewRouter, reviewsRouter } from './review';
import { unitsRouter } from './units';
import { readingsImportRouter } from './uploads';

/**
 * Every API router and where it is mounted under /api: exactly one router per prefix, so all of a
 * resource's routes (and their order) are read in one file. Add new routes to the resource's router.
 */
export function apiRouters(ctx: AppContext): [string, Router][] {
  return [
    // Health and ping stay at the root: /api/health and /api/ping are two one-word probes, not a resource.
    ['/', healthRouter(ctx)],
    ['/auth', authRouter(ctx)],
    ['/infants', infantsRouter(ctx)],
    // The unit's router reads :unitId from the mount path (it is built with mergeParams).
    ['/units/:unitId', unitsRouter(ctx)],
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
    ['/readings-import', readingsImportRouter(ctx)],
    // The demo's mailbox only: production has no mail catcher, and /api/mailbox answers 404 there.
    ...(ctx.config.mode === 'demo' ? ([['/mailbox', mailboxRouter(ctx)]] as [string, Router][]) : []),
  ];
}
