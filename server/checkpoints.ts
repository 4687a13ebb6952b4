/**
 * Signed checkpoints of the audit chain's head. Every minute (when the chain moved) and at
 * shutdown the server appends one line to a checkpoint file: the head event's id and hash, how
 * many events lead up to it, the chain's first event, and an HMAC-SHA256 over all of it with a key
 * that is not in the database. Each line also carries the previous line's MAC, so a line taken out
 * of the middle shows. `npm run audit:verify` checks the database against every line: a chain
 * recomputed from some point on, or cut short, no longer matches what was signed.
 *
 * The key: AUDIT_KEY (32+ characters), or the file AUDIT_KEY_FILE; in the demo, when neither is
 * set, a key is generated into a file beside the data folder (`<data folder>.audit-key`), never
 * inside it, and the server says so at start. The checkpoint file: AUDIT_CHECKPOINT_FILE, or
 * `audit-checkpoints.log` in the data folder. Put either on another disk or host in production.
 */
import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import type Database from 'better-sqlite3';
import { count, desc } from 'drizzle-orm';
import { drizzleOf } from '../db/client';
import { auditEvents } from '../db/schema';
import { ConfigError } from './config';
import type { Job } from './scheduler';

/** The environment variables read here (a plain object in tests). */
type Env = Readonly<Record<string, string | undefined>>;

export interface AuditKey {
  key: Buffer;
  /** Where it came from, for the start-up line and the verifier's report. */
  source: string;
  generated: boolean;
}

export interface CheckpointSettings {
  file: string;
  key: AuditKey | null;
}

export interface Checkpoint {
  v: 1;
  at: string;
  headId: number;
  headHash: string;
  count: number;
  firstId: number;
  firstHash: string;
  reason: string;
  prev: string | null;
  mac: string;
}

/** The file holding a generated demo key: beside the data folder, not in it. */
export function defaultKeyFile(dataDir: string): string {
  const dir = path.resolve(dataDir);
  return path.join(path.dirname(dir), `${path.basename(dir)}.audit-key`);
}

/**
 * The checkpoint key. With `create`, a missing key file at the default place is generated (0600);
 * without it (the verifier), a missing key is null.
 */
export function loadAuditKey(dataDir: string, env: Env = process.env, create = false): AuditKey | null {
  if (env.AUDIT_KEY) {
    if (env.AUDIT_KEY.length < 32) throw new Error('AUDIT_KEY must be at least 32 characters');
    return { key: Buffer.from(env.AUDIT_KEY, 'utf8'), source: 'AUDIT_KEY', generated: false };
  }
  const file = env.AUDIT_KEY_FILE ? path.resolve(env.AUDIT_KEY_FILE) : defaultKeyFile(dataDir);
  if (fs.existsSync(file)) {
    const text = fs.readFileSync(file, 'utf8').trim();
    if (text.length < 32) throw new Error(`the audit key in ${file} is shorter than 32 characters`);
    return { key: Buffer.from(text, 'utf8'), source: file, generated: false };
  }
  if (!create || env.AUDIT_KEY_FILE) {
    if (env.AUDIT_KEY_FILE) throw new Error(`AUDIT_KEY_FILE ${file} does not exist`);
    return null;
  }
  fs.mkdirSync(path.dirname(file), { recursive: true });
  fs.writeFileSync(file, randomBytes(48).toString('base64url'), { mode: 0o600, flag: 'wx' });
  return { key: Buffer.from(fs.readFileSync(file, 'utf8').trim(), 'utf8'), source: file, generated: true };
}

export function checkpointSettings(dataDir: string, env: Env = process.env, create = false): CheckpointSettings {
  const file = path.resolve(env.AUDIT_CHECKPOINT_FILE ?? path.join(dataDir, 'audit-checkpoints.log'));
  return { file, key: loadAuditKey(dataDir, env, create) };
}

type Unsigned = Omit<Checkpoint, 'mac'>;

function mac(key: Buffer, c: Unsigned): string {
  const canonical = JSON.stringify([c.v, c.at, c.headId, c.headHash, c.count, c.firstId, c.firstHash, c.reason, c.prev]);
  return createHmac('sha256', key).update(canonical).digest('hex');
}

export function macMatches(key: Buffer, c: Checkpoint): boolean {
  const expected = Buffer.from(mac(key, c), 'hex');
  const given = Buffer.from(typeof c.mac === 'string' ? c.mac : '', 'hex');
  return given.length === expected.length && timingSafeEqual(given, expected);
}

export interface ParsedLine {
  line: number;
  checkpoint: Checkpoint | null;
}

export function readCheckpoints(file: string): ParsedLine[] {
  if (!fs.existsSync(file)) return [];
  return fs
    .readFileSync(file, 'utf8')
    .split('\n')
    .map((text, i) => ({ text, line: i + 1 }))
    .filter((l) => l.text.trim() !== '')
    .map(({ text, line }) => {
      try {
        return { line, checkpoint: JSON.parse(text) as Checkpoint };
      } catch {
        return { line, checkpoint: null };
      }
    });
}

/**
 * The last whole checkpoint of the file, read from its end only (the file grows by a line a minute
 * for as long as the product runs). A line a crash cut short cannot be parsed: the next line then
 * follows the last whole one, on a line of its own.
 */
