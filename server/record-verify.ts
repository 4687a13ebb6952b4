/**
 * What `npm run audit:verify` checks: every link and event hash of the audit chain, every row of
 * every chained table against the hash its latest row event carries, rows without an event and
 * events whose row is gone, a cut tail (the id counter ran past the last event), and the chain
 * against every signed checkpoint (server/checkpoints.ts). It reads only, so it can run on a copy
 * or beside the running server.
 */
import type Database from 'better-sqlite3';
import { count as countOf, eq, gte, max, min } from 'drizzle-orm';
import { integer, sqliteTable, text } from 'drizzle-orm/sqlite-core';
import { drizzleOf } from '../db/client';
import { auditEvents } from '../db/schema';
import { auditEventsInOrder, auditHash, GENESIS_HASH, hashedFields, type AuditEventRow } from './audit';
import { macMatches, readCheckpoints, type Checkpoint, type CheckpointSettings } from './checkpoints';
import { chainedRows, columnsOf, LEDGER_MARKER, ROW_ACTIONS, rowHash, type RowAction } from './ledger';
import { CHAINED } from './ledger-tables';

/** SQLite's own table of AUTOINCREMENT counters (made by SQLite, so not in db/schema.ts). */
const sqliteSequence = sqliteTable('sqlite_sequence', { name: text('name').notNull(), seq: integer('seq').notNull() });

export type FindingKind =
  | 'event-link'
  | 'event-changed'
  | 'tail-cut'
  | 'row-edited'
  | 'row-deleted'
  | 'row-unrecorded'
  | 'checkpoint-invalid'
  | 'checkpoint-line-removed'
  | 'checkpoint-mismatch'
  | 'checkpoints-missing'
  | 'chain-replaced';

export interface Finding {
  kind: FindingKind;
  /** The event concerned, when there is one (findings are ordered by it). */
  eventId: number | null;
  table?: string;
  key?: string;
  message: string;
}

export interface RecordReport {
  ok: boolean;
  events: number;
  rowsChecked: number;
  findings: Finding[];
  /** `ledger-installed` events: from when each chained table is covered, and how many rows were only baselined. */
  baselines: { eventId: number; at: number; tables: Record<string, number> }[];
  checkpoints: {
    file: string | null;
    status: 'checked' | 'no-file' | 'no-key' | 'not-asked';
    keySource: string | null;
    lines: number;
    last: Checkpoint | null;
    unreadable: number[];
  };
  /** Events after the last valid checkpoint: consistent with the chain, but no signature vouches for them. */
  unvouched: { fromId: number; toId: number; events: number; fromAt: number; toAt: number } | null;
}

interface RowEvent {
  id: number;
  action: RowAction;
  v: number;
  hash: string | null;
}

const rowKey = (table: string, key: string) => `${table}\u0000${key}`;

export function verifyRecord(sqlite: Database.Database, options: { checkpoints?: CheckpointSettings } = {}): RecordReport {
  // One read transaction: one snapshot of the events and the rows, even beside a running server
  // (a row committed between reading the events and reading the rows would look unrecorded).
  return drizzleOf(sqlite).transaction(() => verifySnapshot(sqlite, options));
}

