import type { RequestHandler } from 'express';

/**
 * One line per request: client address, method, path without query, status, time. Never bodies,
 * headers or tokens. The address is `req.ip`: X-Forwarded-For counts only from a proxy named in
 * TRUST_PROXY (server/app.ts), so a client cannot write another address into the log.
 */
export function requestLog(log: (line: string) => void): RequestHandler {
  return (req, res, next) => {
    const started = process.hrtime.bigint();
    res.on('finish', () => {
      const ms = Number(process.hrtime.bigint() - started) / 1e6;
      const pathOnly = req.originalUrl.split('?')[0]!.replace(/token=[^&/]+/gi, 'token=…');
      log(`${new Date().toISOString()} ${req.ip ?? '-'} ${req.method} ${pathOnly} ${res.statusCode} ${ms.toFixed(1)}ms`);
    });
    next();
  };
}
