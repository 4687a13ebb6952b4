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
export function multipartErrorsAs400(handler: RequestHandler, field = 'file'): RequestHandler & { acceptsMultipart: true } {
  const wrapped = (req: Parameters<RequestHandler>[0], res: Parameters<RequestHandler>[1], next: Parameters<RequestHandler>[2]) => {
    handler(req, res, (err?: unknown) => {
      if (!err || err instanceof ApiError || !(err instanceof Error)) return next(err);
      const e = err as Error & { code?: unknown; errno?: unknown; storageErrors?: unknown };
      if (e.name === 'MulterError' || e.code !== undefined || e.errno !== undefined) return next(err);
      next(badRequest('The upload is not a well-formed multipart form.', { [field]: `The upload could not be read (${e.message}). Choose the file again.` }));
    });
  };
  // secureRouter sees this mark and lets the route take a multipart body.
  return Object.assign(wrapped, { acceptsMultipart: true as const });
}

/**
 * A body that is not JSON answers 415: express.json() leaves such a body unread, and the route
 * would otherwise take the request as an empty JSON object (a discharge whose note was sent as
 * text/plain went through without it). A route whose handlers read an upload (marked by
 * multipartErrorsAs400) takes multipart/form-data too. A request without a body passes.
 * secureRouter puts this right after each route's access rule.
 */
export function bodyTypeCheck(acceptsMultipart: boolean): RequestHandler {
  return (req, _res, next) => {
    const hasBody = req.headers['transfer-encoding'] !== undefined || Number(req.headers['content-length'] ?? 0) > 0;
    if (!hasBody || req.is(['application/json', 'application/*+json'])) return next();
    if (acceptsMultipart && req.is('multipart/form-data')) return next();
    const type = (req.headers['content-type'] ?? 'a body without a Content-Type').split(';')[0];
    const expected = acceptsMultipart ? 'a multipart/form-data upload' : 'a JSON body (Content-Type: application/json)';
    next(
      new ApiError(415, 'unsupported-media-type', `This route takes ${expected}, not ${type}.`, {
        _: acceptsMultipart ? 'Send the file as a form upload.' : 'Send the body as JSON.',
      }),
    );
  };
}
