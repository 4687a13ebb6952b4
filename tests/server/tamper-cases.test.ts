/**
 * The seven ways someone holding the database file can try to rewrite the chart, each done with a
 * second better-sqlite3 connection (the attacker's, without the app's triggers) on a copy of a
 * real SQLite file, and each found by `verifyRecord` (what `npm run audit:verify` runs). What is
 * being defended: 21 CFR 11.10(e) (audit trails that cannot obscure earlier entries) and HIPAA
 * 45 CFR 164.312(c)(1) (integrity); the signed checkpoints follow the usual keyed-hash practice
 * (HMAC, RFC 2104) of keeping the key apart from what it protects.
 */
import Database from 'better-sqlite3';
import { execFileSync } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import request from 'supertest';
import { drizzle } from 'drizzle-orm/better-sqlite3';
import { migrate } from 'drizzle-orm/better-sqlite3/migrator';
import { migrationsFolder, openDatabase } from '../../db/client';
import * as schema from '../../db/schema';
import { seedDemo } from '../../server/demo-seed';
import { auditHash, GENESIS_HASH } from '../../server/audit';
import { checkpointJob, checkpointSettings, startCheckpointing, writeCheckpoint, type CheckpointSettings } from '../../server/checkpoints';
import { batchedWrite } from '../../server/write-batch';
import { canonicalSql, rowHash } from '../../server/ledger';
import { CHAINED } from '../../server/ledger-tables';
import { describeRecordReport, verifyRecord, type RecordReport } from '../../server/record-verify';
import { DEMO, makeEnv, type TestEnv } from './helpers';

const KEY = 'a-test-audit-key-of-more-than-thirty-two-characters';
let env: TestEnv;
let settings: CheckpointSettings;
let appReadingId: string;

beforeAll(async () => {
  env = await makeEnv();
  settings = checkpointSettings(env.dir, { AUDIT_KEY: KEY, AUDIT_CHECKPOINT_FILE: path.join(env.dir, 'checkpoints.log') });
  const token = await env.signIn(DEMO.nurse);
  appReadingId = randomUUID();
  const res = await request(env.app)
    .post('/api/infants/inf-glimmerton/readings')
    .set('Authorization', `Bearer ${token}`)
    .send({ id: appReadingId, unit: 'C', probe: 36.8, remote: 36.7, remoteSite: 'axilla' });
  expect(res.status).toBe(201);
  expect(writeCheckpoint(env.database.sqlite, settings, 'test', env.clock.now())).not.toBeNull();
});
afterAll(() => env.close());

/** A copy of the live database for one attack, and the attacker's own connection to it. */
async function attackerCopy(name: string): Promise<{ file: string; db: Database.Database }> {
  const file = path.join(env.dir, `${name}.db`);
  await env.database.sqlite.backup(file);
  return { file, db: new Database(file) };
}

/** Copy the live database, let the attacker's connection `attack` the copy, and verify it. */
async function tamper(name: string, attack: (db: Database.Database) => void): Promise<{ file: string; report: RecordReport }> {
  const { file, db } = await attackerCopy(name);
  attack(db);
  db.close();
  return { file, report: verifyCopy(file) };
}

/** Change the app-written reading's probe value with its guard trigger dropped, then put the guard back. */
function editAppReading(db: Database.Database): void {
  const guard = triggerSql(db, 'readings_no_update');
  db.prepare('DROP TRIGGER readings_no_update').run();
  db.prepare('UPDATE readings SET probe_centi = 3650 WHERE id = ?').run(appReadingId);
  db.prepare(guard).run();
}

function verifyCopy(file: string): RecordReport {
  const db = new Database(file, { readonly: true });
  try {
    return verifyRecord(db, { checkpoints: settings });
  } finally {
    db.close();
  }
}

const triggerSql = (db: Database.Database, name: string) => (db.prepare("SELECT sql FROM sqlite_master WHERE type = 'trigger' AND name = ?").get(name) as { sql: string }).sql;