function verifySnapshot(sqlite: Database.Database, options: { checkpoints?: CheckpointSettings }): RecordReport {
  const findings: Finding[] = [];
  const lines = options.checkpoints ? readCheckpoints(options.checkpoints.file) : [];
  const wanted = new Set<number>();
  for (const l of lines) if (l.checkpoint && Number.isInteger(l.checkpoint.headId)) wanted.add(l.checkpoint.headId);
  const seenAt = new Map<number, { hash: string; ordinal: number }>();

  // 1. The chain: links, event hashes, and the latest row event per (table, key).
  const rowEvents = new Map<string, RowEvent>();
  const baselines: RecordReport['baselines'] = [];
  const rowActions = new Set<string>(ROW_ACTIONS);
  const isRowAction = (action: string): action is RowAction => rowActions.has(action);
  const db = drizzleOf(sqlite);
  let prev = GENESIS_HASH;
  let prevId: number | null = null;
  let count = 0;
  let first: AuditEventRow | null = null;
  let last: AuditEventRow | null = null;
  for (const e of auditEventsInOrder(sqlite)) {
    count += 1;
    first ??= e;
    last = e;
    if (e.prevHash !== prev) {
      const gap = prevId !== null && e.id !== prevId + 1 ? ` (events ${prevId + 1}–${e.id - 1} are missing)` : '';
      findings.push({ kind: 'event-link', eventId: e.id, message: `the link to the previous event does not match: an event before it was removed or changed${gap}` });
    }
    if (auditHash(e.prevHash, hashedFields(e)) !== e.hash) {
      findings.push({ kind: 'event-changed', eventId: e.id, message: 'the event was changed after it was written' });
    }
    prev = e.hash;
    prevId = e.id;
    if (wanted.has(e.id)) seenAt.set(e.id, { hash: e.hash, ordinal: count });
    if (isRowAction(e.action) && e.entityId !== null) {
      const parsed = parseAfter(e.after);
      rowEvents.set(rowKey(e.entityType, e.entityId), { id: e.id, action: e.action, v: parsed.v, hash: parsed.hash });
    } else if (e.action === LEDGER_MARKER.action && e.entityType === LEDGER_MARKER.entityType) {
      const tables = (parseJson(e.after) as { tables?: Record<string, number> } | null)?.tables ?? {};
      baselines.push({ eventId: e.id, at: e.at.getTime(), tables });
    }
  }

  // 2. A cut tail: AUTOINCREMENT's counter remembers the highest id ever handed out.
  const seq = db.select({ seq: sqliteSequence.seq }).from(sqliteSequence).where(eq(sqliteSequence.name, 'audit_events')).get()?.seq ?? 0;
  const lastId = last?.id ?? 0;
  if (seq > lastId) {
    findings.push({
      kind: 'tail-cut',
      eventId: lastId + 1,
      message: `events ${lastId + 1}–${seq} were handed out but are gone: the end of the chain was cut`,
    });
  }

  // 3. Every row of every chained table against its latest row event.
  let rowsChecked = 0;
  const unrecorded: Finding[] = [];
  for (const [name, table] of Object.entries(CHAINED)) {
    const have = columnsOf(sqlite, name);
    if (have.size === 0) continue;
    const usable = table.versions.map((cols, i) => (cols.every((c) => have.has(c)) ? i + 1 : 0)).filter((v) => v > 0);
    for (const row of chainedRows(sqlite, name, table, usable)) {
      rowsChecked += 1;
      const key = row.key;
      const id = rowKey(name, key);
      const event = rowEvents.get(id);
      rowEvents.delete(id);
      if (!event) {
        unrecorded.push({
          kind: 'row-unrecorded',
          eventId: null,
          table: name,
          key,
          message: `${name} row ${key} has no audit event: it was inserted without one, or its event was removed`,
        });
        continue;
      }
      if (event.action === 'row-delete') {
        findings.push({ kind: 'row-unrecorded', eventId: event.id, table: name, key, message: `${name} row ${key} is present although event ${event.id} recorded its deletion` });
        continue;
      }
      const canonical = row.canonical.get(event.v);
      if (canonical === undefined || event.hash === null || rowHash(name, event.v, canonical) !== event.hash) {
        findings.push({
          kind: 'row-edited',
          eventId: event.id,
          table: name,
          key,
          message: `${name} row ${key} differs from what event ${event.id} recorded: it was edited outside the app`,
        });
      }
    }
  }
  for (const [id, event] of rowEvents) {
    const [table, key] = id.split('\u0000') as [string, string];
    if (event.action === 'row-delete' || !CHAINED[table]) continue;
    findings.push({ kind: 'row-deleted', eventId: event.id, table, key, message: `${table} row ${key}, recorded by event ${event.id}, is gone: it was deleted outside the app` });
  }

  // 4. The chain against the signed checkpoints.
  const checkpoints: RecordReport['checkpoints'] = {
    file: options.checkpoints?.file ?? null,
    status: !options.checkpoints ? 'not-asked' : lines.length === 0 ? 'no-file' : options.checkpoints.key ? 'checked' : 'no-key',
    keySource: options.checkpoints?.key?.source ?? null,
    lines: lines.length,
    last: null,
    unreadable: [],
  };
  // The server signs the head whenever it starts, so with a key in place an empty or missing file
  // means the file was taken away (together, perhaps, with a recomputed chain).
  if (checkpoints.status === 'no-file' && options.checkpoints?.key && count > 0) {
    findings.push({
      kind: 'checkpoints-missing',
      eventId: null,
      message: `there is an audit key (${options.checkpoints.key.source}) but no signed checkpoint in ${options.checkpoints.file}: the checkpoint file was removed or emptied, or Warmfold has never run with this key`,
    });
  }
  if (checkpoints.status === 'checked') {
    const key = options.checkpoints!.key!.key;
    let previousMac: string | null = null;
    let replacedReported = false;
    for (const { line, checkpoint: c } of lines) {
      if (!c) {
        // Not JSON: a write cut short by a crash. Hiding a line this way shows at the next one,
        // whose `prev` names the hidden line's MAC; the last line could simply have been removed.
        checkpoints.unreadable.push(line);
        continue;
      }
      if (!macMatches(key, c)) {
        findings.push({ kind: 'checkpoint-invalid', eventId: null, message: `checkpoint line ${line} has no valid signature: it was altered or written with another key` });
        continue;
      }
      if (c.prev !== previousMac) {
        findings.push({ kind: 'checkpoint-line-removed', eventId: c.headId, message: `checkpoint line ${line} does not follow the line before it: a checkpoint line was removed` });
      }
      previousMac = c.mac;
      checkpoints.last = c;
      if (!replacedReported && (!first || first.id !== c.firstId || first.hash !== c.firstHash)) {
        replacedReported = true;
        findings.push({
          kind: 'chain-replaced',
          eventId: first?.id ?? null,
          message: `the chain does not start with the event the checkpoint of ${c.at} signed (event ${c.firstId}): the whole chain was replaced or recomputed`,
        });
      }
      const seen = seenAt.get(c.headId);
      if (!seen) {
        if (c.headId > lastId) {
          findings.push({
            kind: 'tail-cut',
            eventId: lastId + 1,
            message: `the checkpoint of ${c.at} signed event ${c.headId}, but the chain ends at event ${lastId}: the end of the chain was cut`,
          });
        } else {
          findings.push({ kind: 'checkpoint-mismatch', eventId: c.headId, message: `event ${c.headId}, signed by the checkpoint of ${c.at}, is missing` });
        }
      } else if (seen.hash !== c.headHash) {
        findings.push({
          kind: 'checkpoint-mismatch',
          eventId: c.headId,
          message: `event ${c.headId} is not the one the checkpoint of ${c.at} signed: the chain was recomputed at or before it`,
        });
      } else if (seen.ordinal !== c.count) {
        findings.push({
          kind: 'checkpoint-mismatch',
          eventId: c.headId,
          message: `the checkpoint of ${c.at} counted ${c.count} events up to event ${c.headId}, the chain now has ${seen.ordinal}: events were removed or added before it`,
        });
      }
    }
  }
  const vouchedTo = checkpoints.last?.headId ?? null;
  let unvouched: RecordReport['unvouched'] = null;
  if (last && (vouchedTo === null || last.id > vouchedTo)) {
    const fromId = vouchedTo === null ? first!.id : vouchedTo + 1;
    const w = db
      .select({ n: countOf(), fromAt: min(auditEvents.at), toAt: max(auditEvents.at) })
      .from(auditEvents)
      .where(gte(auditEvents.id, fromId))
      .get();
    if (w && w.n > 0 && w.fromAt && w.toAt) unvouched = { fromId, toId: last.id, events: w.n, fromAt: w.fromAt.getTime(), toAt: w.toAt.getTime() };
  }

  const ordered = [...findings.sort((a, b) => (a.eventId ?? Infinity) - (b.eventId ?? Infinity)), ...unrecorded];
  return { ok: ordered.length === 0, events: count, rowsChecked, findings: ordered, baselines, checkpoints, unvouched };
}

