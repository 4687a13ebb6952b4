import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { z } from 'zod';

const bool = z.enum(['true', 'false', '1', '0', 'yes', 'no']).transform((v) => v === 'true' || v === '1' || v === 'yes');

/** The demo (invented unit, published passwords, a mail catcher) or a real deployment. */
export type Mode = 'demo' | 'production';

const envSchema = z.object({
  /** `demo` or `production`; when unset, NODE_ENV=production means production and anything else the demo. */
  WARMFOLD_MODE: z.enum(['demo', 'production']).optional(),
  NODE_ENV: z.string().optional(),
  PORT: z.coerce.number().int().min(0).max(65535).default(8080),
  HOST: z.string().default('0.0.0.0'),
  DATA_DIR: z.string().default('data'),
  DATABASE_PATH: z.string().optional(),
  JWT_SECRET: z.string().min(32, 'JWT_SECRET must be at least 32 characters').optional(),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().min(0).max(65535).default(2525),
  /** Start the local fake SMTP server inside the product (the demo only; default true there, false in production). */
  SMTP_FAKE: bool.optional(),
  SMTP_USER: z.string().optional(),
  SMTP_PASS: z.string().optional(),
  MAIL_FROM: z.string().default('Warmfold <warmfold@localhost>'),
  /** Used in e-mailed links; defaults to http://localhost:PORT. */
  PUBLIC_URL: z.string().url().optional(),
  /** Comma-separated origins allowed to call the API from another origin. */
  CORS_ORIGINS: z.string().default(''),
  WEB_DIR: z.string().default('dist'),
  SEED_DEMO: bool.optional(),
  /**
   * The proxies whose X-Forwarded-For is believed, comma-separated: addresses, CIDR ranges, or
   * Express's names loopback, linklocal, uniquelocal. Empty (the default): none.
   */
  TRUST_PROXY: z.string().default(''),
  LOG_REQUESTS: bool.default(true),
  BCRYPT_COST: z.coerce.number().int().min(10).max(15).default(10),
  /**
   * Serve HTTPS itself: the certificate (PEM, with its chain) and its private key (PEM). Both or
   * neither; without them the server speaks HTTP and HTTPS is a proxy's job (README).
   */
  TLS_CERT_FILE: z.string().optional(),
  TLS_KEY_FILE: z.string().optional(),
});

export interface AppConfig {
  mode: Mode;
  port: number;
  host: string;
  dataDir: string;
  databasePath: string;
  jwtSecret: string;
  /** True when the secret was made on first start and kept in the data folder (the demo only). */
  jwtSecretGenerated: boolean;
  smtp: { host: string; port: number; fake: boolean; user?: string; pass?: string; from: string };
  publicUrl: string;
  corsOrigins: string[];
  webDir: string;
  seedDemo: boolean;
  logRequests: boolean;
  bcryptCost: number;
  /** Express's `trust proxy`: false, or the proxies named in TRUST_PROXY. */
  trustProxy: false | string[];
  /** The certificate and key files when the server speaks HTTPS itself; null for HTTP. */
  tls: { certFile: string; keyFile: string } | null;
}

/** Read a secret kept in the data folder, or make one on first start. */
function persistentSecret(dataDir: string): string {
  const file = path.join(dataDir, 'jwt-secret');
  if (fs.existsSync(file)) return fs.readFileSync(file, 'utf8').trim();
  fs.mkdirSync(dataDir, { recursive: true });
  const secret = randomBytes(48).toString('base64url');
  fs.writeFileSync(file, secret, { mode: 0o600 });
  return secret;
}

const PROXY_NAMES = new Set(['loopback', 'linklocal', 'uniquelocal']);

/** TRUST_PROXY's entries: names, addresses or CIDR ranges only (never `true` or a hop count, which would let any client choose its address). */
function parseTrustProxy(value: string): { list: false | string[]; problems: string[] } {
  const entries = value
    .split(',')
    .map((s) => s.trim())
    .filter(Boolean);
  if (entries.length === 0) return { list: false, problems: [] };
  const problems: string[] = [];
  for (const entry of entries) {
    const [address, prefix, extra] = entry.split('/');
    const family = net.isIP(address ?? '');
    const prefixOk = prefix === undefined || (/^\d{1,3}$/.test(prefix) && Number(prefix) <= (family === 6 ? 128 : 32));
    if (PROXY_NAMES.has(entry) || (family !== 0 && prefixOk && extra === undefined)) continue;
    problems.push(`TRUST_PROXY: "${entry}" is not an address, a CIDR range or one of loopback, linklocal, uniquelocal (name the proxy itself, never true or a number)`);
  }
  return { list: problems.length ? false : entries, problems };
}

/** TLS_CERT_FILE and TLS_KEY_FILE: both or neither, each a readable file. */
function parseTls(certFile: string | undefined, keyFile: string | undefined): { tls: AppConfig['tls']; problems: string[] } {
  if (!certFile && !keyFile) return { tls: null, problems: [] };
  const problems: string[] = [];
  if (!certFile) problems.push('TLS_CERT_FILE: set it with TLS_KEY_FILE (the certificate in PEM, with its chain), or unset both for HTTP');
  if (!keyFile) problems.push('TLS_KEY_FILE: set it with TLS_CERT_FILE (the private key in PEM), or unset both for HTTP');
  for (const [name, file] of [
    ['TLS_CERT_FILE', certFile],
    ['TLS_KEY_FILE', keyFile],
  ] as const) {
    if (file && !fs.existsSync(file)) problems.push(`${name}: no file at ${file}`);
  }
  return problems.length ? { tls: null, problems } : { tls: { certFile: path.resolve(certFile!), keyFile: path.resolve(keyFile!) }, problems };
}

