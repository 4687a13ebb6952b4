/**
 * Record integrity: append-only clinical tables (21 CFR 11.10(e)), a hash-chained audit trail
 * (HIPAA 45 CFR 164.312(b), (c)). The row ledger's tamper cases are in tamper-cases.test.ts, the
 * backup and restore drill in backup-restore.test.ts.
 */
import Database from 'better-sqlite3';
import { execFileSync } from 'node:child_process';
import path from 'node:path';
import { verifyAuditChain } from '../../server/audit';
import request from 'supertest';
import { makeEnv, type TestEnv } from './helpers';

let env: TestEnv;
beforeAll(async () => {
  env = await makeEnv();
});
afterAll(() => env.close());

const APPEND_ONLY = ['readings', 'flags', 'flag_resolutions', 'actions', 'reviews', 'audit_events'];

describe('append-only tables', () => {
  it.each(APPEND_ONLY)('refuses UPDATE and DELETE on %s', (table) => {
    const { sqlite } = env.database;
    // Every table has at least one column; an UPDATE that changes nothing still fires the trigger.
    const column = (sqlite.prepare(`PRAGMA table_info(${table})`).all() as { name: string }[])[0]!.name;
    const rows = (sqlite.prepare(`SELECT COUNT(*) AS n FROM ${table}`).get() as { n: number }).n;
    if (rows === 0) {
      // No row to hit: the trigger must still exist.
      const trigger = sqlite.prepare("SELECT name FROM sqlite_master WHERE type = 'trigger' AND tbl_name = ?").all(table);
      expect(trigger.length).toBe(2);
      return;
    }
    expect(() => sqlite.prepare(`UPDATE ${table} SET ${column} = ${column}`).run()).toThrow(/append-only/);
    expect(() => sqlite.prepare(`DELETE FROM ${table}`).run()).toThrow(/append-only/);
    expect((sqlite.prepare(`SELECT COUNT(*) AS n FROM ${table}`).get() as { n: number }).n).toBe(rows);
  });
});

describe('audit chain', () => {
  it('is intact after the seed and after sign-ins', async () => {
    await env.signIn('nia.okafor@warmfold.test');
    const report = verifyAuditChain(env.database.sqlite);
    expect(report.ok).toBe(true);
    expect(report.checked).toBeGreaterThan(10);
  });

  it('finds an edited row in a copy of the database, by id', async () => {
    const copy = path.join(env.dir, 'tampered.db');
    await env.database.sqlite.backup(copy);
    const db = new Database(copy);
    // Someone with file access removes the guard and rewrites history.
    db.prepare('DROP TRIGGER audit_events_no_update').run();
    const target = db.prepare('SELECT id FROM audit_events ORDER BY id LIMIT 1 OFFSET 5').get() as { id: number };
    db.prepare('UPDATE audit_events SET after = \'{"probeCenti":3650}\' WHERE id = ?').run(target.id);
    const report = verifyAuditChain(db);
    db.close();
    expect(report.ok).toBe(false);
    expect(report.firstBrokenId).toBe(target.id);
  });

  it('npm run audit:verify reports the broken link and exits non-zero', async () => {
    const copy = path.join(env.dir, 'tampered-cli.db');
    await env.database.sqlite.backup(copy);
    const db = new Database(copy);
    db.prepare('DROP TRIGGER audit_events_no_delete').run();
    const victim = db.prepare('SELECT id FROM audit_events ORDER BY id LIMIT 1 OFFSET 3').get() as { id: number };
    db.prepare('DELETE FROM audit_events WHERE id = ?').run(victim.id);
    db.close();
    let output = '';
    let code = 0;
    try {
      output = execFileSync(process.execPath, ['--import', 'tsx', 'scripts/audit-verify.ts', copy], { encoding: 'utf8', env: { ...process.env, DATA_DIR: env.dir } });
    } catch (err) {
      const e = err as { status: number; stdout: string };
      code = e.status;
      output = e.stdout;
    }
    expect(code).toBe(2);
    expect(output).toMatch(new RegExp(`BROKEN at event ${victim.id + 1}`));
  });
});

describe('durability settings', () => {
  it('opens in WAL with synchronous=FULL and foreign keys on', () => {
    const { sqlite } = env.database;
    expect(sqlite.pragma('journal_mode', { simple: true })).toBe('wal');
    expect(sqlite.pragma('synchronous', { simple: true })).toBe(2);
    expect(sqlite.pragma('foreign_keys', { simple: true })).toBe(1);
  });
});

describe('reads of a chart are audited (HIPAA 164.312(b))', () => {
  it('writes a chart-read event for a flowsheet, with who and which infant', async () => {
    const token = await env.signIn('nia.okafor@warmfold.test');
    const { sqlite } = env.database;
    const before = (sqlite.prepare("SELECT COUNT(*) AS n FROM audit_events WHERE action = 'chart-read'").get() as { n: number }).n;
    const res = await request(env.app).get('/api/infants/inf-ashgrove/flowsheet?hours=12').set('Authorization', `Bearer ${token}`);
    expect(res.status).toBe(200);
    const rows = sqlite.prepare("SELECT actor_id, entity_id FROM audit_events WHERE action = 'chart-read' ORDER BY id DESC").all() as { actor_id: string; entity_id: string }[];
    expect(rows.length).toBe(before + 1);
    expect(rows[0]).toEqual({ actor_id: 'u-nurse', entity_id: 'inf-ashgrove' });
    expect(verifyAuditChain(sqlite).ok).toBe(true);
  });
});
