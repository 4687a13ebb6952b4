/**
 * Demo and production modes, tested by starting the real server process (server/index.ts under
 * tsx) with each environment. The rule checked is common practice for a product whose demo
 * publishes its passwords: a production start refuses the demo's accounts, mail catcher and
 * generated secret, and says which variables to set.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { openDatabase } from '../../db/client';
import { DEMO_PASSWORD } from '../../db/seed';
import { seedDemo } from '../../server/demo-seed';
import { ConfigError, loadConfig } from '../../server/config';
import { DEMO } from './helpers';

const ROOT = path.resolve(__dirname, '..', '..');
const TSX = path.join(ROOT, 'node_modules', '.bin', 'tsx');
const SECRET = 'a-production-secret-that-is-long-enough-0123456789';

interface Run {
  code: number | null;
  stdout: string;
  stderr: string;
  base: string | null;
  child: ChildProcess;
}

/** The child's whole environment: only what a test passes, over a few neutral defaults. */
function childEnv(dataDir: string, extra: Record<string, string>): NodeJS.ProcessEnv {
  return {
    NODE_ENV: 'test',
    PATH: process.env.PATH ?? '',
    HOME: process.env.HOME ?? '',
    PORT: '0',
    HOST: '127.0.0.1',
    SMTP_PORT: '0',
    DATA_DIR: dataDir,
    LOG_REQUESTS: 'false',
    ESCALATION_INTERVAL_SECONDS: '3600',
    ...extra,
  };
}

/** Start server/index.ts; resolve when it prints its address or exits. */
function start(env: Record<string, string>, dataDir: string): Promise<Run> {
  const child = spawn(TSX, [path.join('server', 'index.ts')], { cwd: ROOT, env: childEnv(dataDir, env), stdio: ['ignore', 'pipe', 'pipe'] });
  const run: Run = { code: null, stdout: '', stderr: '', base: null, child };
  return new Promise((resolve) => {
    child.stdout!.on('data', (chunk: Buffer) => {
      run.stdout += chunk.toString();
      const match = /running at http:\/\/localhost:(\d+)/.exec(run.stdout);
      if (match && !run.base) {
        run.base = `http://127.0.0.1:${match[1]}`;
        // The banner is printed in one go, just after the address.
        setTimeout(() => resolve(run), 200);
      }
    });
    child.stderr!.on('data', (chunk: Buffer) => (run.stderr += chunk.toString()));
    child.on('exit', (code) => {
      run.code = code;
      resolve(run);
    });
  });
}

function stop(run: Run): Promise<void> {
  return new Promise((resolve) => {
    if (run.child.exitCode !== null) return resolve();
    run.child.on('exit', () => resolve());
    run.child.kill('SIGTERM');
  });
}

const dirs: string[] = [];
function freshDir(): string {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'warmfold-modes-'));
  dirs.push(dir);
  return path.join(dir, 'data');
}
afterAll(() => {
  for (const d of dirs) fs.rmSync(d, { recursive: true, force: true });
});

const PRODUCTION_ENV = {
  WARMFOLD_MODE: 'production',
  JWT_SECRET: SECRET,
  SMTP_HOST: 'relay.example-hospital.test',
  PUBLIC_URL: 'https://warmfold.example-hospital.test',
  AUDIT_KEY: `${SECRET}-audit`,
};

