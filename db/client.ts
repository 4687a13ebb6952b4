import Database from 'better-sqlite3';
import { drizzle, type BetterSQLite3Database } from 'drizzle-orm/better-sqlite3';
import { migrate } from 'drizzle-orm/better-sqlite3/migrator';
import fs from 'node:fs';
import path from 'node:path';
import * as schema from './schema';
import { installLedger } from '../server/ledger';

export type Db = BetterSQLite3Database<typeof schema>;

export interface Database_ {
  sqlite: Database.Database;
  db: Db;
  close(): void;
}

/**
 * The migrations live in drizzle/ at the project root. Resolve them from the working
 * directory (or WARMFOLD_ROOT), never from __dirname: the compiled server sits in build/.
 */
export function migrationsFolder(): string {
  const root = process.env.WARMFOLD_ROOT ?? process.cwd();
  return path.join(root, 'drizzle');
}

/** Open (creating if needed) and migrate a Warmfold database with the pragmas the record needs. */
export function openDatabase(file: string): Database_ {
  if (file !== ':memory:') secureDataFiles(file);
  const sqlite = new Database(file);
  sqlite.pragma('journal_mode = WAL');
  // FULL: a reading acknowledged with 201 survives a power cut, not just a process crash.
  sqlite.pragma('synchronous = FULL');
  sqlite.pragma('foreign_keys = ON');
  sqlite.pragma('busy_timeout = 5000');
  const mode = sqlite.pragma('journal_mode', { simple: true });
  const sync = sqlite.pragma('synchronous', { simple: true });
  if (file !== ':memory:' && mode !== 'wal') throw new Error(`SQLite refused WAL mode (got ${String(mode)})`);
  if (sync !== 2) throw new Error(`SQLite refused synchronous=FULL (got ${String(sync)})`);
  const db = drizzleOf(sqlite);
  migrate(db, { migrationsFolder: migrationsFolder() });
  // Bind every write to the chained tables into the audit chain (server/ledger.ts).
  installLedger(sqlite);
  if (file !== ':memory:') secureDataFiles(file);
  return { sqlite, db, close: () => sqlite.close() };
}

const drizzles = new WeakMap<Database.Database, Db>();

/**
 * The Drizzle instance over a connection, made once per connection: `openDatabase`'s own `db`, and
 * the one code handed a bare connection (the audit chain, the ledger, the verifier) queries through.
 */
export function drizzleOf(sqlite: Database.Database): Db {
  let db = drizzles.get(sqlite);
  if (!db) {
    db = drizzle(sqlite, { schema });
    drizzles.set(sqlite, db);
  }
  return db;
}

/** Owner-only access to health data: the database's folder 0700, the file and its WAL and SHM 0600. */
export function secureDataFiles(file: string): void {
  const dir = path.dirname(file);
  fs.mkdirSync(dir, { recursive: true, mode: 0o700 });
  fs.chmodSync(dir, 0o700);
  // SQLite gives the WAL and SHM files the database file's permissions, so create it 0600 first.
  if (!fs.existsSync(file)) fs.closeSync(fs.openSync(file, 'a', 0o600));
  for (const f of [file, `${file}-wal`, `${file}-shm`]) {
    if (fs.existsSync(f)) fs.chmodSync(f, 0o600);
  }
  // Uploaded files sit in the data folder too; the folder's 0700 keeps them, this says so twice.
  const uploads = path.join(dir, 'uploads');
  if (fs.existsSync(uploads)) fs.chmodSync(uploads, 0o700);
}

/**
 * Run `fn` in a write transaction that takes the write lock up front (BEGIN IMMEDIATE),
 * so two writers never both read and then fight to upgrade their locks.
 */
export function writeTx<T>(sqlite: Database.Database, fn: () => T): T {
  return sqlite.transaction(fn).immediate();
}
