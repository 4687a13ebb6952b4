import { Router, type NextFunction, type Request, type RequestHandler, type Response } from 'express';
import { can, type Permission } from '../../shared/roles';
import type { AppContext } from '../context';
import { forbidden, unauthorized } from '../errors';
import { verifyToken } from '../services/auth';

export type Access = 'public' | 'signed-in' | Permission;

/** The access rule a route declared; the role-matrix test reads it from the router stack. */
export type AccessHandler = RequestHandler & { access: Access };

/** Every route starts with `allow(...)`; `secureRouter` refuses, at start-up, a route without it. */
export function allow(ctx: AppContext, access: Access): AccessHandler {
  const handler = ((req: Request, _res: Response, next: NextFunction) => {
    if (access === 'public') return next();
    const header = req.get('authorization') ?? '';
    const match = /^Bearer\s+(\S+)$/i.exec(header);
    if (!match) return next(unauthorized('Please sign in.'));
    req.auth = verifyToken(ctx, match[1]!);
    if (access !== 'signed-in' && !can(req.auth.role, access)) return next(forbidden());
    next();
  }) as AccessHandler;
  handler.access = access;
  return handler;
}

/** Throws 403 unless the signed-in user belongs to the unit. */
export function assertUnit(req: Request, unitId: string): void {
  if (!req.auth) throw unauthorized();
  if (!req.auth.unitIds.includes(unitId)) throw forbidden('This infant or record belongs to a unit you are not part of.');
}

const METHODS = ['get', 'post', 'put', 'patch', 'delete'] as const;

/**
 * An Express router whose routes must each begin with an `allow(...)` handler. Forgetting the
 * access rule throws when the app is built, so a route can never be open by accident.
 */
export function secureRouter(): Router {
  const router = Router();
  for (const method of METHODS) {
    const original = router[method].bind(router) as (path: string, ...handlers: RequestHandler[]) => Router;
    (router as unknown as Record<string, unknown>)[method] = (path: string, ...handlers: RequestHandler[]) => {
      const first = handlers[0] as Partial<AccessHandler> | undefined;
      if (!first || typeof first.access !== 'string') {
        throw new Error(`Route ${method.toUpperCase()} ${path} has no access rule: start it with allow(ctx, ...)`);
      }
      return original(path, ...handlers);
    };
  }
  return router;
}