describe('a production start refuses what belongs to the demo', () => {
  it('with nothing set, exits with 78 and names JWT_SECRET, SMTP_HOST and PUBLIC_URL, writing nothing to the data folder', async () => {
    const dataDir = freshDir();
    const run = await start({ NODE_ENV: 'production' }, dataDir);
    expect(run.code).toBe(78);
    expect(run.stderr).toMatch(/production mode/);
    for (const variable of ['JWT_SECRET', 'SMTP_HOST', 'PUBLIC_URL']) expect(run.stderr).toContain(`${variable}:`);
    // No generated secret, no database: the refusal comes first.
    expect(fs.existsSync(dataDir)).toBe(false);
  });

  it('refuses the mail catcher and the demo seed when they are asked for by name', async () => {
    const run = await start({ ...PRODUCTION_ENV, SMTP_FAKE: 'true', SEED_DEMO: 'true' }, freshDir());
    expect(run.code).toBe(78);
    expect(run.stderr).toContain('SMTP_FAKE:');
    expect(run.stderr).toContain('SEED_DEMO:');
    expect(run.stderr).not.toContain('JWT_SECRET:');
  });

  it('refuses a database that holds the demo accounts, naming them', async () => {
    const dataDir = freshDir();
    fs.mkdirSync(dataDir, { recursive: true });
    const database = openDatabase(path.join(dataDir, 'warmfold.db'));
    await seedDemo(database, { now: new Date(), bcryptCost: 10 });
    database.close();
    const run = await start(PRODUCTION_ENV, dataDir);
    expect(run.code).toBe(78);
    expect(run.stderr).toContain('demo account');
    expect(run.stderr).toContain(DEMO.admin);
    expect(run.stderr).toMatch(/DATA_DIR/);
  });

  it('starts on a fresh database with everything set: no seed, no mail catcher, no mailbox', async () => {
    const dataDir = freshDir();
    const run = await start(PRODUCTION_ENV, dataDir);
    try {
      expect(run.base).not.toBeNull();
      expect(run.stdout).toContain('production mode');
      expect(run.stdout).not.toMatch(/DEMO|mail catcher|warm-hands/);
      const health = await request(run.base!).get('/api/health');
      expect(health.body.mode).toBe('production');
      expect((await request(run.base!).get('/api/mailbox')).status).toBe(404);
      // Nobody to sign in as: the demo's accounts were never laid down.
      const signIn = await request(run.base!).post('/api/auth/sign-in').send({ email: DEMO.nurse, password: DEMO_PASSWORD });
      expect(signIn.status).toBe(401);
      expect(fs.existsSync(path.join(dataDir, 'jwt-secret'))).toBe(false);
    } finally {
      await stop(run);
    }
  });
});

describe('the demo start', () => {
  it('seeds the unit, starts the mail catcher and says it is the demo; each person has a mailbox', async () => {
    const run = await start({}, freshDir());
    try {
      expect(run.base).not.toBeNull();
      expect(run.stdout).toContain('DEMO MODE');
      expect(run.stdout).toMatch(/mail catcher \(fake SMTP\) on 127\.0\.0\.1:\d+/);
      expect(run.stdout).toContain(DEMO.nurse);
      const signIn = await request(run.base!).post('/api/auth/sign-in').send({ email: DEMO.nurse, password: DEMO_PASSWORD });
      expect(signIn.status).toBe(200);
      const mailbox = await request(run.base!).get('/api/mailbox').set('Authorization', `Bearer ${signIn.body.token}`);
      expect(mailbox.status).toBe(200);
      expect((await request(run.base!).get('/api/health')).body.mode).toBe('demo');
    } finally {
      await stop(run);
    }
  });
});

describe('loadConfig', () => {
  it('takes NODE_ENV=production as production, and WARMFOLD_MODE over NODE_ENV', () => {
    expect(() => loadConfig({ NODE_ENV: 'production', DATA_DIR: freshDir() })).toThrow(ConfigError);
    const demo = loadConfig({ NODE_ENV: 'production', WARMFOLD_MODE: 'demo', DATA_DIR: freshDir() });
    expect(demo.mode).toBe('demo');
    expect(demo.smtp.fake).toBe(true);
    expect(demo.jwtSecretGenerated).toBe(true);
    const prod = loadConfig({ ...PRODUCTION_ENV, DATA_DIR: freshDir() });
    expect(prod).toMatchObject({ mode: 'production', seedDemo: false, jwtSecretGenerated: false, trustProxy: false });
    expect(prod.smtp.fake).toBe(false);
  });
});
