#!/usr/bin/env node
// `npm start`: build what is missing or stale (web app, server), then run the product on one port.
import { spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';

const root = process.cwd();
const env = { ...process.env, EXPO_NO_TELEMETRY: '1' };

function newest(dirs) {
  let latest = 0;
  const walk = (p) => {
    if (!fs.existsSync(p)) return;
    const st = fs.statSync(p);
    if (st.isDirectory()) {
      for (const name of fs.readdirSync(p)) if (name !== 'node_modules') walk(path.join(p, name));
    } else latest = Math.max(latest, st.mtimeMs);
  };
  dirs.forEach((d) => walk(path.join(root, d)));
  return latest;
}

function mtime(file) {
  return fs.existsSync(file) ? fs.statSync(file).mtimeMs : 0;
}

function run(label, cmd, args) {
  process.stdout.write(`${label}…\n`);
  const result = spawnSync(cmd, args, { stdio: 'inherit', env });
  if (result.status !== 0) {
    process.stderr.write(`${label} failed.\n`);
    process.exit(result.status ?? 1);
  }
}

const webSources = newest(['app', 'components', 'shared', 'assets']);
const webConfig = Math.max(mtime(path.join(root, 'app.json')), mtime(path.join(root, 'metro.config.js')), mtime(path.join(root, 'babel.config.js')));
if (mtime(path.join(root, 'dist', 'index.html')) < Math.max(webSources, webConfig)) {
  run('Building the web app (about two minutes the first time)', 'npx', ['expo', 'export', '--platform', 'web', '--output-dir', 'dist']);
}
const serverSources = newest(['server', 'db', 'shared']);
if (mtime(path.join(root, 'build', 'server', 'index.js')) < serverSources) {
  run('Building the server', 'npx', ['tsc', '-p', 'tsconfig.server.json']);
}

const child = spawn('node', [path.join('build', 'server', 'index.js')], { stdio: 'inherit', env });
for (const signal of ['SIGTERM', 'SIGINT']) process.on(signal, () => child.kill(signal));
child.on('exit', (code, signal) => process.exit(code ?? (signal ? 0 : 1)));
