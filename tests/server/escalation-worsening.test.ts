/**
 * Escalating again when an escalated flag worsens, through the real app on a real SQLite file.
 * A flag escalates once per severity: when it moves to a more severe one (moderate to severe
 * hypothermia) a new escalation goes out after the new severity's delay, to the recipients chosen
 * as for the first, with its own Acknowledge; a flag that stays as it was is never told twice
 * (common practice). Bands: WHO 1997 via Miller 2011 (mild 36.0–36.4 °C, moderate 32.0–35.9 °C,
 * severe below 32.0 °C). Delays: the unit's 30 minutes for urgent flags, none for critical ones
 * (the defaults, from memory).
 */
import Database from 'better-sqlite3';
import { drizzle } from 'drizzle-orm/better-sqlite3';
import { migrate } from 'drizzle-orm/better-sqlite3/migrator';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { randomUUID } from 'node:crypto';
import { escalations } from '../../db/schema';
import { runEscalations } from '../../server/services/escalations';
import type { BoardResponse } from '../../shared/types/board';
import type { FlowsheetFlag } from '../../shared/types/bedside';
import { evaluateModel } from '../reference/thermal-model';
import { differences, modelView, Ward } from './clinical-views';
import { wardSuite } from './flag-ward';
import { DEMO, type TestEnv } from './helpers';

const suite = wardSuite();
let env: TestEnv;
let ward: Ward;
beforeAll(() => {
  env = suite.env;
  ward = suite.ward;
});

async function admit() {
  const id = await ward.admit();
  suite.admitted.push(id);
  return id;
}

const sweep = () => runEscalations(env.app.context, env.clock.now());

/** The mail of an escalation made right after a write goes out in the background: wait for it. */
async function settle() {
  for (let i = 0; i < 10; i += 1) await new Promise((r) => setImmediate(r));
}

async function coldFlag(id: string): Promise<FlowsheetFlag> {
  const sheet = (await ward.ok('nurse', 'get', `/infants/${id}/flowsheet?hours=24`)).body;
  return sheet.flags.find((f: FlowsheetFlag) => f.kind === 'cold-stress' && f.status === 'open');
}

async function boardEscalations(flagId: string) {
  const board: BoardResponse = (await ward.ok('charge', 'get', '/units/unit-north/board')).body;
  return board.beds.flatMap((b) => b.escalations).filter((e) => e.flagId === flagId);
}

const history = async (flagId: string) => (await ward.ok('nurse', 'get', `/flags/${flagId}/history`)).body.events as { event: string; at: string; text: string }[];

const mailsAbout = (since: number, bed: string) => env.mailer.sent.slice(since).filter((m) => m.subject.startsWith(`Warmfold escalation: bed ${bed},`));

const bedOf = async (id: string) => (await ward.ok('nurse', 'get', `/infants/${id}`)).body.infant.bedLabel as string;

