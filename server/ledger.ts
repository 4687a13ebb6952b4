/**
 * The row ledger: every insert, update and delete in a chained table (server/ledger-tables.ts)
 * appends an audit event that carries a SHA-256 of the row's canonical content, in the same
 * statement and so the same transaction (or savepoint) as the write itself.
 *
 * It works through TEMP triggers on the app's connection, the way the board cache watches its
 * tables: no write path has to remember it, a rolled-back savepoint rolls its events back too, and
 * the group-committed readings keep their events in commit order. The hashing runs in one
 * deterministic SQL function registered on the connection. Another connection (a script, the
 * sqlite3 shell, someone holding the file) writes without events, which is exactly what
 * `npm run audit:verify` reports.
 *
 * Row events: action `row-insert`, `row-update`, `row-delete` or `row-baseline`; entity type the
 * table; entity id the key; `after` is `{"v":version,"row":hash}` (`{"v":…,"was":hash}` for a
 * delete). Their actor is empty: the app's own event for the same change names the person.
 */
import { createHash } from 'node:crypto';
import type Database from 'better-sqlite3';
import { and, eq, gt, sql, type SQL } from 'drizzle-orm';
import { drizzleOf } from '../db/client';
import { auditEvents } from '../db/schema';
import { SCHEMA_TABLES } from '../db/tables';
import { appendAudit, auditHash, GENESIS_HASH, headHash } from './audit';
import { CHAINED, type ChainedTable } from './ledger-tables';

export type RowAction = 'row-insert' | 'row-update' | 'row-delete' | 'row-baseline';
export const ROW_ACTIONS: readonly RowAction[] = ['row-insert', 'row-update', 'row-delete', 'row-baseline'];

/** The event that records which tables the ledger covers from when, and how many rows it found there. */
export const LEDGER_MARKER = { action: 'ledger-installed', entityType: 'ledger', entityId: 'tables' } as const;

/** The hash of one row's canonical content: its table, the canonical version, and SQLite's json_array of the version's columns. */
export function rowHash(table: string, version: number, canonical: string): string {
  return createHash('sha256').update(`${table}\n${version}\n${canonical}`).digest('hex');
}

const q = (name: string) => `"${name.replace(/"/g, '""')}"`;

/** SQL for the row's key as stored in the event's entity_id, over `prefix` (`NEW.`, `OLD.` or nothing). */
export function keySql(table: ChainedTable, prefix = ''): string {
  return table.key.map((k) => `CAST(${prefix}${q(k)} AS TEXT)`).join(` || ':' || `);
}

/** SQL for the canonical content of version `version` (1-based). */
export function canonicalSql(table: ChainedTable, version: number, prefix = ''): string {
  const columns = table.versions[version - 1];
  if (!columns) throw new Error(`no canonical version ${version}`);
  return `json_array(${columns.map((c) => `${prefix}${q(c)}`).join(', ')})`;
}

// sql fragments: SQLite's CAST and json_array are the encoding every row hash was made over (Drizzle has no json_array).
const keyExpr = (table: ChainedTable): SQL<string> =>
  sql<string>`${sql.join(
    table.key.map((k) => sql`CAST(${sql.identifier(k)} AS TEXT)`),
    sql` || ':' || `,
  )}`;
function canonicalExpr(table: ChainedTable, version: number): SQL<string> {
  const columns = table.versions[version - 1];
  if (!columns) throw new Error(`no canonical version ${version}`);
  return sql<string>`json_array(${sql.join(
    columns.map((c) => sql.identifier(c)),
    sql`, `,
  )})`;
}
// sql fragment: rowid is SQLite's own row number, not a declared column: the order rows were written in.
const rowid = sql<number>`rowid`;

export interface ChainedRow {
  key: string;
  unit: string | null;
  /** The canonical content (json_array text) for each version asked for. */
  canonical: Map<number, string>;
}

const ROW_PAGE = 2_000;

/**
 * Every row of a chained table in the order it was written, a page at a time: its key, its unit
 * and its canonical content under each of `versions` (columns as SQLite stores them, so the text
 * is the one the row events hashed).
 */
