import compression from 'compression';
import cors from 'cors';
import express, { type Express, type Request, type Response } from 'express';
import helmet from 'helmet';
import type { Database_ } from '../db/client';
import type { Clock } from './clock';
import type { AppConfig } from './config';
import type { AppContext } from './context';
import { apiNotFound, errorHandler } from './errors';
import type { Mailer } from './mail/mailer';
import { requestLog } from './middleware/request-log';
import { apiRouters } from './routes';
import { inlineScriptHashes, serveWeb } from './web';

export interface CreateAppOptions {
  db: Database_;
  mailer: Mailer;
  clock: Clock;
  config: AppConfig;
  log?: (line: string) => void;
}

export const JSON_BODY_LIMIT = '100kb';

/** Whether the `compression` middleware may compress an API answer (paths are relative to /api). */
export function compressibleAnswer(req: Request, res: Response): boolean {
  return !req.path.startsWith('/auth/') && compression.filter(req, res);
}

/** Builds the whole product as an Express app. Tests call this; server/index.ts listens. */
export function createApp({ db, mailer, clock, config, log = (line) => process.stdout.write(`${line}\n`) }: CreateAppOptions): Express & { context: AppContext } {
  const ctx: AppContext = { database: db, mailer, clock, config, log };
  const app = express() as Express & { context: AppContext };
  app.context = ctx;
  app.disable('x-powered-by');
  // X-Forwarded-For is believed only from the proxies TRUST_PROXY names (none by default), so a
  // client reaching the port directly cannot choose the address its throttling and log lines use.
  app.set('trust proxy', config.trustProxy);
  // API answers are Cache-Control: no-store, so an ETag is never used; computing one hashes every
  // body (a whole unit's board) on every request. Static files carry their own (serve-static).
  app.set('etag', false);

  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: true,
        directives: {
          'default-src': ["'self'"],
          // react-native-web writes its styles into a <style> element at run time.
          'style-src': ["'self'", "'unsafe-inline'"],
          // The static export's pages carry one inline script (expo-router's hydrate flag); allow it by hash.
          'script-src': ["'self'", ...inlineScriptHashes(config.webDir)],
          'img-src': ["'self'", 'data:', 'blob:'],
          'font-src': ["'self'", 'data:'],
          'connect-src': ["'self'"],
          'frame-ancestors': ["'none'"],
          'object-src': ["'none'"],
          'base-uri': ["'self'"],
          'form-action': ["'self'"],
          'upgrade-insecure-requests': null,
        },
      },
      strictTransportSecurity: { maxAge: 31_536_000, includeSubDomains: true },
      referrerPolicy: { policy: 'no-referrer' },
      crossOriginEmbedderPolicy: false,
    }),
  );
  if (config.logRequests) app.use(requestLog(log));

  const api = express.Router();
  api.use(
    cors({
      origin: (origin, cb) => cb(null, !origin || config.corsOrigins.includes(origin) ? (origin ?? false) : false),
      credentials: false,
    }),
  );
  api.use((_req, res, next) => {
    res.set('Cache-Control', 'no-store');
    next();
  });
  // Answers over 1 KB go out compressed (brotli at quality 4, or gzip): the unit's lists and
  // handovers on a ward's Wi-Fi. The board and flowsheet bring their own compressed bytes
  // (CompressedJson), which the middleware leaves alone. Answers under /auth (sign-in, invitation
  // and reset links) are never compressed: they carry tokens next to text a user typed, the shape
  // BREACH attacks need.
  api.use(compression({ filter: compressibleAnswer }));
  api.use(express.json({ limit: JSON_BODY_LIMIT, strict: true, type: ['application/json', 'application/*+json'] }));
  for (const [mount, router] of apiRouters(ctx)) api.use(mount, router);
  api.use(apiNotFound);
  app.use('/api', api);

  serveWeb(app, config.webDir);
  app.use(errorHandler(log));
  return app;
}
