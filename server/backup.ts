import type Database from 'better-sqlite3';
import fs from 'node:fs';
import path from 'node:path';

export interface BackupResult {
  file: string;
  pages: number;
  removed: string[];
}

/**
 * SQLite's online backup: a consistent copy taken while the product keeps writing. Keeps the
 * newest `keep` copies in `dir` and removes older ones.
 */
export async function backupDatabase(sqlite: Database.Database, dir: string, keep: number, now = new Date()): Promise<BackupResult> {
  fs.mkdirSync(dir, { recursive: true });
  const stamp = now.toISOString().replace(/[:.]/g, '-');
  const file = path.join(dir, `warmfold-${stamp}.db`);
  let pages = 0;
  await sqlite.backup(file, {
    progress: ({ totalPages }) => {
      pages = totalPages;
      return 200;
    },
  });
  const copies = fs
    .readdirSync(dir)
    .filter((f) => /^warmfold-.*\.db$/.test(f))
    .sort();
  const removed = copies.slice(0, Math.max(0, copies.length - keep)).map((f) => path.join(dir, f));
  for (const f of removed) fs.rmSync(f, { force: true });
  return { file, pages, removed };
}
