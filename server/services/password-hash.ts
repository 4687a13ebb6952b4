import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { Piscina } from 'piscina';

/**
 * bcrypt runs in a small pool of worker threads (piscina), so a sign-in never blocks the event
 * loop: with bcryptjs on the main thread each one stalled every other request for about 75 ms.
 * One thread fewer than the machine has cores (at least one), so the main thread keeps a core.
 */
const THREADS = Math.max(1, Math.min(4, os.availableParallelism() - 1));

interface PasswordTask {
  op: 'hash' | 'compare';
  password: string;
  cost?: number;
  hash?: string;
}

/** The worker is plain JavaScript beside this file; the built server (build/) finds it in the source tree. */
function workerFile(): string {
  const beside = path.join(__dirname, 'password-worker.cjs');
  if (fs.existsSync(beside)) return beside;
  return path.resolve(process.env.WARMFOLD_ROOT ?? process.cwd(), 'server', 'services', 'password-worker.cjs');
}

let pool: Piscina<PasswordTask, string | boolean> | null = null;

function passwordPool(): Piscina<PasswordTask, string | boolean> {
  // Idle threads are unref'd by piscina: the pool never keeps a process (or a test run) alive.
  pool ??= new Piscina<PasswordTask, string | boolean>({ filename: workerFile(), minThreads: 1, maxThreads: THREADS, idleTimeout: 60_000 });
  return pool;
}

export async function hashPassword(password: string, cost: number): Promise<string> {
  const hash = await passwordPool().run({ op: 'hash', password, cost });
  if (typeof hash !== 'string') throw new Error('password worker returned no hash');
  return hash;
}

export async function verifyPassword(password: string, hash: string): Promise<boolean> {
  return (await passwordPool().run({ op: 'compare', password, hash })) === true;
}

/** Stop the threads (shutdown). A later call starts a new pool. */
export async function closePasswordPool(): Promise<void> {
  const p = pool;
  pool = null;
  if (p) await p.destroy();
}