describe('re-escalation when an escalated flag worsens (common practice)', () => {
  it('moderate hypothermia that escalated and then worsens to severe hypothermia escalates again at once, to the charge nurse on shift, with Acknowledge again; the flag card and history show both (common practice; WHO 1997 via Miller 2011)', async () => {
    const id = await admit();
    const bed = await bedOf(id);
    const mailsBefore = env.mailer.sent.length;
    await ward.chart(id, { probe: 35.2, remote: 35.0, confirmedImplausible: true });
    ward.advance(31);
    await sweep();
    const first = await coldFlag(id);
    expect(first.severity).toBe('urgent');
    const firstSentAt = new Date(ward.now()).toISOString();
    expect(first.escalation).toMatchObject({ severity: 'urgent', sentAt: firstSentAt, to: [{ email: DEMO.charge, name: 'Marta Lindqvist' }] });
    expect(mailsAbout(mailsBefore, bed)).toHaveLength(1);

    ward.advance(5);
    await ward.chart(id, { probe: 31.9, remote: 31.6, confirmedImplausible: true });
    await settle();
    const secondSentAt = new Date(ward.now()).toISOString();

    // The charge nurse: a second mail, naming the flag as worse than when she was first told.
    const mails = mailsAbout(mailsBefore, bed);
    expect(mails).toHaveLength(2);
    expect(mails[1]!.to).toEqual([DEMO.charge]);
    expect(mails[1]!.subject).toMatch(/severe hypothermia, worse$/);
    expect(mails[1]!.text).toMatch(/worsened since the escalation/);

    // The board: two escalations of the one flag, each with its own Acknowledge.
    const onBoard = await boardEscalations(first.id!);
    expect(onBoard.map((e) => ({ severity: e.severity, sentAt: e.sentAt, acknowledgedAt: e.acknowledgedAt }))).toEqual([
      { severity: 'urgent', sentAt: firstSentAt, acknowledgedAt: null },
      { severity: 'critical', sentAt: secondSentAt, acknowledgedAt: null },
    ]);
    expect(onBoard[1]!.to).toEqual([expect.objectContaining({ email: DEMO.charge, name: 'Marta Lindqvist' })]);

    // The nurse's flag card: the latest escalation, with the earlier one, each saying whom it reached and when.
    const card = await coldFlag(id);
    expect(card.severity).toBe('critical');
    expect(card.escalation).toMatchObject({ severity: 'critical', sentAt: secondSentAt, to: [{ name: 'Marta Lindqvist' }] });
    expect(card.escalation!.earlier).toEqual([expect.objectContaining({ severity: 'urgent', sentAt: firstSentAt, to: [expect.objectContaining({ name: 'Marta Lindqvist' })] })]);

    // The history lists both escalations, in order, each with whom it reached.
    const told = (await history(first.id!)).filter((e) => e.event === 'escalated');
    expect(told.map((e) => [e.at, e.text])).toEqual([
      [firstSentAt, 'Escalated (Needs attention): told Marta Lindqvist by e-mail'],
      [secondSentAt, 'Escalated (Critical): told Marta Lindqvist by e-mail'],
    ]);

    // Acknowledging the first leaves the later one waiting for its own acknowledgement.
    expect((await ward.call('charge', 'post', `/escalations/${onBoard[0]!.id}/acknowledge`, { note: 'Seen.' })).status).toBe(200);
    const afterFirst = await boardEscalations(first.id!);
    expect(afterFirst.map((e) => e.acknowledgedAt === null)).toEqual([false, true]);
    expect((await coldFlag(id)).escalation).toMatchObject({ severity: 'critical', acknowledgedAt: null });
    expect((await ward.call('charge', 'post', `/escalations/${onBoard[1]!.id}/acknowledge`, { note: 'Coming now.' })).status).toBe(200);
    expect((await ward.call('charge', 'post', `/escalations/${onBoard[1]!.id}/acknowledge`, {})).status).toBe(409);
    expect((await history(first.id!)).filter((e) => e.event === 'acknowledged').map((e) => e.text)).toEqual([
      'Escalation acknowledged (Needs attention)',
      'Escalation acknowledged (Critical)',
    ]);

    // Nothing more to tell while it stays as it is.
    for (let i = 0; i < 3; i += 1) {
      ward.advance(40);
      await sweep();
    }
    expect(mailsAbout(mailsBefore, bed)).toHaveLength(2);
    expect(await boardEscalations(first.id!)).toHaveLength(2);
    // Every view still agrees with the reference model (escalated at its current severity).
    const model = modelView(ward, id, evaluateModel);
    expect((await ward.views(id)).flatMap((v) => differences(v, model, true))).toEqual([]);
  });

  it('a flag that does not worsen never escalates twice, however long it stays open and whatever else is charted (common practice)', async () => {
    const id = await admit();
    const bed = await bedOf(id);
    const mailsBefore = env.mailer.sent.length;
    await ward.chart(id, { probe: 35.6, remote: 35.4, confirmedImplausible: true });
    ward.advance(31);
    await sweep();
    // Still moderate hypothermia, lower and higher: the same severity, so no one is told again.
    for (const remote of [34.6, 35.8, 33.0]) {
      ward.advance(35);
      await ward.chart(id, { probe: remote + 0.2, remote, confirmedImplausible: true });
      await settle();
      await sweep();
    }
    const flag = await coldFlag(id);
    expect(flag.severity).toBe('urgent');
    expect(await boardEscalations(flag.id!)).toHaveLength(1);
    expect(flag.escalation!.earlier).toBeUndefined();
    expect(mailsAbout(mailsBefore, bed)).toHaveLength(1);
  });

  it('a flag that worsens before its first escalation went out escalates once, at the worse severity (common practice; WHO 1997 via Miller 2011)', async () => {
    const id = await admit();
    const bed = await bedOf(id);
    const mailsBefore = env.mailer.sent.length;
    await ward.chart(id, { probe: 35.2, remote: 35.0, confirmedImplausible: true });
    ward.advance(10);
    await sweep();
    expect((await coldFlag(id)).escalation).toBeNull();
    await ward.chart(id, { probe: 31.9, remote: 31.7, confirmedImplausible: true });
    await settle();
    ward.advance(45);
    await sweep();
    const flag = await coldFlag(id);
    expect((await boardEscalations(flag.id!)).map((e) => e.severity)).toEqual(['critical']);
    expect(mailsAbout(mailsBefore, bed)).toHaveLength(1);
    expect(mailsAbout(mailsBefore, bed)[0]!.subject).not.toMatch(/worse/);
  });

  it('mild cold stress that never escalated worsens to moderate hypothermia and escalates after the unit delay counted from the worsening, not from the raising (common practice; WHO 1997 via Miller 2011; 30 min from memory)', async () => {
    const id = await admit();
    await ward.chart(id, { probe: 36.4, remote: 36.2 });
    ward.advance(60);
    await sweep();
    let flag = await coldFlag(id);
    expect(flag).toMatchObject({ severity: 'caution', escalation: null });
    await ward.chart(id, { probe: 35.3, remote: 35.1, confirmedImplausible: true });
    await settle();
    ward.advance(30);
    await sweep();
    flag = await coldFlag(id);
    expect(flag).toMatchObject({ severity: 'urgent', escalation: null });
    ward.advance(1);
    await sweep();
    flag = await coldFlag(id);
    expect(flag.escalation).toMatchObject({ severity: 'urgent', to: [{ email: DEMO.charge }] });
    expect(flag.escalation!.earlier).toBeUndefined();
  });

  it('an escalation stored before escalations kept a severity counts at the severity the flag was raised with: not told again at it, told again when it worsens (common practice)', async () => {
    const id = await admit();
    const raised = await ward.chart(id, { probe: 35.2, remote: 35.0, confirmedImplausible: true });
    const flagId = raised.body.openFlags.find((f: { kind: string }) => f.kind === 'cold-stress').id as string;
    // As the old code stored it: no severity, already sent.
    env.database.db
      .insert(escalations)
      .values({
        id: randomUUID(),
        flagId,
        unitId: 'unit-north',
        escalatedAt: env.clock.now(),
        mailedAt: env.clock.now(),
        recipient: JSON.stringify([{ userId: null, name: null, email: 'north-unit@warmfold.test' }]),
        channel: 'email',
      })
      .run();
    ward.advance(45);
    await sweep();
    expect(await boardEscalations(flagId)).toHaveLength(1);
    await ward.chart(id, { probe: 31.9, remote: 31.7, confirmedImplausible: true });
    await settle();
    expect((await boardEscalations(flagId)).map((e) => e.severity)).toEqual(['urgent', 'critical']);
  });
});

