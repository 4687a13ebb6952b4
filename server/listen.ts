import fs from 'node:fs';
import http from 'node:http';
import https from 'node:https';
import type { RequestListener } from 'node:http';
import type { AppConfig } from './config';

/**
 * Listen on the configured port: HTTPS from the certificate and key files when the configuration
 * names them (a service worker, and so the app with no connection, needs a secure page), plain
 * HTTP otherwise (localhost, or behind a TLS proxy).
 */
export function listen(app: RequestListener, config: Pick<AppConfig, 'port' | 'host' | 'tls'>, onListening: (server: http.Server, scheme: 'http' | 'https') => void): http.Server {
  const server = config.tls ? https.createServer({ cert: fs.readFileSync(config.tls.certFile), key: fs.readFileSync(config.tls.keyFile) }, app) : http.createServer(app);
  const scheme = config.tls ? 'https' : 'http';
  server.listen(config.port, config.host, () => onListening(server, scheme));
  return server;
}
