import type { Router } from 'express';
import type { AppContext } from '../context';
import { authRouter } from './auth';
import { healthRouter } from './health';

/** Every API router and where it is mounted under /api. Add new resources here. */
export function apiRouters(ctx: AppContext): Array<[string, Router]> {
  return [
    ['/', healthRouter(ctx)],
    ['/auth', authRouter(ctx)],
  ];
}