describe('the migration to one escalation per flag and severity', () => {
  it('keeps the escalations stored before it and allows a second escalation of a flag only at another severity', () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'warmfold-migrate-'));
    try {
      // The migrations up to the one before this change.
      const before = path.join(dir, 'drizzle-before');
      fs.cpSync(path.join(process.cwd(), 'drizzle'), before, { recursive: true });
      const journalFile = path.join(before, 'meta', '_journal.json');
      const journal = JSON.parse(fs.readFileSync(journalFile, 'utf8')) as { entries: { tag: string }[] };
      const at = journal.entries.findIndex((e) => e.tag.endsWith('_escalation_per_severity'));
      expect(at).toBeGreaterThan(0);
      journal.entries = journal.entries.slice(0, at);
      fs.writeFileSync(journalFile, JSON.stringify(journal));

      const sqlite = new Database(path.join(dir, 'old.db'));
      // Escalation rows alone, without the flags and units they would name.
      sqlite.pragma('foreign_keys = OFF');
      const db = drizzle(sqlite);
      migrate(db, { migrationsFolder: before });
      const insert = sqlite.prepare('INSERT INTO escalations (id, flag_id, unit_id, escalated_at, mailed_at, severity) VALUES (?, ?, ?, ?, ?, ?)');
      insert.run('e-old-1', 'f-1', 'u-1', 1_000, 2_000, null);
      insert.run('e-old-2', 'f-2', 'u-1', 3_000, null, 'urgent');
      // Before: one escalation per flag, whatever its severity.
      expect(() => insert.run('e-old-3', 'f-2', 'u-1', 4_000, null, 'critical')).toThrow(/UNIQUE/);

      migrate(db, { migrationsFolder: path.join(process.cwd(), 'drizzle') });
      expect(sqlite.prepare('SELECT id, flag_id, escalated_at, mailed_at, severity FROM escalations ORDER BY id').all()).toEqual([
        { id: 'e-old-1', flag_id: 'f-1', escalated_at: 1_000, mailed_at: 2_000, severity: null },
        { id: 'e-old-2', flag_id: 'f-2', escalated_at: 3_000, mailed_at: null, severity: 'urgent' },
      ]);
      // After: a worse severity is a new escalation; the same severity twice is refused.
      insert.run('e-new-1', 'f-2', 'u-1', 4_000, null, 'critical');
      expect(() => insert.run('e-new-2', 'f-2', 'u-1', 5_000, null, 'critical')).toThrow(/UNIQUE/);
      sqlite.close();
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});
