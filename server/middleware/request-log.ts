import type { RequestHandler } from 'express';

/** One line per request: method, path without query, status, time. Never bodies, headers or tokens. */
export function requestLog(log: (line: string) => void): RequestHandler {
  return (req, res, next) => {
    const started = process.hrtime.bigint();
    res.on('finish', () => {
      const ms = Number(process.hrtime.bigint() - started) / 1e6;
      const pathOnly = req.originalUrl.split('?')[0]!.replace(/token=[^&/]+/gi, 'token=…');
      log(`${new Date().toISOString()} ${req.method} ${pathOnly} ${res.statusCode} ${ms.toFixed(1)}ms`);
    });
    next();
  };
}