/** Rewrite every event's hash from the first one on, as someone who knows the algorithm would. */
function rechain(db: Database.Database): void {
  const events = db
    .prepare('SELECT id, at, actor_id AS actorId, action, entity_type AS entityType, entity_id AS entityId, unit_id AS unitId, before, after FROM audit_events ORDER BY id')
    .all() as {
    id: number;
    at: number;
    actorId: string | null;
    action: string;
    entityType: string;
    entityId: string | null;
    unitId: string | null;
    before: string | null;
    after: string | null;
  }[];
  const update = db.prepare('UPDATE audit_events SET prev_hash = ?, hash = ? WHERE id = ?');
  let prev = GENESIS_HASH;
  db.transaction(() => {
    for (const e of events) {
      const hash = auditHash(prev, e);
      update.run(prev, hash, e.id);
      prev = hash;
    }
  })();
}

describe('a database the app wrote', () => {
  it('verifies intact, every chained row checked, the head vouched for by the checkpoint', () => {
    const report = verifyRecord(env.database.sqlite, { checkpoints: settings });
    expect(report.findings).toEqual([]);
    expect(report.ok).toBe(true);
    expect(report.rowsChecked).toBeGreaterThan(1000);
    expect(report.checkpoints.status).toBe('checked');
    expect(report.unvouched).toBeNull();
  });

  it('gives a reading written over HTTP exactly one row event, holding the hash of its content', () => {
    const { sqlite } = env.database;
    const events = sqlite.prepare("SELECT after FROM audit_events WHERE action = 'row-insert' AND entity_type = 'readings' AND entity_id = ?").all(appReadingId) as {
      after: string;
    }[];
    expect(events).toHaveLength(1);
    const row = sqlite.prepare('SELECT probe_centi, remote_centi FROM readings WHERE id = ?').get(appReadingId);
    // 36.8 °C typed by the nurse is stored as 3680 hundredths (the product's unit convention).
    expect(row).toEqual({ probe_centi: 3680, remote_centi: 3670 });
    // Version 2 of the readings table: the probe placement, weight and humidity columns were added.
    expect(JSON.parse(events[0]!.after)).toEqual({ v: 2, row: expect.stringMatching(/^[0-9a-f]{64}$/) });
  });

  it('follows a row whose key the app changes: the old key is recorded as gone, the new one as written', () => {
    const { sqlite } = env.database;
    const id = `bed-${randomUUID()}`;
    sqlite.prepare("INSERT INTO beds (id, unit_id, label, sort_order, active) VALUES (?, 'unit-north', ?, 98, 1)").run(id, `K${Date.now()}`);
    sqlite.prepare('UPDATE beds SET id = ? WHERE id = ?').run(`${id}-renamed`, id);
    const actions = sqlite.prepare("SELECT action, entity_id FROM audit_events WHERE entity_type = 'beds' AND entity_id IN (?, ?) ORDER BY id").all(id, `${id}-renamed`);
    expect(actions).toEqual(
      expect.arrayContaining([
        { action: 'row-insert', entity_id: id },
        { action: 'row-delete', entity_id: id },
        { action: 'row-update', entity_id: `${id}-renamed` },
      ]),
    );
    expect(verifyRecord(sqlite).findings).toEqual([]);
  });

  it('keeps a failed write out of the chain: a savepoint rolled back takes its row events with it', async () => {
    const { sqlite } = env.database;
    const before = (sqlite.prepare('SELECT COUNT(*) AS n FROM audit_events').get() as { n: number }).n;
    const id = randomUUID();
    const failing = batchedWrite(sqlite, () => {
      sqlite.prepare("INSERT INTO beds (id, unit_id, label, sort_order, active) VALUES (?, 'unit-north', 'TMP', 99, 1)").run(id);
      throw new Error('refused after the insert');
    });
    const passing = batchedWrite(sqlite, () => sqlite.prepare("INSERT INTO beds (id, unit_id, label, sort_order, active) VALUES (?, 'unit-north', 'N99', 99, 1)").run(`bed-${id}`));
    await expect(failing).rejects.toThrow('refused after the insert');
    await passing;
    const after = (sqlite.prepare('SELECT COUNT(*) AS n FROM audit_events').get() as { n: number }).n;
    expect(after).toBe(before + 1);
    expect(sqlite.prepare('SELECT entity_id FROM audit_events ORDER BY id DESC LIMIT 1').get()).toEqual({ entity_id: `bed-${id}` });
    expect(verifyRecord(sqlite).ok).toBe(true);
  });
});

