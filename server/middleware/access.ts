import { eq, sql } from 'drizzle-orm';
import { beds, escalations, flags, infants, readings, reviews, skinToSkinSessions, units } from '../../db/schema';
import { Router, type NextFunction, type Request, type RequestHandler, type Response, type RouterOptions } from 'express';
import { can, type Permission } from '../../shared/roles';
import type { AppContext } from '../context';
import { forbidden, notFound, unauthorized } from '../errors';
import { assertManageable } from '../services/admin-users';
import { perConnection } from '../services/prepared-queries';
import { verifyToken } from '../services/auth';
import { bodyTypeCheck } from './validate';

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
    // The unit check runs before any validation, so another unit's record answers 403 whatever the body.
    checkUnitScope(ctx, req);
    next();
  }) as AccessHandler;
  handler.access = access;
  return handler;
}

/** The records a path can name, each with its unit. */
const UNIT_SCOPED = { infants, readings, flags, skinToSkinSessions, escalations, beds, reviews };
type UnitScoped = keyof typeof UNIT_SCOPED;

/** Which table a path's `:id` names, by the path it sits under. */
const ENTITY_BY_PATH: [RegExp, UnitScoped, string][] = [
  [/\/infants\/:id(\/|$)/, 'infants', 'infant'],
  [/\/readings\/:id(\/|$)/, 'readings', 'reading'],
  [/\/flags\/:id(\/|$)/, 'flags', 'flag'],
  [/\/skin-to-skin\/:id(\/|$)/, 'skinToSkinSessions', 'skin-to-skin session'],
  [/\/escalations\/:id(\/|$)/, 'escalations', 'escalation'],
  [/\/beds\/:id(\/|$)/, 'beds', 'bed'],
  [/\/reviews\/:id(\/|$)/, 'reviews', 'review'],
];

// Prepared once per connection: the unit of a record named in the path is read before every such request (bench: 72-h flowsheet ≥ 50 % of /api/ping).
const unitQueries = perConnection((db) => {
  const unitOf = (name: UnitScoped) => {
    const table = UNIT_SCOPED[name];
    return db
      .select({ unitId: table.unitId })
      .from(table)
      .where(eq(table.id, sql.placeholder('id')))
      .prepare();
  };
  return new Map((Object.keys(UNIT_SCOPED) as UnitScoped[]).map((name) => [name, unitOf(name)]));
});

/**
 * Resolve the unit a route's record belongs to from its path parameters and refuse another
 * unit's record (403) or a record that does not exist (404). Routes whose records carry no unit
 * in the path check it in their handlers with `assertUnit`.
 */
export function checkUnitScope(ctx: AppContext, req: Request): void {
  const auth = req.auth!;
  const params = (req.params ?? {}) as Record<string, string>;
  const { db, sqlite } = ctx.database;
  const assertMember = (unitId: string) => {
    if (auth.unitIds.includes(unitId)) return;
    if (!db.select({ id: units.id }).from(units).where(eq(units.id, unitId)).get()) throw notFound('That unit');
    throw forbidden('You are not part of that unit.');
  };
  if (typeof params.unitId === 'string') return assertMember(params.unitId);
  const pattern = `${req.baseUrl}${(req.route as { path?: string } | undefined)?.path ?? ''}`;
  if (typeof params.id === 'string' && /\/units\/:id(\/|$)/.test(pattern)) return assertMember(params.id);
  if (typeof params.flagId === 'string') return assertRowUnit(sqlite, auth.unitIds, 'flags', params.flagId, 'flag');
  if (typeof params.id !== 'string') return;
  // A person is changed only by an administrator of every unit they work in (see assertManageable).
  if (/\/users\/:id(\/|$)/.test(pattern)) return assertManageable(ctx.database, params.id, auth.unitIds);
  const entry = ENTITY_BY_PATH.find(([re]) => re.test(pattern));
  if (entry) assertRowUnit(sqlite, auth.unitIds, entry[1], params.id, entry[2]);
}

function assertRowUnit(sqlite: AppContext['database']['sqlite'], unitIds: string[], table: UnitScoped, id: string, what: string): void {
  const row = unitQueries(sqlite).get(table)!.get({ id });
  if (!row) throw notFound(`That ${what}`);
  if (!unitIds.includes(row.unitId)) throw forbidden('This record belongs to a unit you are not part of.');
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
export function secureRouter(options?: RouterOptions): Router {
  const router = Router(options);
  for (const method of METHODS) {
    const original = router[method].bind(router) as (path: string, ...handlers: RequestHandler[]) => Router;
    (router as unknown as Record<string, unknown>)[method] = (path: string, ...handlers: RequestHandler[]) => {
      const first = handlers[0] as Partial<AccessHandler> | undefined;
      if (!first || typeof first.access !== 'string') {
        throw new Error(`Route ${method.toUpperCase()} ${path} has no access rule: start it with allow(ctx, ...)`);
      }
      // Right after the access rule: a body that is not JSON (or, for an upload route, multipart) is 415.
      const multipart = handlers.some((h) => (h as Partial<{ acceptsMultipart: boolean }>).acceptsMultipart === true);
      return original(path, handlers[0]!, bodyTypeCheck(multipart), ...handlers.slice(1));
    };
  }
  return router;
}
