import type { RequestHandler } from 'express';
import type { z } from 'zod';
import { ApiError, badRequest, zodFields } from '../errors';

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

/**
 * A multipart body that cannot be parsed (a malformed part header, a missing boundary, a body cut
 * short) is the sender's fault: busboy reports it as a plain Error, which would become a 500.
 * Such errors answer 400 naming the upload field; errors with a system code (a full disk, a
 * permission) stay server errors, and the handler's own ApiErrors pass through.
 */
export function multipartErrorsAs400(handler: RequestHandler, field = 'file'): RequestHandler {
  return (req, res, next) => {
    handler(req, res, (err?: unknown) => {
      if (!err || err instanceof ApiError || !(err instanceof Error)) return next(err);
      const e = err as Error & { code?: unknown; errno?: unknown; storageErrors?: unknown };
      if (e.name === 'MulterError' || e.code !== undefined || e.errno !== undefined) return next(err);
      next(badRequest('The upload is not a well-formed multipart form.', { [field]: `The upload could not be read (${e.message}). Choose the file again.` }));
    });
  };
}