describe('the seven tamper cases', () => {
  it('1. a reading changed with its guard trigger dropped and put back is named, by id', async () => {
    const { report } = await tamper('edit-reading', editAppReading);
    expect(report.ok).toBe(false);
    expect(report.findings[0]).toMatchObject({ kind: 'row-edited', table: 'readings', key: appReadingId });
  });

  it('2. a deleted reading is named', async () => {
    let victim = '';
    const { report } = await tamper('delete-reading', (db) => {
      victim = (db.prepare("SELECT id FROM readings WHERE infant_id = 'inf-ashgrove' ORDER BY taken_at LIMIT 1 OFFSET 3").get() as { id: string }).id;
      db.prepare('DROP TRIGGER readings_no_delete').run();
      db.prepare('DELETE FROM readings WHERE id = ?').run(victim);
    });
    expect(report.ok).toBe(false);
    expect(report.findings).toHaveLength(1);
    expect(report.findings[0]).toMatchObject({ kind: 'row-deleted', table: 'readings', key: victim });
  });

  it('3. a back-dated reading inserted without an event is named', async () => {
    const forged = randomUUID();
    const dayAgo = env.clock.now().getTime() - 24 * 3600_000;
    const { report } = await tamper('insert-reading', (db) =>
      db
        .prepare(
          "INSERT INTO readings (id, infant_id, unit_id, taken_at, recorded_at, recorded_by, probe_centi, remote_centi, remote_site) VALUES (?, 'inf-ashgrove', 'unit-north', ?, ?, 'u-nurse', 3690, 3680, 'axilla')",
        )
        .run(forged, dayAgo, dayAgo + 60_000),
    );
    expect(report.ok).toBe(false);
    expect(report.findings).toEqual([expect.objectContaining({ kind: 'row-unrecorded', table: 'readings', key: forged })]);
  });

  it('4. cutting the last 50 audit events is found, even with the id counter put back', async () => {
    const max = (env.database.sqlite.prepare('SELECT MAX(id) AS m FROM audit_events').get() as { m: number }).m;
    const cut = (db: Database.Database) => {
      db.prepare('DROP TRIGGER audit_events_no_delete').run();
      db.prepare('DELETE FROM audit_events WHERE id > ?').run(max - 50);
    };
    const { report: plain } = await tamper('cut-tail', cut);
    expect(plain.ok).toBe(false);
    expect(plain.findings[0]).toMatchObject({ kind: 'tail-cut', eventId: max - 49 });

    const { report } = await tamper('cut-tail-careful', (db) => {
      cut(db);
      db.prepare("UPDATE sqlite_sequence SET seq = ? WHERE name = 'audit_events'").run(max - 50);
    });
    expect(report.ok).toBe(false);
    // Only the signed checkpoint still knows the chain was longer.
    const signed = report.checkpoints.last!.headId;
    expect(signed).toBeGreaterThan(max - 50);
    expect(report.findings.find((f) => f.kind === 'tail-cut')?.message).toMatch(new RegExp(`signed event ${signed}, but the chain ends at event ${max - 50}`));
  });

  it('5. a chain recomputed from the start after an edit is found against the signed checkpoint', async () => {
    const { file, report } = await tamper('rechain', (db) => {
      editAppReading(db);
      // The attacker also rewrites the row's event to the new content, then every hash after it.
      db.prepare('DROP TRIGGER audit_events_no_update').run();
      const canonical = (db.prepare(`SELECT ${canonicalSql(CHAINED.readings!, 1)} AS c FROM readings WHERE id = ?`).get(appReadingId) as { c: string }).c;
      db.prepare("UPDATE audit_events SET after = ? WHERE action = 'row-insert' AND entity_type = 'readings' AND entity_id = ?").run(
        JSON.stringify({ v: 1, row: rowHash('readings', 1, canonical) }),
        appReadingId,
      );
      rechain(db);
    });
    // Without the checkpoint the forgery is self-consistent: that is why the checkpoints exist.
    const unsigned = new Database(file, { readonly: true });
    expect(verifyRecord(unsigned).ok).toBe(true);
    unsigned.close();
    expect(report.ok).toBe(false);
    expect(report.findings.map((f) => f.kind)).toContain('checkpoint-mismatch');
  });

  it('6. an edited middle audit event is named', async () => {
    const target = (env.database.sqlite.prepare('SELECT id FROM audit_events ORDER BY id LIMIT 1 OFFSET 500').get() as { id: number }).id;
    const { report } = await tamper('edit-event', (db) => {
      db.prepare('DROP TRIGGER audit_events_no_update').run();
      db.prepare("UPDATE audit_events SET actor_id = 'u-nurse-2' WHERE id = ?").run(target);
    });
    expect(report.findings[0]).toMatchObject({ kind: 'event-changed', eventId: target });
  });

  it('7. a deleted middle audit event is named by the event after it, and npm run audit:verify exits 2', async () => {
    const victim = env.database.sqlite
      .prepare("SELECT id, entity_id FROM audit_events WHERE action = 'row-insert' AND entity_type = 'readings' ORDER BY id LIMIT 1 OFFSET 20")
      .get() as { id: number; entity_id: string };
    const { file, report } = await tamper('delete-event', (db) => {
      db.prepare('DROP TRIGGER audit_events_no_delete').run();
      db.prepare('DELETE FROM audit_events WHERE id = ?').run(victim.id);
    });
    expect(report.findings[0]).toMatchObject({ kind: 'event-link', eventId: victim.id + 1 });
    // The reading that event recorded is now without one, and is named too.
    expect(report.findings).toContainEqual(expect.objectContaining({ kind: 'row-unrecorded', table: 'readings', key: victim.entity_id }));
    const { code, output } = runVerifyCli(file);
    expect(code).toBe(2);
    expect(output).toMatch(new RegExp(`Record BROKEN at event ${victim.id + 1}`));
  });
});