export function* chainedRows(sqlite: Database.Database, name: string, table: ChainedTable, versions: readonly number[]): Generator<ChainedRow> {
  const from = SCHEMA_TABLES.get(name);
  if (!from) throw new Error(`the chained table ${name} is not in db/schema.ts`);
  // sql fragments: the registry names its columns by their SQL names, so they are selected by name.
  const fields: Record<string, SQL> = { rid: rowid, key: keyExpr(table), unit: table.unit ? sql<string | null>`${sql.identifier(table.unit)}` : sql<null>`NULL` };
  for (const v of versions) fields[`c${v}`] = canonicalExpr(table, v);
  const db = drizzleOf(sqlite);
  let after = 0;
  for (;;) {
    const page = db.select(fields).from(from).where(gt(rowid, after)).orderBy(rowid).limit(ROW_PAGE).all();
    for (const r of page) {
      yield { key: String(r.key), unit: r.unit === null ? null : String(r.unit), canonical: new Map(versions.map((v) => [v, String(r[`c${v}`])])) };
    }
    if (page.length < ROW_PAGE) return;
    after = Number(page[page.length - 1]!.rid);
  }
}

/** The columns a table has in this database file (none when it is missing). */
export function columnsOf(sqlite: Database.Database, table: string): Set<string> {
  // PRAGMA: the columns of the file as it is (Drizzle knows only the schema's); one object per column.
  const info: unknown = sqlite.pragma(`main.table_info(${q(table)})`);
  return new Set((Array.isArray(info) ? info : []).map((c: { name?: unknown }) => String(c.name)));
}

/**
 * The newest canonical version whose columns all exist in this database (0 when the table is
 * missing): a database whose later migration has not run yet keeps hashing with the older list.
 */
export function currentVersion(sqlite: Database.Database, name: string, table: ChainedTable): number {
  const have = columnsOf(sqlite, name);
  if (have.size === 0) return 0;
  for (let v = table.versions.length; v >= 1; v--) {
    if (table.versions[v - 1]!.every((c) => have.has(c))) return v;
  }
  return 0;
}

const NOW_MS = "CAST(ROUND((julianday('now') - 2440587.5) * 86400000) AS INTEGER)";

/** REKEY: an UPDATE that changes the key also records the old key's row as deleted. */
type Op = 'INSERT' | 'UPDATE' | 'DELETE' | 'REKEY';
const OPS: readonly Op[] = ['INSERT', 'UPDATE', 'DELETE', 'REKEY'];

// SQL text: a TEMP trigger (Drizzle has no triggers); SQLite runs its body inside every write of the table.
function triggerSql(name: string, table: ChainedTable, version: number, op: Op): string {
  const row = op === 'DELETE' || op === 'REKEY' ? 'OLD.' : 'NEW.';
  const action: RowAction = op === 'INSERT' ? 'row-insert' : op === 'UPDATE' ? 'row-update' : 'row-delete';
  const when = op === 'REKEY' ? `AFTER UPDATE ON main.${q(name)} WHEN ${keySql(table, 'OLD.')} IS NOT ${keySql(table, 'NEW.')}` : `AFTER ${op} ON main.${q(name)}`;
  const unit = table.unit ? `${row}${q(table.unit)}` : 'NULL';
  // warmfold_row_event answers "<event hash> <after>" (deterministic, so SQLite may call it for each
  // substr). The statement reads audit_events before it inserts, so `prev` is the head before it.
  return `CREATE TEMP TRIGGER IF NOT EXISTS ${triggerName(name, op)} ${when} BEGIN
  INSERT INTO main.audit_events (at, actor_id, action, entity_type, entity_id, unit_id, before, after, prev_hash, hash)
  SELECT e.at, NULL, '${action}', '${name}', e.eid, e.unit, NULL, substr(e.x, 66), e.prev, substr(e.x, 1, 64)
  FROM (SELECT i.at, i.eid, i.unit, i.prev,
      warmfold_row_event(i.prev, i.at, '${action}', '${name}', i.eid, i.unit, ${version}, i.canonical) AS x
    FROM (SELECT ${NOW_MS} AS at, ${keySql(table, row)} AS eid, ${unit} AS unit, ${canonicalSql(table, version, row)} AS canonical,
        COALESCE((SELECT hash FROM main.audit_events ORDER BY id DESC LIMIT 1), '${GENESIS_HASH}') AS prev LIMIT 1) AS i LIMIT 1) AS e;
END`;
}

const triggerName = (table: string, op: string) => `ledger_${table}_${op.toLowerCase()}`;

/** The `after` text of a row event. */
export function rowEventAfter(table: string, version: number, canonical: string, deleted: boolean): string {
  const hash = rowHash(table, version, canonical);
  return JSON.stringify(deleted ? { v: version, was: hash } : { v: version, row: hash });
}

