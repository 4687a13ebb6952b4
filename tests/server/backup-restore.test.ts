/**
 * The files drill: owner-only permissions on the data folder and everything in it (HIPAA 45 CFR
 * 164.312(a)(1) access control; common practice for a service's data directory), and
 * `npm run backup` followed by the restore SECURITY.md documents (`npm run restore -- <folder>`,
 * then `npm run audit:verify`), run as the commands themselves on real files, with the backup
 * written to a folder outside the data folder (as on another disk). HIPAA 164.308(a)(7)(ii)(A)/(B):
 * a retrievable exact copy, and a way to restore it.
 */
import { execFileSync } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { openDatabase } from '../../db/client';
import { checkpointSettings, writeCheckpoint } from '../../server/checkpoints';
import { verifyRecord } from '../../server/record-verify';
import { count, DEMO, makeEnv, type TestEnv } from './helpers';

const KEY = 'another-test-audit-key-longer-than-thirty-two-characters';
let env: TestEnv;
let elsewhere: string;
let cliEnv: NodeJS.ProcessEnv;

beforeAll(async () => {
  env = await makeEnv();
  elsewhere = fs.mkdtempSync(path.join(os.tmpdir(), 'warmfold-backups-'));
  cliEnv = {
    ...process.env,
    DATA_DIR: env.dir,
    DATABASE_PATH: path.join(env.dir, 'test.db'),
    BACKUP_DIR: elsewhere,
    AUDIT_KEY: KEY,
  };
});
afterAll(() => {
  env.close();
  fs.rmSync(elsewhere, { recursive: true, force: true });
});

const mode = (file: string) => fs.statSync(file).mode & 0o777;
const run = (script: string, ...args: string[]) => execFileSync(process.execPath, ['--import', 'tsx', script, ...args], { encoding: 'utf8', env: cliEnv });
const TABLES = ['users', 'infants', 'readings', 'flags', 'actions', 'uploads', 'audit_events'];
const counts = (sqlite: { prepare(sql: string): { get(): unknown } }) =>
  Object.fromEntries(TABLES.map((t) => [t, (sqlite.prepare(`SELECT COUNT(*) AS n FROM ${t}`).get() as { n: number }).n]));

describe('the data folder', () => {
  it('is 0700, and the database, its WAL and SHM and the checkpoint file are 0600', () => {
    const settings = checkpointSettings(env.dir, { AUDIT_KEY: KEY });
    writeCheckpoint(env.database.sqlite, settings, 'test');
    expect(mode(env.dir)).toBe(0o700);
    for (const f of ['test.db', 'test.db-wal', 'test.db-shm', 'audit-checkpoints.log']) expect({ f, mode: mode(path.join(env.dir, f)) }).toEqual({ f, mode: 0o600 });
  });

  it('tightens a folder and database left world-readable by an older version', () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'warmfold-old-'));
    fs.chmodSync(dir, 0o755);
    const first = openDatabase(path.join(dir, 'w.db'));
    first.close();
    fs.chmodSync(dir, 0o755);
    fs.chmodSync(path.join(dir, 'w.db'), 0o644);
    fs.mkdirSync(path.join(dir, 'uploads'), { mode: 0o755 });
    const again = openDatabase(path.join(dir, 'w.db'));
    expect([mode(dir), mode(path.join(dir, 'w.db')), mode(path.join(dir, 'uploads'))]).toEqual([0o700, 0o600, 0o700]);
    again.close();
    fs.rmSync(dir, { recursive: true, force: true });
  });
});

describe('npm run backup, then the documented restore', () => {
  it('copies the database, the uploads and the checkpoints elsewhere, and restores them whole', async () => {
    const admin = await env.signIn(DEMO.admin);
    const roster = 'name,email,role,unit\nWren Alder,wren.alder@warmfold.test,nurse,unit-north\n';
    const preview = await request(env.app)
      .post('/api/admin/roster/preview')
      .set('Authorization', `Bearer ${admin}`)
      .attach('file', Buffer.from(roster), { filename: 'roster.csv', contentType: 'text/csv' });
    expect(preview.status).toBe(201);
    const uploadsDir = path.join(env.dir, 'uploads');
    const uploaded = fs.readdirSync(uploadsDir);
    expect(uploaded.length).toBe(1);
    writeCheckpoint(env.database.sqlite, checkpointSettings(env.dir, { AUDIT_KEY: KEY }), 'test');
    const atBackup = counts(env.database.sqlite);

    const out = run('scripts/backup.ts');
    const folder = /Backup written: (\S+) \(\d+ pages, 1 uploaded files\)/.exec(out)?.[1];
    expect(folder).toBeDefined();
    expect(path.dirname(folder!)).toBe(elsewhere);
    expect(mode(elsewhere)).toBe(0o700);
    expect(mode(folder!)).toBe(0o700);
    for (const f of ['warmfold.db', 'manifest.json', 'audit-checkpoints.log', `uploads/${uploaded[0]}`])
      expect({ f, mode: mode(path.join(folder!, f)) }).toEqual({ f, mode: 0o600 });
    expect(fs.readFileSync(path.join(folder!, 'uploads', uploaded[0]!))).toEqual(fs.readFileSync(path.join(uploadsDir, uploaded[0]!)));

    // Work goes on after the backup, then the disk is lost: the reading below is what a restore gives up.
    const nurse = await env.signIn(DEMO.nurse);
    const later = await request(env.app)
      .post('/api/infants/inf-glimmerton/readings')
      .set('Authorization', `Bearer ${nurse}`)
      .send({ id: randomUUID(), unit: 'C', probe: 36.9, remote: 36.8, remoteSite: 'axilla' });
    expect(later.status).toBe(201);
    expect(count(env.database, 'readings')).toBe(atBackup.readings! + 1);
    env.database.close();
    fs.rmSync(uploadsDir, { recursive: true });

    const restored = run('scripts/restore.ts', folder!);
    expect(restored).toMatch(/The files it replaced are in (\S+)replaced-/);
    const database = openDatabase(path.join(env.dir, 'test.db'));
    try {
      expect(database.sqlite.pragma('integrity_check', { simple: true })).toBe('ok');
      // audit_events gains the row events of opening again; every other table is as it was.
      const now = counts(database.sqlite);
      expect({ ...now, audit_events: 0 }).toEqual({ ...atBackup, audit_events: 0 });
      expect(now.audit_events).toBeGreaterThanOrEqual(atBackup.audit_events!);
      expect(fs.readFileSync(path.join(uploadsDir, uploaded[0]!))).toEqual(fs.readFileSync(path.join(folder!, 'uploads', uploaded[0]!)));
      const report = verifyRecord(database.sqlite, { checkpoints: checkpointSettings(env.dir, { AUDIT_KEY: KEY }) });
      expect(report.findings).toEqual([]);
      expect(report.checkpoints.status).toBe('checked');
    } finally {
      database.close();
    }
    const verify = run('scripts/audit-verify.ts');
    expect(verify).toMatch(/^Record intact/);
  });

  it('refuses to restore a backup whose files no longer match their manifest', () => {
    const folder = fs.readdirSync(elsewhere).map((f) => path.join(elsewhere, f))[0]!;
    const upload = path.join(folder, 'uploads', fs.readdirSync(path.join(folder, 'uploads'))[0]!);
    fs.appendFileSync(upload, 'x');
    let message = '';
    try {
      run('scripts/restore.ts', folder);
    } catch (err) {
      message = String((err as { stderr: string }).stderr);
    }
    expect(message).toMatch(/damaged: uploads\/.* does not match its SHA-256/);
  });
});