describe('npm run audit:verify', () => {
  it('says intact for the live file, and how far the signed checkpoint vouches', async () => {
    const file = path.join(env.dir, 'intact.db');
    await env.database.sqlite.backup(file);
    const { code, output } = runVerifyCli(file);
    expect(code).toBe(0);
    expect(output).toMatch(/^Record intact: \d+ audit events and \d+ chained rows checked/);
    expect(output).toMatch(/the last \(.*\) vouches for events up to \d+/);
  });

  it('names the window after the last checkpoint that no signature covers', async () => {
    const token = await env.signIn(DEMO.nurse);
    const res = await request(env.app)
      .post('/api/infants/inf-glimmerton-b/readings')
      .set('Authorization', `Bearer ${token}`)
      .send({ id: randomUUID(), unit: 'C', probe: 36.9, remote: 36.8, remoteSite: 'axilla' });
    expect(res.status).toBe(201);
    const report = verifyRecord(env.database.sqlite, { checkpoints: settings });
    expect(report.ok).toBe(true);
    expect(report.unvouched).toMatchObject({ fromId: report.checkpoints.last!.headId + 1, events: expect.any(Number) });
    expect(describeRecordReport(report, 'x').join('\n')).toMatch(/Not vouched for by a signature: events \d+–\d+/);
    // The next checkpoint closes the window.
    writeCheckpoint(env.database.sqlite, settings, 'test', env.clock.now());
    expect(verifyRecord(env.database.sqlite, { checkpoints: settings }).unvouched).toBeNull();
  });

  it('refuses a checkpoint line that was altered, or one removed from the middle', () => {
    const lines = fs.readFileSync(settings.file, 'utf8').trim().split('\n');
    expect(lines.length).toBeGreaterThanOrEqual(2);
    const altered = path.join(env.dir, 'altered.log');
    const first = JSON.parse(lines[0]!) as { headId: number };
    fs.writeFileSync(altered, [JSON.stringify({ ...first, headId: first.headId - 1 }), ...lines.slice(1)].join('\n'));
    const a = verifyRecord(env.database.sqlite, { checkpoints: { ...settings, file: altered } });
    expect(a.findings.map((f) => f.kind)).toContain('checkpoint-invalid');
    const cut = path.join(env.dir, 'cut.log');
    fs.writeFileSync(cut, lines.slice(1).join('\n'));
    const b = verifyRecord(env.database.sqlite, { checkpoints: { ...settings, file: cut } });
    expect(b.findings.map((f) => f.kind)).toContain('checkpoint-line-removed');
    // The wrong key vouches for nothing.
    const c = verifyRecord(env.database.sqlite, { checkpoints: checkpointSettings(env.dir, { AUDIT_KEY: `${KEY}-other`, AUDIT_CHECKPOINT_FILE: settings.file }) });
    expect(c.findings.every((f) => f.kind === 'checkpoint-invalid')).toBe(true);
    expect(c.findings.length).toBe(lines.length);
  });
});

