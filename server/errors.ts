import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import type { ApiErrorBody, ApiErrorCode } from '../shared/api';

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: ApiErrorCode,
    message: string,
    readonly fields?: Record<string, string>,
    readonly headers?: Record<string, string>,
  ) {
    super(message);
  }
}

export const badRequest = (message: string, fields?: Record<string, string>) => new ApiError(400, 'invalid', message, fields);
export const unauthorized = (message = 'Please sign in again.') => new ApiError(401, 'unauthorized', message);
export const forbidden = (message = 'Your role or unit does not allow this.') => new ApiError(403, 'forbidden', message);
export const notFound = (what = 'That record') => new ApiError(404, 'not-found', `${what} was not found.`);
export const conflict = (message: string, fields?: Record<string, string>) => new ApiError(409, 'conflict', message, fields);

export function zodFields(error: ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) {
    if (issue.code === 'unrecognized_keys') {
      for (const key of issue.keys) fields[[...issue.path, key].join('.')] = 'This field is not allowed.';
      continue;
    }
    const key = issue.path.length ? issue.path.join('.') : '_';
    if (!fields[key]) fields[key] = issue.message;
  }
  return fields;
}

export function body(code: ApiErrorCode, message: string, fields?: Record<string, string>): ApiErrorBody {
  return { error: fields ? { code, message, fields } : { code, message } };
}

export const apiNotFound: RequestHandler = (req, res) => {
  res.status(404).json(body('not-found', `No API route for ${req.method} ${req.originalUrl.split('?')[0]}.`));
};

/** The last middleware: every failure leaves as JSON, never as Express's HTML page. */
export function errorHandler(log: (line: string) => void): ErrorRequestHandler {
  return (err, _req, res, next) => {
    if (res.headersSent) return next(err);
    if (err instanceof ApiError) {
      if (err.headers) res.set(err.headers);
      res.status(err.status).json(body(err.code, err.message, err.fields));
      return;
    }
    if (err instanceof ZodError) {
      res.status(400).json(body('invalid', 'Some fields need attention.', zodFields(err)));
      return;
    }
    const e = err as { type?: string; status?: number; name?: string; field?: string; code?: string; message?: string };
    if (e.type === 'entity.parse.failed') {
      res.status(400).json(body('bad-request', 'The request body is not valid JSON.', { _: 'Malformed JSON.' }));
      return;
    }
    if (e.type === 'entity.too.large' || e.code === 'LIMIT_FILE_SIZE') {
      res.status(413).json(body('payload-too-large', 'The request is too large.', e.field ? { [e.field]: 'Too large.' } : undefined));
      return;
    }
    if (e.name === 'MulterError') {
      res.status(400).json(body('invalid', e.message ?? 'The upload was refused.', e.field ? { [e.field]: e.message ?? 'Refused.' } : undefined));
      return;
    }
    if (e.name === 'ThermalInputError' && e.field) {
      res.status(400).json(body('invalid', e.message ?? 'A value is out of range.', { [e.field]: e.message ?? 'Out of range.' }));
      return;
    }
    if (typeof e.status === 'number' && e.status >= 400 && e.status < 500) {
      res.status(e.status).json(body('bad-request', e.message ?? 'Bad request.'));
      return;
    }
    log(`error: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}`);
    res.status(500).json(body('server-error', 'Something went wrong on the server. Your entry was not saved; please try again.'));
  };
}
