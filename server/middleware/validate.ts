import type { RequestHandler } from 'express';
import type { z } from 'zod';
import { badRequest, zodFields } from '../errors';

type Part = 'body' | 'query' | 'params';

/** Parse one part of the request with a shared zod schema; the parsed value is on req.valid. */
export function validate<S extends z.ZodType>(part: Part, schema: S): RequestHandler {
  return (req, _res, next) => {
    const source = part === 'body' ? (req.body ?? {}) : part === 'query' ? req.query : req.params;
    const result = schema.safeParse(source);
    if (!result.success) return next(badRequest('Some fields need attention.', zodFields(result.error)));
    req.valid = { ...req.valid, [part]: result.data };
    next();
  };
}

export function valid<T>(req: Express.Request, part: Part): T {
  return req.valid?.[part] as T;
}
