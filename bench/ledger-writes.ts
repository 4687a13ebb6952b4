/**
 * `npx tsx bench/ledger-writes.ts [seconds]`: what the row ledger (server/ledger.ts) costs the
 * durable-writes budget (≥ 200 commits/s). The same POST /readings load as `npm run bench`
 * (bench/writes.ts: 10 connections, a new reading each request, synchronous=FULL), against the app
 * in this process on a fresh demo database, first with the ledger's triggers, then without them.
 * Needs no build; the figure is for comparing the two rounds, `npm run bench` stays the reference.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import { openDatabase } from '../db/client';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../db/seed';
import { seedDemo } from '../server/demo-seed';
import { createApp } from '../server/app';
import { systemClock } from '../server/clock';
import { testConfig } from '../server/config';
import { verifyRecord } from '../server/record-verify';
import { benchWrites } from './writes';

async function main() {
  const seconds = Number(process.argv[2] ?? 10);
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'warmfold-ledger-bench-'));
  const database = openDatabase(path.join(dir, 'bench.db'));
  await seedDemo(database, { now: new Date(), bcryptCost: 10 });
  const app = createApp({ db: database, mailer: { send: async () => {}, close: () => {} }, clock: systemClock, config: testConfig({ dataDir: dir }), log: () => {} });
  const server = app.listen(0, '127.0.0.1');
  await new Promise((resolve) => server.once('listening', resolve));
  const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const nurse = DEMO_ACCOUNTS.find((a) => a.role === 'nurse')!;
  const res = await fetch(`${base}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: nurse.email, password: DEMO_PASSWORD }),
  });
  const { token } = (await res.json()) as { token: string };
  const infants = (database.sqlite.prepare('SELECT DISTINCT infant_id AS id FROM assignments WHERE nurse_id = ?').all(nurse.id) as { id: string }[]).map((r) => r.id);

  // The ledger's CPU cost alone: 5,000 rows in one transaction (one fsync), with and without it.
  const cpu = () => {
    const insert = database.sqlite.prepare("INSERT INTO beds (id, unit_id, label, sort_order, active) VALUES (?, 'unit-north', ?, 0, 1)");
    const start = performance.now();
    database.sqlite
      .transaction(() => {
        for (let i = 0; i < 5000; i++) insert.run(`bench-${process.hrtime.bigint()}-${i}`, `B${process.hrtime.bigint()}-${i}`);
      })
      .immediate();
    return ((performance.now() - start) * 1000) / 5000;
  };
  const cpuWith = cpu();

  const withLedger = await benchWrites(base, infants, token, { connections: 10, seconds });
  const t0 = performance.now();
  const report = verifyRecord(database.sqlite);
  const verifyMs = performance.now() - t0;
  const triggers = database.sqlite.prepare("SELECT name FROM sqlite_temp_master WHERE type = 'trigger' AND name LIKE 'ledger_%'").all() as { name: string }[];
  for (const t of triggers) database.sqlite.exec(`DROP TRIGGER temp.${t.name}`);
  const without = await benchWrites(base, infants, token, { connections: 10, seconds });
  const cpuWithout = cpu();

  const line = (name: string, w: typeof withLedger) =>
    `${name.padEnd(16)} ${w.commitsPerSec.toFixed(0).padStart(6)} commits/s   p50 ${w.p50} ms   p99 ${w.p99} ms   non-2xx ${w.non2xx + w.errors}`;
  process.stdout.write(`${line('with the ledger', withLedger)}\n${line('without it', without)}\n`);
  process.stdout.write(`one insert in a transaction: ${cpuWith.toFixed(1)} µs with the ledger, ${cpuWithout.toFixed(1)} µs without\n`);
  process.stdout.write(
    `audit:verify after the first round: ${report.ok ? 'intact' : 'BROKEN'}, ${report.events} events and ${report.rowsChecked} rows in ${verifyMs.toFixed(0)} ms\n`,
  );
  server.close();
  database.close();
  fs.rmSync(dir, { recursive: true, force: true });
}

main().catch((err: unknown) => {
  process.stderr.write(`${String(err)}\n`);
  process.exit(1);
});