function tail(file: string): { last: Checkpoint | null; endsWithNewline: boolean } {
  if (!fs.existsSync(file)) return { last: null, endsWithNewline: true };
  const fd = fs.openSync(file, 'r');
  try {
    const size = fs.fstatSync(fd).size;
    if (size === 0) return { last: null, endsWithNewline: true };
    const length = Math.min(size, 64 * 1024);
    const buffer = Buffer.alloc(length);
    fs.readSync(fd, buffer, 0, length, size - length);
    const text = buffer.toString('utf8');
    const lines = text.split('\n');
    if (length < size) lines.shift(); // the first piece may start mid-line
    let last: Checkpoint | null = null;
    for (const line of lines.reverse()) {
      if (!line.trim()) continue;
      try {
        last = JSON.parse(line) as Checkpoint;
        break;
      } catch {
        // a torn line: look further back
      }
    }
    return { last, endsWithNewline: text.endsWith('\n') };
  } finally {
    fs.closeSync(fd);
  }
}

/** The chain's head now: the last event, how many events there are, and the first one. */
export function chainHead(sqlite: Database.Database): { headId: number; headHash: string; count: number; firstId: number; firstHash: string } | null {
  const db = drizzleOf(sqlite);
  const event = { id: auditEvents.id, hash: auditEvents.hash };
  const head = db.select(event).from(auditEvents).orderBy(desc(auditEvents.id)).limit(1).get();
  const first = db.select(event).from(auditEvents).orderBy(auditEvents.id).limit(1).get();
  if (!head || !first) return null;
  const events = db.select({ n: count() }).from(auditEvents).get()?.n ?? 0;
  return { headId: head.id, headHash: head.hash, count: events, firstId: first.id, firstHash: first.hash };
}

/**
 * Append a signed checkpoint of the chain's head, unless the last line already signs this head.
 * Returns the line written, or null when there was nothing new (or no key).
 */
export function writeCheckpoint(sqlite: Database.Database, settings: CheckpointSettings, reason: string, now = new Date()): Checkpoint | null {
  if (!settings.key) return null;
  // One read transaction, so the head, the count and the first event belong together.
  const head = drizzleOf(sqlite).transaction(() => chainHead(sqlite));
  if (!head) return null;
  const { last, endsWithNewline } = tail(settings.file);
  if (last && last.headId === head.headId && last.headHash === head.headHash && last.firstHash === head.firstHash) return null;
  const unsigned: Unsigned = { v: 1, at: now.toISOString(), ...head, reason, prev: last?.mac ?? null };
  const checkpoint: Checkpoint = { ...unsigned, mac: mac(settings.key.key, unsigned) };
  fs.mkdirSync(path.dirname(settings.file), { recursive: true });
  // 'a': append only; 0600 when the file is created, and kept so if it already was.
  const fd = fs.openSync(settings.file, 'a', 0o600);
  try {
    fs.writeSync(fd, `${endsWithNewline ? '' : '\n'}${JSON.stringify(checkpoint)}\n`);
    fs.fsyncSync(fd);
  } finally {
    fs.closeSync(fd);
  }
  fs.chmodSync(settings.file, 0o600);
  return checkpoint;
}

/**
 * Set the current checkpoint file aside (renamed with a time stamp) after the demo's reset has
 * started a new chain, so the old signatures are kept but not held against the new chain.
 */
export function retireCheckpoints(settings: CheckpointSettings, now = new Date()): string | null {
  if (!fs.existsSync(settings.file)) return null;
  const target = `${settings.file}.replaced-${now.toISOString().replace(/[:.]/g, '-')}`;
  fs.renameSync(settings.file, target);
  return target;
}

/**
 * The scheduler's job: a checkpoint every minute when the chain moved. With
 * AUDIT_CHECKPOINT_MAILTO set, each new line is also e-mailed there, so a copy leaves the machine.
 */
export function checkpointJob(settings: CheckpointSettings, mailTo: string[] = []): Job {
  return {
    name: 'audit-checkpoint',
    pattern: '0 * * * * *',
    run: async (ctx) => {
      const written = writeCheckpoint(ctx.database.sqlite, settings, 'scheduled', ctx.clock.now());
      if (written && mailTo.length) {
        await ctx.mailer.send({ to: mailTo, subject: `Warmfold audit checkpoint: event ${written.headId}`, text: `${JSON.stringify(written)}\n` });
      }
    },
  };
}

/**
 * At start-up: find (or, in the demo, generate) the key, say where it is, sign the head as it is
 * now, and hand back the scheduler's job and the shutdown checkpoint.
 */
export function startCheckpointing(
  sqlite: Database.Database,
  dataDir: string,
  log: (line: string) => void,
  production = false,
  env: Env = process.env,
): { settings: CheckpointSettings; job: Job; atShutdown(): void } {
  // In production the key is named explicitly: one generated beside the data folder is a demo convenience.
  if (production && !env.AUDIT_KEY && !env.AUDIT_KEY_FILE) {
    throw new ConfigError('production', ['AUDIT_KEY (32+ characters) or AUDIT_KEY_FILE: the key that signs the audit checkpoints, kept outside the data folder and its backups']);
  }
  const settings = checkpointSettings(dataDir, env, true);
  const key = settings.key!;
  if (key.generated)
    log(
      `Audit checkpoints: generated a signing key in ${key.source} (beside the data folder, not in it). Fine for the demo; in production set AUDIT_KEY or AUDIT_KEY_FILE to a key kept elsewhere.`,
    );
  else log(`Audit checkpoints: signed with the key from ${key.source}, written to ${settings.file}.`);
  writeCheckpoint(sqlite, settings, 'start');
  const mailTo = (env.AUDIT_CHECKPOINT_MAILTO ?? '')
    .split(',')
    .map((s) => s.trim())
    .filter(Boolean);
  return {
    settings,
    job: checkpointJob(settings, mailTo),
    atShutdown: () => {
      writeCheckpoint(sqlite, settings, 'shutdown');
    },
  };
}
