#!/usr/bin/env node
// `npm run test:e2e`: build if needed, start the real product on a fresh seeded database and a
// free port, run the Chromium stories in tests/e2e with node's test runner, then stop it.
import { spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';

const root = process.cwd();
const env = { ...process.env, EXPO_NO_TELEMETRY: '1' };

function freePort() {
  return new Promise((resolve) => {
    const srv = net.createServer();
    srv.listen(0, '127.0.0.1', () => {
      const { port } = srv.address();
      srv.close(() => resolve(port));
    });
  });
}

function must(label, cmd, args) {
  const r = spawnSync(cmd, args, { stdio: 'inherit', env });
  if (r.status !== 0) {
    process.stderr.write(`${label} failed\n`);
    process.exit(r.status ?? 1);
  }
}

if (!process.argv.includes('--no-build')) {
  must('web build', 'npx', ['expo', 'export', '--platform', 'web', '--output-dir', 'dist']);
  must('service worker', 'npx', ['tsx', 'scripts/service-worker.ts', 'dist']);
  must('server build', 'npx', ['tsc', '-p', 'tsconfig.server.json']);
}

const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'warmfold-e2e-'));
const port = await freePort();
const smtpPort = await freePort();
const artifacts = path.join(root, 'tests', 'e2e', 'artifacts');
fs.mkdirSync(artifacts, { recursive: true });
const serverLog = fs.createWriteStream(path.join(artifacts, 'server.log'));
const server = spawn('node', [path.join('build', 'server', 'index.js')], {
  env: { ...env, PORT: String(port), HOST: '127.0.0.1', DATA_DIR: dataDir, SMTP_PORT: String(smtpPort), LOG_REQUESTS: 'true' },
  stdio: ['ignore', 'pipe', 'pipe'],
});
server.stdout.pipe(serverLog);
server.stderr.pipe(serverLog);

const base = `http://127.0.0.1:${port}`;
const started = Date.now();
for (;;) {
  try {
    const res = await fetch(`${base}/api/health`);
    if (res.ok) break;
  } catch {
    // not up yet
  }
  if (Date.now() - started > 60_000 || server.exitCode !== null) {
    process.stderr.write('The server did not start; see tests/e2e/artifacts/server.log\n');
    server.kill('SIGKILL');
    process.exit(1);
  }
  await new Promise((r) => setTimeout(r, 250));
}

const files = fs
  .readdirSync(path.join(root, 'tests', 'e2e'))
  .filter((f) => f.endsWith('.e2e.ts'))
  // E2E_ONLY=board runs the files whose names hold "board"; a comma list runs several (in order).
  .filter((f) => !process.env.E2E_ONLY || process.env.E2E_ONLY.split(',').some((part) => f.includes(part.trim())))
  .map((f) => path.join('tests', 'e2e', f));
const run = spawnSync('node', ['--import', 'tsx', '--test', '--test-concurrency=1', '--test-reporter=spec', ...files], {
  stdio: 'inherit',
  env: { ...env, BASE_URL: base, E2E_DATA_DIR: dataDir, E2E_ARTIFACTS: artifacts },
});

server.kill('SIGTERM');
await new Promise((r) => server.once('exit', r));
fs.rmSync(dataDir, { recursive: true, force: true });
// The demo's audit key is generated beside the data folder, not in it.
fs.rmSync(`${dataDir}.audit-key`, { force: true });
process.exit(run.status ?? 1);
