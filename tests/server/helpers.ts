import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { openDatabase, type Database_ } from '../../db/client';
import { DEMO_PASSWORD } from '../../db/seed';
import { seedDemo } from '../../server/demo-seed';
import { createApp } from '../../server/app';
import { FixedClock } from '../../server/clock';
import { testConfig, type AppConfig } from '../../server/config';
import type { Mailer, MailMessage } from '../../server/mail/mailer';

export const DEMO = {
  nurse: 'nia.okafor@warmfold.test',
  charge: 'marta.lindqvist@warmfold.test',
  educator: 'priya.raman@warmfold.test',
  admin: 'tomas.vidal@warmfold.test',
  southNurse: 'sunniva.hale@warmfold.test',
  password: DEMO_PASSWORD,
} as const;

/** A mailer that keeps what it was asked to send (tests that need real SMTP use the fake server). */
export class MemoryMailer implements Mailer {
  sent: MailMessage[] = [];
  async send(message: MailMessage) {
    this.sent.push(message);
  }
  close() {}
}

export interface TestEnv {
  app: ReturnType<typeof createApp>;
  database: Database_;
  clock: FixedClock;
  mailer: MemoryMailer;
  dir: string;
  config: AppConfig;
  signIn(email: string, password?: string): Promise<string>;
  close(): void;
}

/** A fresh SQLite file, migrated with the real migrations, optionally seeded with the demo. */
export async function makeEnv(options: { seed?: boolean; now?: Date; config?: Partial<AppConfig> } = {}): Promise<TestEnv> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'warmfold-test-'));
  const database = openDatabase(path.join(dir, 'test.db'));
  const now = options.now ?? new Date('2026-11-16T10:00:00Z');
  const clock = new FixedClock(now);
  if (options.seed !== false) await seedDemo(database, { now, bcryptCost: 10 });
  const mailer = new MemoryMailer();
  const config = testConfig({ dataDir: dir, ...options.config });
  const app = createApp({ db: database, mailer, clock, config, log: () => {} });
  return {
    app,
    database,
    clock,
    mailer,
    dir,
    config,
    async signIn(email, password = DEMO_PASSWORD) {
      const res = await request(app).post('/api/auth/sign-in').send({ email, password });
      if (res.status !== 200) throw new Error(`sign-in ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
      return res.body.token as string;
    },
    close() {
      database.close();
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}

export function count(database: Database_, table: string): number {
  return (database.sqlite.prepare(`SELECT COUNT(*) AS n FROM ${table}`).get() as { n: number }).n;
}