function registerFunctions(sqlite: Database.Database): void {
  sqlite.function('warmfold_row_event', { deterministic: true }, (prev, at, action, table, entityId, unitId, version, canonical) => {
    const after = rowEventAfter(String(table), Number(version), String(canonical), action === 'row-delete');
    const e = {
      at: Number(at),
      actorId: null,
      action: String(action),
      entityType: String(table),
      entityId: entityId as string | null,
      unitId: unitId as string | null,
      before: null,
      after,
    };
    return `${auditHash(String(prev), e)} ${after}`;
  });
}

const installed = new WeakMap<Database.Database, string[]>();

/**
 * Start the ledger on a writable connection: register the functions, create the temporary
 * triggers, and, for every chained table the ledger has not covered before on this database
 * (a database from before the ledger, or a table registered since), write one `row-baseline`
 * event per row already there and a `ledger-installed` event that says so. A baseline vouches
 * for a row's content from that moment on, not before.
 */
export function installLedger(sqlite: Database.Database, now = new Date()): void {
  if (!installed.has(sqlite)) registerFunctions(sqlite);
  const names: string[] = [];
  const versions = new Map<string, number>();
  for (const [name, table] of Object.entries(CHAINED)) {
    const version = currentVersion(sqlite, name, table);
    if (version === 0) continue;
    versions.set(name, version);
    names.push(name);
    for (const op of OPS) sqlite.exec(triggerSql(name, table, version, op));
  }
  installed.set(sqlite, names);
  drizzleOf(sqlite).transaction(() => baseline(sqlite, versions, now), { behavior: 'immediate' });
}

/** Tables some `ledger-installed` event already covers. */
export function coveredTables(sqlite: Database.Database): Set<string> {
  const covered = new Set<string>();
  const markers = drizzleOf(sqlite)
    .select({ after: auditEvents.after })
    .from(auditEvents)
    .where(and(eq(auditEvents.entityType, LEDGER_MARKER.entityType), eq(auditEvents.entityId, LEDGER_MARKER.entityId), eq(auditEvents.action, LEDGER_MARKER.action)))
    .all();
  for (const m of markers) {
    const tables = (JSON.parse(m.after ?? '{}') as { tables?: Record<string, number> }).tables ?? {};
    for (const t of Object.keys(tables)) covered.add(t);
  }
  return covered;
}

function baseline(sqlite: Database.Database, versions: Map<string, number>, now: Date): void {
  const covered = coveredTables(sqlite);
  const counts: Record<string, number> = {};
  const db = drizzleOf(sqlite);
  let pending: (typeof auditEvents.$inferInsert)[] = [];
  // Several events to a statement; their ids keep the order of the array, which is the chain's.
  const flush = () => {
    if (pending.length) db.insert(auditEvents).values(pending).run();
    pending = [];
  };
  let prev = headHash(sqlite);
  const at = now.getTime();
  for (const [name, version] of versions) {
    if (covered.has(name)) continue;
    const table = CHAINED[name]!;
    let n = 0;
    for (const r of chainedRows(sqlite, name, table, [version])) {
      const after = rowEventAfter(name, version, r.canonical.get(version)!, false);
      const e = { at, actorId: null, action: 'row-baseline', entityType: name, entityId: r.key, unitId: r.unit, before: null, after };
      const hash = auditHash(prev, e);
      pending.push({ ...e, at: now, prevHash: prev, hash });
      if (pending.length >= 500) flush();
      prev = hash;
      n += 1;
    }
    counts[name] = n;
  }
  flush();
  if (Object.keys(counts).length === 0) return;
  appendAudit(sqlite, {
    at: now,
    actorId: null,
    action: LEDGER_MARKER.action,
    entityType: LEDGER_MARKER.entityType,
    entityId: LEDGER_MARKER.entityId,
    unitId: null,
    after: {
      tables: counts,
      note: 'row-baseline events vouch for these rows from this moment on; their content before it cannot be checked',
    },
  });
}

/**
 * Run `fn` with the ledger's triggers off, then start the ledger again (writing a fresh
 * `ledger-installed` event if `fn` emptied the audit trail). Only the demo's reset uses this.
 */
export function withoutLedger<T>(sqlite: Database.Database, fn: () => T): T {
  const names = installed.get(sqlite) ?? [];
  // SQL text: dropping the TEMP triggers (Drizzle has no triggers).
  for (const name of names) for (const op of OPS) sqlite.exec(`DROP TRIGGER IF EXISTS temp.${triggerName(name, op)}`);
  try {
    return fn();
  } finally {
    installLedger(sqlite);
  }
}
