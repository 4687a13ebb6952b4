/**
 * The group-commit queue (server/write-batch.ts) kept for the read budgets (the chart-read audit):
 * writes that arrive together share one transaction, yet each caller gets exactly its own outcome.
 * A real SQLite file under synchronous=FULL, as the server opens it; no mocks.
 */
import Database from 'better-sqlite3';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { batchedWrite } from '@/server/write-batch';

let dir: string;
let sqlite: Database.Database;

beforeEach(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'wf-batch-'));
  sqlite = new Database(path.join(dir, 'batch.db'));
  sqlite.pragma('journal_mode = WAL');
  sqlite.pragma('synchronous = FULL');
  sqlite.pragma('foreign_keys = ON');
  sqlite.exec(
    [
      'CREATE TABLE parents (id INTEGER PRIMARY KEY)',
      'CREATE TABLE notes (id INTEGER PRIMARY KEY, parent_id INTEGER REFERENCES parents(id), text TEXT NOT NULL)',
      // Checked only at COMMIT: a way to make the batch's COMMIT itself fail.
      'CREATE TABLE late_checked (id INTEGER PRIMARY KEY, parent_id INTEGER REFERENCES parents(id) DEFERRABLE INITIALLY DEFERRED)',
    ].join(';'),
  );
  sqlite.exec('INSERT INTO parents (id) VALUES (1)');
});
afterEach(() => {
  sqlite.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

const insert = (text: string, parent = 1) => sqlite.prepare('INSERT INTO notes (parent_id, text) VALUES (?, ?)').run(parent, text);
const texts = () => (sqlite.prepare('SELECT text FROM notes ORDER BY id').all() as { text: string }[]).map((r) => r.text);

/** How many commits the database has seen: another connection's PRAGMA data_version moves once per commit by others. */
function commitCounter(file: string) {
  const watcher = new Database(file, { readonly: true });
  return {
    read: () => Number(watcher.pragma('data_version', { simple: true })),
    close: () => watcher.close(),
  };
}

describe('batchedWrite', () => {
  it('commits writes that arrive in the same turn in one transaction, each caller getting its own value', async () => {
    const counter = commitCounter(path.join(dir, 'batch.db'));
    const before = counter.read();
    const results = await Promise.all(['a', 'b', 'c', 'd'].map((t) => batchedWrite(sqlite, () => insert(t).changes)));
    expect(results).toEqual([1, 1, 1, 1]);
    expect(texts()).toEqual(['a', 'b', 'c', 'd']);
    // One commit for the four (data_version moves by one per commit seen from another connection).
    expect(counter.read() - before).toBe(1);
    counter.close();
  });

  it('rolls back only the job that throws: its own rows go, the others commit, and only its caller sees the error', async () => {
    const first = batchedWrite(sqlite, () => insert('kept-1'));
    const failing = batchedWrite(sqlite, () => {
      insert('taken-back');
      throw new Error('refused after its insert');
    });
    const last = batchedWrite(sqlite, () => insert('kept-2'));
    await expect(failing).rejects.toThrow('refused after its insert');
    await expect(first).resolves.toBeTruthy();
    await expect(last).resolves.toBeTruthy();
    expect(texts()).toEqual(['kept-1', 'kept-2']);
  });

  it('runs jobs in arrival order, each seeing the writes queued before it', async () => {
    const seen = await Promise.all([
      batchedWrite(sqlite, () => {
        insert('one');
        return texts().length;
      }),
      batchedWrite(sqlite, () => {
        insert('two');
        return texts().length;
      }),
    ]);
    expect(seen).toEqual([1, 2]);
  });

  it('settles nobody before the COMMIT: when the COMMIT fails, every caller in the batch gets the error and nothing is kept', async () => {
    const a = batchedWrite(sqlite, () => {
      insert('fine on its own');
      // A deferred foreign key: the savepoint is released, the outer COMMIT then fails.
      return sqlite.prepare('INSERT INTO late_checked (parent_id) VALUES (999)').run().changes;
    });
    const b = batchedWrite(sqlite, () => insert('innocent').changes);
    // Both settle, and both as refused. (The message, not toThrow: better-sqlite3's error class comes
    // from the first test file a jest worker loaded, so it is not this file's Error.)
    const [ra, rb] = await Promise.allSettled([a, b]);
    expect(ra).toMatchObject({ status: 'rejected', reason: { message: expect.stringMatching(/FOREIGN KEY/) } });
    expect(rb).toMatchObject({ status: 'rejected', reason: { message: expect.stringMatching(/FOREIGN KEY/) } });
    expect(texts()).toEqual([]);
    expect(sqlite.inTransaction).toBe(false);
  });

  it('keeps one queue per connection: a failure on one database never touches another', async () => {
    const other = new Database(path.join(dir, 'other.db'));
    other.exec('CREATE TABLE notes (id INTEGER PRIMARY KEY, text TEXT NOT NULL)');
    const here = batchedWrite(sqlite, () => {
      insert('here');
      throw new Error('only here');
    });
    const there = batchedWrite(other, () => other.prepare("INSERT INTO notes (text) VALUES ('there')").run().changes);
    await expect(here).rejects.toThrow('only here');
    await expect(there).resolves.toBe(1);
    expect(other.prepare('SELECT text FROM notes').all()).toEqual([{ text: 'there' }]);
    other.close();
  });

  it('starts a new batch for writes queued after the last one settled', async () => {
    await batchedWrite(sqlite, () => insert('first'));
    await batchedWrite(sqlite, () => insert('second'));
    expect(texts()).toEqual(['first', 'second']);
  });
});
