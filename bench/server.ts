/** Starts the production build (build/server/index.js) on a free port against a prepared data folder. */
import { spawn, type ChildProcess } from 'node:child_process';
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
