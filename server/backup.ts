import type Database from 'better-sqlite3';
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';

export interface BackupOptions {
  /** The uploads folder to copy beside the database (uploaded files are part of the record). */
  uploadsDir?: string;
  /** The signed checkpoint file to copy, so the restored chain can be checked against it. */
  checkpointFile?: string;
}

export interface BackupResult {
  /** The backup's own folder: `warmfold.db`, `uploads/`, `audit-checkpoints.log`, `manifest.json`. */
  dir: string;
  file: string;
  pages: number;
  uploads: number;
  removed: string[];
}

export const BACKUP_DB = 'warmfold.db';
export const BACKUP_CHECKPOINTS = 'audit-checkpoints.log';
const BACKUP_NAME = /^warmfold-\d{4}-\d\d-\d\dT[\d-]+Z$/;

const sha256 = (file: string) => createHash('sha256').update(fs.readFileSync(file)).digest('hex');

/**
 * SQLite's online backup: a consistent copy taken while the product keeps writing, into a folder
 * of its own under `dir` (which may be on another disk), with the uploaded files, the checkpoint
 * file and a manifest of SHA-256 sums. Folders 0700, files 0600. Keeps the newest `keep` backups.
 */
export async function backupDatabase(sqlite: Database.Database, dir: string, keep: number, now = new Date(), options: BackupOptions = {}): Promise<BackupResult> {
  fs.mkdirSync(dir, { recursive: true, mode: 0o700 });
  fs.chmodSync(dir, 0o700);
  const target = path.join(dir, `warmfold-${now.toISOString().replace(/[:.]/g, '-')}`);
  const partial = `${target}.partial`;
  fs.rmSync(partial, { recursive: true, force: true });
  fs.mkdirSync(partial, { mode: 0o700 });
  const file = path.join(partial, BACKUP_DB);
  fs.closeSync(fs.openSync(file, 'w', 0o600));
  let pages = 0;
  await sqlite.backup(file, {
    progress: ({ totalPages }) => {
      pages = totalPages;
      return 200;
    },
  });
  // The copy is written in rollback-journal mode by the backup API; no WAL or SHM files beside it.
  const manifest: Record<string, string> = { [BACKUP_DB]: sha256(file) };
  let uploads = 0;
  // After the database: every upload its rows name was on disk before its row was written.
  if (options.uploadsDir && fs.existsSync(options.uploadsDir)) {
    fs.mkdirSync(path.join(partial, 'uploads'), { mode: 0o700 });
    for (const name of fs.readdirSync(options.uploadsDir)) {
      const from = path.join(options.uploadsDir, name);
      if (!fs.statSync(from).isFile()) continue;
      const to = path.join(partial, 'uploads', name);
      fs.copyFileSync(from, to);
      fs.chmodSync(to, 0o600);
      manifest[`uploads/${name}`] = sha256(to);
      uploads += 1;
    }
  }
  if (options.checkpointFile && fs.existsSync(options.checkpointFile)) {
    const to = path.join(partial, BACKUP_CHECKPOINTS);
    fs.copyFileSync(options.checkpointFile, to);
    fs.chmodSync(to, 0o600);
    manifest[BACKUP_CHECKPOINTS] = sha256(to);
  }
  fs.writeFileSync(path.join(partial, 'manifest.json'), `${JSON.stringify({ takenAt: now.toISOString(), pages, files: manifest }, null, 2)}\n`, { mode: 0o600 });
  // Renamed into place only when whole, so a backup folder without `.partial` is complete.
  fs.renameSync(partial, target);

  const copies = fs
    .readdirSync(dir)
    .filter((f) => BACKUP_NAME.test(f))
    .sort();
  const removed = copies.slice(0, Math.max(0, copies.length - keep)).map((f) => path.join(dir, f));
  for (const f of removed) fs.rmSync(f, { recursive: true, force: true });
  return { dir: target, file: path.join(target, BACKUP_DB), pages, uploads, removed };
}

/** Problems with a backup folder: files whose SHA-256 no longer matches its manifest. */
export function checkBackup(backupDir: string): string[] {
  const manifestFile = path.join(backupDir, 'manifest.json');
  if (!fs.existsSync(manifestFile)) return [`${manifestFile} is missing`];
  const manifest = JSON.parse(fs.readFileSync(manifestFile, 'utf8')) as { files?: Record<string, string> };
  const problems: string[] = [];
  for (const [name, sum] of Object.entries(manifest.files ?? {})) {
    const file = path.join(backupDir, name);
    if (!fs.existsSync(file)) problems.push(`${name} is missing`);
    else if (sha256(file) !== sum) problems.push(`${name} does not match its SHA-256 in the manifest`);
  }
  return problems;
}

/**
 * Put a backup back in place, with the server stopped: the current database (with its WAL and
 * SHM), uploads and checkpoint file are moved aside into `<data folder>/replaced-<time>/`, never
 * deleted, and the backup's copies take their place with owner-only permissions.
 */
export function restoreBackup(backupDir: string, target: { databasePath: string; uploadsDir: string; checkpointFile: string }, now = new Date()): { setAside: string } {
  const problems = checkBackup(backupDir);
  if (problems.length) throw new Error(`The backup in ${backupDir} is damaged: ${problems.join('; ')}`);
  const dataDir = path.dirname(target.databasePath);
  const aside = path.join(dataDir, `replaced-${now.toISOString().replace(/[:.]/g, '-')}`);
  fs.mkdirSync(aside, { recursive: true, mode: 0o700 });
  for (const f of [target.databasePath, `${target.databasePath}-wal`, `${target.databasePath}-shm`, target.uploadsDir, target.checkpointFile]) {
    if (fs.existsSync(f)) fs.renameSync(f, path.join(aside, path.basename(f)));
  }
  fs.copyFileSync(path.join(backupDir, BACKUP_DB), target.databasePath);
  fs.chmodSync(target.databasePath, 0o600);
  const uploads = path.join(backupDir, 'uploads');
  if (fs.existsSync(uploads)) {
    fs.mkdirSync(target.uploadsDir, { recursive: true, mode: 0o700 });
    for (const name of fs.readdirSync(uploads)) {
      fs.copyFileSync(path.join(uploads, name), path.join(target.uploadsDir, name));
      fs.chmodSync(path.join(target.uploadsDir, name), 0o600);
    }
  }
  const checkpoints = path.join(backupDir, BACKUP_CHECKPOINTS);
  if (fs.existsSync(checkpoints)) {
    fs.copyFileSync(checkpoints, target.checkpointFile);
    fs.chmodSync(target.checkpointFile, 0o600);
  }
  return { setAside: aside };
}