describe('a database from before the row ledger', () => {
  it('is reported honestly: rows without events before the app opens it, a labelled baseline after', async () => {
    const file = path.join(env.dir, 'old.db');
    // The old app: migrated and seeded on a connection without the ledger's triggers.
    const sqlite = new Database(file);
    sqlite.pragma('journal_mode = WAL');
    const db = drizzle(sqlite, { schema });
    migrate(db, { migrationsFolder: migrationsFolder() });
    await seedDemo({ sqlite, db, close: () => sqlite.close() }, { now: env.clock.now(), bcryptCost: 10 });
    const readings = (sqlite.prepare('SELECT COUNT(*) AS n FROM readings').get() as { n: number }).n;
    const old = verifyRecord(sqlite);
    sqlite.close();
    expect(old.ok).toBe(false);
    expect(old.findings.filter((f) => f.kind === 'row-unrecorded' && f.table === 'readings')).toHaveLength(readings);

    const opened = openDatabase(file);
    const report = verifyRecord(opened.sqlite);
    opened.close();
    expect(report.findings).toEqual([]);
    expect(report.baselines).toHaveLength(1);
    expect(report.baselines[0]!.tables.readings).toBe(readings);
    expect(describeRecordReport(report, file).join('\n')).toMatch(/Baseline: event \d+ .* took \d+ rows already present .*vouched for from then on, not before/);
    // Opening it again baselines nothing more: a row inserted behind the app's back later stays unrecorded.
    const again = openDatabase(file);
    const n = (again.sqlite.prepare("SELECT COUNT(*) AS n FROM audit_events WHERE action = 'ledger-installed'").get() as { n: number }).n;
    again.close();
    expect(n).toBe(1);
  });
});

function runVerifyCli(file: string): { code: number; output: string } {
  try {
    const output = execFileSync(process.execPath, ['--import', 'tsx', 'scripts/audit-verify.ts', file, '--checkpoints', settings.file], {
      encoding: 'utf8',
      env: { ...process.env, DATA_DIR: env.dir, AUDIT_KEY: KEY },
    });
    return { code: 0, output };
  } catch (err) {
    const e = err as { status: number; stdout: string };
    return { code: e.status, output: e.stdout };
  }
}

describe('the checkpoint key', () => {
  it('is generated for the demo beside the data folder, never inside it, owner-only; production must name one', () => {
    const dataDir = path.join(env.dir, 'keyed-data');
    const lines: string[] = [];
    const started = startCheckpointing(env.database.sqlite, dataDir, (l) => lines.push(l), false, {});
    const keyFile = started.settings.key!.source;
    expect(path.dirname(keyFile)).toBe(env.dir);
    expect(keyFile.startsWith(`${dataDir}${path.sep}`)).toBe(false);
    expect(fs.statSync(keyFile).mode & 0o777).toBe(0o600);
    expect(lines.join('\n')).toMatch(/generated a signing key .* Fine for the demo; in production set AUDIT_KEY/);
    // The start-up checkpoint is signed with that key.
    expect(verifyRecord(env.database.sqlite, { checkpoints: started.settings }).checkpoints.status).toBe('checked');
    expect(() => startCheckpointing(env.database.sqlite, dataDir, () => {}, true, {})).toThrow(/AUDIT_KEY .* or AUDIT_KEY_FILE/);
  });
});

