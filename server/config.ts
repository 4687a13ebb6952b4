import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { z } from 'zod';

const bool = z
  .enum(['true', 'false', '1', '0', 'yes', 'no'])
  .transform((v) => v === 'true' || v === '1' || v === 'yes');

const envSchema = z.object({
  PORT: z.coerce.number().int().min(0).max(65535).default(8080),
  HOST: z.string().default('0.0.0.0'),
  DATA_DIR: z.string().default('data'),
  DATABASE_PATH: z.string().optional(),
  JWT_SECRET: z.string().min(32, 'JWT_SECRET must be at least 32 characters').optional(),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().min(0).max(65535).default(2525),
  /** Start the local fake SMTP server inside the product (development and demos). */
  SMTP_FAKE: bool.default(true),
  SMTP_USER: z.string().optional(),
  SMTP_PASS: z.string().optional(),
  MAIL_FROM: z.string().default('Warmfold <warmfold@localhost>'),
  /** Used in e-mailed links; defaults to http://localhost:PORT. */
  PUBLIC_URL: z.string().url().optional(),
  /** Comma-separated origins allowed to call the API from another origin. */
  CORS_ORIGINS: z.string().default(''),
  WEB_DIR: z.string().default('dist'),
  SEED_DEMO: bool.default(true),
  LOG_REQUESTS: bool.default(true),
  BCRYPT_COST: z.coerce.number().int().min(10).max(15).default(10),
});

export interface AppConfig {
  port: number;
  host: string;
  dataDir: string;
  databasePath: string;
  jwtSecret: string;
  smtp: { host: string; port: number; fake: boolean; user?: string; pass?: string; from: string };
  publicUrl: string;
  corsOrigins: string[];
  webDir: string;
  seedDemo: boolean;
  logRequests: boolean;
  bcryptCost: number;
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

export function loadConfig(env: NodeJS.ProcessEnv = process.env): AppConfig {
  const parsed = envSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Invalid configuration:\n${lines.join('\n')}`);
  }
  const e = parsed.data;
  const dataDir = path.resolve(e.DATA_DIR);
  return {
    port: e.PORT,
    host: e.HOST,
    dataDir,
    databasePath: path.resolve(e.DATABASE_PATH ?? path.join(dataDir, 'warmfold.db')),
    jwtSecret: e.JWT_SECRET ?? persistentSecret(dataDir),
    smtp: { host: e.SMTP_HOST, port: e.SMTP_PORT, fake: e.SMTP_FAKE, user: e.SMTP_USER, pass: e.SMTP_PASS, from: e.MAIL_FROM },
    publicUrl: (e.PUBLIC_URL ?? `http://localhost:${e.PORT}`).replace(/\/$/, ''),
    corsOrigins: e.CORS_ORIGINS.split(',').map((s) => s.trim()).filter(Boolean),
    webDir: path.resolve(e.WEB_DIR),
    seedDemo: e.SEED_DEMO,
    logRequests: e.LOG_REQUESTS,
    bcryptCost: e.BCRYPT_COST,
  };
}

/** A config for tests: everything explicit, nothing read from the environment. */
export function testConfig(overrides: Partial<AppConfig> = {}): AppConfig {
  return {
    port: 0,
    host: '127.0.0.1',
    dataDir: overrides.dataDir ?? 'data/test',
    databasePath: ':memory:',
    jwtSecret: 'test-secret-that-is-long-enough-for-hs256-signing',
    smtp: { host: '127.0.0.1', port: 0, fake: true, from: 'Warmfold <warmfold@localhost>' },
    publicUrl: 'http://localhost:8080',
    corsOrigins: [],
    webDir: 'dist-missing',
    seedDemo: false,
    logRequests: false,
    bcryptCost: 10,
    ...overrides,
  };
}
