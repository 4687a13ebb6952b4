/** Starts the production build (build/server/index.js) on a free port against a prepared data folder. */
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';

export interface RunningServer {
  base: string;
  pid: number;
  stop(): Promise<void>;
}

export async function startServer(dataDir: string, opts: { webDir?: string; profileDir?: string } = {}): Promise<RunningServer> {
  const args = opts.profileDir ? ['--cpu-prof', `--cpu-prof-dir=${opts.profileDir}`] : [];
  const child: ChildProcess = spawn(process.execPath, [...args, path.join('build', 'server', 'index.js')], {
    env: {
      ...process.env,
      PORT: '0',
      HOST: '127.0.0.1',
      DATA_DIR: dataDir,
      SMTP_PORT: '0',
      SEED_DEMO: 'false',
      LOG_REQUESTS: 'false',
      // The scheduler would add escalation work in the middle of a measurement.
      ESCALATION_INTERVAL_SECONDS: '3600',
      NODE_ENV: 'production',
      // The bench's unit and accounts are invented (@warmfold.test), which production refuses.
      WARMFOLD_MODE: 'demo',
      // bench/auth.ts sends each reset request from its own X-Forwarded-For address.
      TRUST_PROXY: 'loopback',
      ...(opts.webDir ? { WEB_DIR: opts.webDir } : {}),
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  const base = await new Promise<string>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`the server did not start within 60 s:\n${output}`)), 60_000);
    child.stdout!.on('data', (chunk: Buffer) => {
      output += chunk.toString();
      const match = /running at http:\/\/localhost:(\d+)/.exec(output);
      if (match) {
        clearTimeout(timer);
        resolve(`http://127.0.0.1:${match[1]}`);
      }
    });
    child.stderr!.on('data', (chunk: Buffer) => (output += chunk.toString()));
    child.on('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`the server exited with ${code}:\n${output}`));
    });
  });
  return {
    base,
    pid: child.pid!,
    stop: () =>
      new Promise<void>((resolve) => {
        if (child.exitCode !== null) return resolve();
        child.removeAllListeners('exit');
        child.on('exit', () => resolve());
        // SIGTERM lets the server close cleanly, which is also when --cpu-prof writes its file.
        child.kill('SIGTERM');
      }),
  };
}

export async function signIn(base: string, email: string, password: string): Promise<string> {
  const res = await fetch(`${base}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password }),
  });
  if (!res.ok) throw new Error(`sign-in as ${email} answered ${res.status}: ${await res.text()}`);
  return ((await res.json()) as { token: string }).token;
}

/** Wait until the server answers `url` brotli-compressed: it compresses each file once, at boot. */
export async function untilCompressed(url: string, deadline: number): Promise<void> {
  for (;;) {
    const res = await fetch(url, { method: 'HEAD', headers: { 'accept-encoding': 'br, gzip' } });
    const encoding = res.headers.get('content-encoding');
    // Anything the server does not precompress (small files, images) is as ready as it gets.
    if (!res.ok || encoding === 'br' || encoding === null) return;
    if (Date.now() > deadline) throw new Error(`${url} still not brotli-compressed after the warm-up`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

/**
 * Wait until the server has compressed its whole web build (it does at start-up, brotli at
 * quality 11 on libuv's thread pool, tens of seconds on 2 loaded cores): measured reads that
 * overlap it measure the compression, not the API. A hospital's server has been up for days.
 */
export async function untilBuildCompressed(base: string, webDir: string, timeoutMs = 300_000): Promise<void> {
  // No web build copied (none was built): nothing to compress.
  if (!fs.existsSync(webDir)) return;
  const deadline = Date.now() + timeoutMs;
  const files: string[] = [];
  const walk = (rel: string) => {
    for (const d of fs.readdirSync(path.join(webDir, rel), { withFileTypes: true })) {
      const r = rel ? `${rel}/${d.name}` : d.name;
      if (d.isDirectory()) walk(r);
      else if (/\.(js|html)$/.test(d.name)) files.push(r);
    }
  };
  walk('');
  for (const rel of files) await untilCompressed(`${base}/${rel.split('/').map(encodeURIComponent).join('/')}`, deadline);
}
