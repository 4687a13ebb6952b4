/**
 * A production database starts empty: `npm run setup:first-admin` lays down the first unit and its
 * administrator and prints the invitation link; the administrator then signs in over the real API.
 * Run as a real process (scripts/first-admin.ts under tsx) on a fresh data folder.
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { openDatabase } from '../../db/client';
import { createApp } from '../../server/app';
import { systemClock } from '../../server/clock';
import { loadConfig } from '../../server/config';
import { MemoryMailer } from './helpers';

const ROOT = path.resolve(__dirname, '..', '..');
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'warmfold-first-admin-'));
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

const env: NodeJS.ProcessEnv = {
  NODE_ENV: 'test',
  PATH: process.env.PATH ?? '',
  WARMFOLD_MODE: 'production',
  JWT_SECRET: 'a-production-secret-that-is-long-enough-0123456789',
  SMTP_HOST: 'relay.example-hospital.test',
  PUBLIC_URL: 'https://warmfold.example-hospital.test',
  DATA_DIR: path.join(dir, 'data'),
};
const setup = (args: string[]) => spawnSync(path.join(ROOT, 'node_modules', '.bin', 'tsx'), ['scripts/first-admin.ts', ...args], { cwd: ROOT, env, encoding: 'utf8' });
const ARGS = [
  '--email',
  'Rhea.Castellan@example-hospital.test',
  '--name',
  'Rhea Castellan',
  '--unit',
  'Neonatal Unit East',
  '--hospital',
  'Example General',
  '--time-zone',
  'Europe/Dublin',
  '--beds',
  '6',
];

it('creates the unit and its administrator, whose printed link lets her in; a second run is refused', async () => {
  const first = setup(ARGS);
  expect(first.stderr).toBe('');
  expect(first.status).toBe(0);
  const link = /https:\/\/warmfold\.example-hospital\.test\/accept-invite\?token=(\S+)/.exec(first.stdout);
  expect(link).not.toBeNull();

  const config = { ...loadConfig(env), logRequests: false };
  const database = openDatabase(config.databasePath);
  try {
    const app = createApp({ db: database, mailer: new MemoryMailer(), clock: systemClock, config, log: () => {} });
    const password = 'east-wing-lantern-at-dawn';
    expect(
      (
        await request(app)
          .post('/api/auth/invitations/accept')
          .send({ token: decodeURIComponent(link![1]!), password })
      ).status,
    ).toBe(204);
    // The e-mail was stored as the sign-in form sends it: trimmed and lower case.
    const signIn = await request(app).post('/api/auth/sign-in').send({ email: 'rhea.castellan@example-hospital.test', password });
    expect(signIn.status).toBe(200);
    expect(signIn.body.user.role).toBe('admin');
    expect(signIn.body.user.units).toEqual([expect.objectContaining({ name: 'Neonatal Unit East', timeZone: 'Europe/Dublin' })]);
    const unitsAnswer = await request(app).get('/api/admin/units').set('Authorization', `Bearer ${signIn.body.token}`);
    expect(unitsAnswer.status).toBe(200);
    expect(JSON.stringify(unitsAnswer.body)).toContain('Neonatal Unit East');
  } finally {
    database.close();
  }

  const again = setup(ARGS);
  expect(again.status).toBe(1);
  expect(again.stderr).toContain('already has 1 account');
});

it('names the argument that is missing or wrong', () => {
  const noEmail = setup(['--name', 'X Y', '--unit', 'U', '--hospital', 'H']);
  expect(noEmail.status).toBe(1);
  expect(noEmail.stderr).toContain('--email');
  const badZone = setup([...ARGS.slice(0, 8), '--time-zone', 'Mars/Olympus']);
  expect(badZone.status).toBe(1);
  expect(badZone.stderr).toContain('--time-zone');
});