/** The configuration could not be used; `problems` says, one line each, which variable to set and how. */
export class ConfigError extends Error {
  constructor(
    readonly mode: Mode,
    readonly problems: string[],
  ) {
    super(
      mode === 'production'
        ? `Warmfold will not start in production mode. Set or change:\n${problems.map((p) => `  ${p}`).join('\n')}\n(For the demo, unset NODE_ENV or set WARMFOLD_MODE=demo.)`
        : `Invalid configuration:\n${problems.map((p) => `  ${p}`).join('\n')}`,
    );
    this.name = 'ConfigError';
  }
}

/** What production refuses in the environment: the demo's mail catcher, its seed, a generated secret, links to localhost. */
/** The environment as loadConfig reads it (process.env, or a test's own variables). */
export type Environment = Readonly<Record<string, string | undefined>>;

function productionProblems(env: Environment, e: z.infer<typeof envSchema>): string[] {
  const problems: string[] = [];
  if (!e.JWT_SECRET)
    problems.push(
      'JWT_SECRET: a secret of at least 32 characters kept outside the data folder (for example the output of `openssl rand -base64 48`); production never uses a generated one',
    );
  if (e.SMTP_FAKE === true) problems.push("SMTP_FAKE: the local mail catcher is the demo's; set SMTP_FAKE=false (or leave it unset) and point SMTP_HOST at your mail relay");
  if (!env.SMTP_HOST) problems.push("SMTP_HOST: your mail relay's host name (with SMTP_PORT, and SMTP_USER and SMTP_PASS if it asks for them)");
  if (e.SEED_DEMO === true) problems.push("SEED_DEMO: the demo accounts' password is published; set SEED_DEMO=false (or leave it unset)");
  if (!e.PUBLIC_URL) problems.push('PUBLIC_URL: the address staff open, such as https://warmfold.example-hospital.org (used in e-mailed links)');
  return problems;
}

export function modeOf(env: Environment): Mode {
  if (env.WARMFOLD_MODE === 'production' || env.WARMFOLD_MODE === 'demo') return env.WARMFOLD_MODE;
  return env.NODE_ENV === 'production' ? 'production' : 'demo';
}

export function loadConfig(env: Environment = process.env): AppConfig {
  const mode = modeOf(env);
  const parsed = envSchema.safeParse(env);
  if (!parsed.success) {
    throw new ConfigError(
      mode,
      parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`),
    );
  }
  const e = parsed.data;
  const trust = parseTrustProxy(e.TRUST_PROXY);
  const tls = parseTls(e.TLS_CERT_FILE, e.TLS_KEY_FILE);
  const problems = [...trust.problems, ...tls.problems, ...(mode === 'production' ? productionProblems(env, e) : [])];
  if (problems.length) throw new ConfigError(mode, problems);
  const demo = mode === 'demo';
  const dataDir = path.resolve(e.DATA_DIR);
  return {
    mode,
    port: e.PORT,
    host: e.HOST,
    dataDir,
    databasePath: path.resolve(e.DATABASE_PATH ?? path.join(dataDir, 'warmfold.db')),
    jwtSecret: e.JWT_SECRET ?? persistentSecret(dataDir),
    jwtSecretGenerated: !e.JWT_SECRET,
    smtp: { host: e.SMTP_HOST, port: e.SMTP_PORT, fake: e.SMTP_FAKE ?? demo, user: e.SMTP_USER, pass: e.SMTP_PASS, from: e.MAIL_FROM },
    publicUrl: (e.PUBLIC_URL ?? `${tls.tls ? 'https' : 'http'}://localhost:${e.PORT}`).replace(/\/$/, ''),
    corsOrigins: e.CORS_ORIGINS.split(',')
      .map((s) => s.trim())
      .filter(Boolean),
    webDir: path.resolve(e.WEB_DIR),
    seedDemo: e.SEED_DEMO ?? demo,
    logRequests: e.LOG_REQUESTS,
    bcryptCost: e.BCRYPT_COST,
    trustProxy: trust.list,
    tls: tls.tls,
  };
}

/** A config for tests: everything explicit, nothing read from the environment. */
export function testConfig(overrides: Partial<AppConfig> = {}): AppConfig {
  return {
    mode: 'demo',
    port: 0,
    host: '127.0.0.1',
    dataDir: overrides.dataDir ?? 'data/test',
    databasePath: ':memory:',
    jwtSecret: 'test-secret-that-is-long-enough-for-hs256-signing',
    jwtSecretGenerated: false,
    smtp: { host: '127.0.0.1', port: 0, fake: true, from: 'Warmfold <warmfold@localhost>' },
    publicUrl: 'http://localhost:8080',
    corsOrigins: [],
    webDir: 'dist-missing',
    seedDemo: false,
    logRequests: false,
    bcryptCost: 10,
    trustProxy: false,
    tls: null,
    ...overrides,
  };
}