describe('the scheduled checkpoint', () => {
  it('signs a moved head once, and e-mails the line when AUDIT_CHECKPOINT_MAILTO names someone', async () => {
    const job = checkpointJob(settings, ['records.office@larkspur-vale.test']);
    expect(job.pattern).toBe('0 * * * * *'); // every minute (croner's six-field pattern)
    env.database.sqlite.prepare("INSERT INTO beds (id, unit_id, label, sort_order, active) VALUES (?, 'unit-south', 'S99', 99, 1)").run(`bed-${randomUUID()}`);
    const lines = fs.readFileSync(settings.file, 'utf8').trim().split('\n').length;
    const sent = env.mailer.sent.length;
    await job.run(env.app.context);
    const written = fs.readFileSync(settings.file, 'utf8').trim().split('\n');
    expect(written).toHaveLength(lines + 1);
    expect(env.mailer.sent.slice(sent)).toEqual([expect.objectContaining({ to: ['records.office@larkspur-vale.test'], text: `${written.at(-1)}\n` })]);
    // Nothing new since: no line, no mail.
    await job.run(env.app.context);
    expect(fs.readFileSync(settings.file, 'utf8').trim().split('\n')).toHaveLength(lines + 1);
    expect(env.mailer.sent.length).toBe(sent + 1);
  });
});

describe('taking the checkpoint file away', () => {
  it('is reported when a key exists: a recomputed chain cannot hide by deleting the signatures', async () => {
    const { file } = await tamper('rechain-no-checkpoints', (db) => {
      editAppReading(db);
      db.prepare('DROP TRIGGER audit_events_no_update').run();
      rechain(db);
    });
    const gone = { ...settings, file: path.join(env.dir, 'deleted-checkpoints.log') };
    const db = new Database(file, { readonly: true });
    const report = verifyRecord(db, { checkpoints: gone });
    db.close();
    expect(report.ok).toBe(false);
    expect(report.findings.map((f) => f.kind)).toContain('checkpoints-missing');
  });
});

describe('npm run db:seed', () => {
  it('lays down a demo that npm run audit:verify finds intact and signed, and again after a second reset', () => {
    const dataDir = path.join(env.dir, 'seeded');
    const cli = (script: string) => execFileSync(process.execPath, ['--import', 'tsx', script], { encoding: 'utf8', env: { ...process.env, DATA_DIR: dataDir, AUDIT_KEY: KEY } });
    cli('db/seed-cli.ts');
    expect(cli('scripts/audit-verify.ts')).toMatch(/^Record intact: \d+ audit events and \d+ chained rows checked[^]*Signed checkpoints: 1 in /);
    expect(cli('db/seed-cli.ts')).toMatch(/The old chain's audit checkpoints were set aside in .*replaced-/);
    const again = cli('scripts/audit-verify.ts');
    expect(again).toMatch(/^Record intact/);
    expect(again).not.toMatch(/Not vouched for/);
  });
});

describe('a checkpoint line cut short by a crash', () => {
  it('is noted, not taken for tampering, and the next line follows the last whole one', () => {
    const file = path.join(env.dir, 'torn.log');
    fs.copyFileSync(settings.file, file);
    const torn = { ...settings, file };
    fs.appendFileSync(file, '{"v":1,"at":"2026-11-16T10:0');
    env.database.sqlite.prepare("INSERT INTO beds (id, unit_id, label, sort_order, active) VALUES (?, 'unit-south', ?, 99, 1)").run(`bed-${randomUUID()}`, `T${Date.now()}`);
    expect(writeCheckpoint(env.database.sqlite, torn, 'test', env.clock.now())).not.toBeNull();
    const report = verifyRecord(env.database.sqlite, { checkpoints: torn });
    expect(report.findings).toEqual([]);
    const lines = fs.readFileSync(file, 'utf8').trim().split('\n');
    expect(report.checkpoints.unreadable).toEqual([lines.length - 1]);
    expect(report.unvouched).toBeNull();
    expect(describeRecordReport(report, 'x').join('\n')).toMatch(/could not be read \(a write cut short by a crash\)/);
  });
});