function parseJson(text: string | null): unknown {
  if (text === null) return null;
  try {
    return JSON.parse(text) as unknown;
  } catch {
    return null;
  }
}

function parseAfter(text: string | null): { v: number; hash: string | null } {
  const value = parseJson(text) as { v?: unknown; row?: unknown; was?: unknown } | null;
  const v = typeof value?.v === 'number' ? value.v : 0;
  const hash = typeof value?.row === 'string' ? value.row : typeof value?.was === 'string' ? value.was : null;
  return { v, hash };
}

const iso = (ms: number) => new Date(ms).toISOString();

/** The report as the lines `npm run audit:verify` prints. */
export function describeRecordReport(report: RecordReport, file: string): string[] {
  const out: string[] = [];
  if (report.ok) out.push(`Record intact: ${report.events} audit events and ${report.rowsChecked} chained rows checked in ${file}.`);
  else {
    const firstFinding = report.findings[0]!;
    const where =
      firstFinding.eventId !== null && firstFinding.kind.startsWith('event')
        ? `event ${firstFinding.eventId}`
        : firstFinding.table
          ? `${firstFinding.table} row ${firstFinding.key}`
          : firstFinding.eventId !== null
            ? `event ${firstFinding.eventId}`
            : 'the checkpoints';
    out.push(`Record BROKEN at ${where}: ${firstFinding.message}.`);
    out.push(`${report.findings.length} problem(s) found (${report.events} events and ${report.rowsChecked} chained rows read):`);
    for (const f of report.findings.slice(0, 50)) out.push(`  - [${f.kind}] ${f.message}`);
    if (report.findings.length > 50) out.push(`  … and ${report.findings.length - 50} more`);
  }
  for (const b of report.baselines) {
    const rows = Object.values(b.tables).reduce((a, n) => a + n, 0);
    if (rows > 0)
      out.push(
        `Baseline: event ${b.eventId} (${iso(b.at)}) took ${rows} rows already present (${Object.entries(b.tables)
          .filter(([, n]) => n > 0)
          .map(([t, n]) => `${t} ${n}`)
          .join(', ')}) into the ledger; their content is vouched for from then on, not before.`,
      );
  }
  const c = report.checkpoints;
  if (c.status === 'checked' && c.last) out.push(`Signed checkpoints: ${c.lines} in ${c.file}; the last (${c.last.at}) vouches for events up to ${c.last.headId}.`);
  if (c.unreadable.length) out.push(`Checkpoint line(s) ${c.unreadable.join(', ')} could not be read (a write cut short by a crash); the lines after them still follow on.`);
  if (c.status === 'no-key') out.push(`Checkpoints NOT checked: ${c.file} exists but no audit key was found (set AUDIT_KEY or AUDIT_KEY_FILE).`);
  else if (c.status === 'no-file') out.push(`No signed checkpoints in ${c.file}: a chain recomputed as a whole, or cut short together with its rows, would not be found.`);
  if (report.unvouched) {
    const u = report.unvouched;
    out.push(
      `Not vouched for by a signature: events ${u.fromId}–${u.toId} (${u.events}, written ${iso(u.fromAt)} to ${iso(u.toAt)}) came after the last checkpoint; they are checked against each other only.`,
    );
  }
  return out;
}
