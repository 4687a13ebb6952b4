/**
 * `npm run bench`: seed a large synthetic unit, start the production server on it and measure
 * reads against a bare route, durable writes, the rules, the web build and Core Web Vitals in
 * Chromium; print a table with the budgets and write bench/results/latest.json.
 *
 *   --smoke     small data, ~2 s load windows, one browser run; budgets are printed, never fatal
 *   --skip=a,b  leave out parts: api, writes, rules, bundle, vitals, auth
 *   --profile   record a CPU profile of the server during the API runs and summarise it
 *   --rebuild   rebuild dist/ and build/server even if they exist
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { benchReads, type LoadFigures } from './api';
import { benchAuth, type AuthFigures } from './auth';
import { analyseBundle, scriptsSize, type BundleFigures } from './bundle';
import { summariseProfile, type HotSpot } from './profile';
import { budgets, printReport, summariseVitals, type RouteJs, type VitalsSummary } from './report';
import { benchRules, type RulesFigures } from './rules';
import { BENCH_PASSWORD, CHARGE_EMAIL, NURSE_EMAIL, seedLargeUnit, type SeededUnit } from './seed-large';
import { signIn, startServer, untilBuildCompressed } from './server';
import { benchVitals, MOBILE } from './vitals';
import { benchWrites, type WriteFigures } from './writes';

const argv = process.argv.slice(2);
const smoke = argv.includes('--smoke');
const profile = argv.includes('--profile');
const skip = new Set((argv.find((a) => a.startsWith('--skip='))?.slice(7) ?? '').split(',').filter(Boolean));
const log = (line: string) => process.stdout.write(`${line}\n`);

const SETTINGS = smoke
  ? {
      infants: 12,
      days: 2,
      nurseInfants: 4,
      connections: 50,
      seconds: 2,
      warmup: 1,
      readRounds: 1,
      writeSeconds: 2,
      vitalsRuns: 1,
      rulesRounds: 3,
      authSeconds: 2,
      resetRounds: 10,
    }
  : {
      infants: 60,
      days: 14,
      nurseInfants: 6,
      connections: 50,
      seconds: 20,
      warmup: 5,
      readRounds: 4,
      writeSeconds: 20,
      vitalsRuns: 5,
      rulesRounds: 10,
      authSeconds: 10,
      resetRounds: 30,
    };
// Ten nurses saving at once is a busy unit; more connections only queue behind the one writer.
const WRITE_CONNECTIONS = 10;

function ensureBuilt(): void {
  const env = { ...process.env, EXPO_NO_TELEMETRY: '1' };
  const rebuild = argv.includes('--rebuild');
  const run = (label: string, args: string[]) => {
    log(`Building ${label}: npx ${args.join(' ')}`);
    const r = spawnSync('npx', args, { stdio: 'inherit', env });
    if (r.status !== 0) throw new Error(`${label} build failed`);
  };
  // Only the bundle and Web Vitals parts read the web build (--skip=bundle,vitals leaves it alone).
  const needWeb = !skip.has('bundle') || !skip.has('vitals');
  if (needWeb && (rebuild || !fs.existsSync(path.join('dist', 'index.html')))) run('the web app', ['expo', 'export', '--platform', 'web', '--output-dir', 'dist']);
  if (rebuild || !fs.existsSync(path.join('build', 'server', 'index.js'))) run('the server', ['tsc', '-p', 'tsconfig.server.json']);
}

function chromiumPath(): string | null {
  const p = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
  return fs.existsSync(p) ? p : null;
}

async function main(): Promise<number> {
  const started = performance.now();
  ensureBuilt();
  const work = fs.mkdtempSync(path.join(os.tmpdir(), 'warmfold-bench-'));
  const dataDir = path.join(work, 'data');
  const profileDir = path.join(work, 'profile');
  // A private copy of the web build: another checkout step (or a colleague's e2e run) may be
  // re-exporting dist/ while the browser is loading it.
  const webDir = path.join(work, 'web');
  if (fs.existsSync(path.join('dist', 'index.html'))) fs.cpSync('dist', webDir, { recursive: true });
  log(`Warmfold bench (${smoke ? 'smoke' : 'full'}): ${os.cpus().length} cores, Node ${process.version}`);

  let seed: SeededUnit | undefined;
  let api: LoadFigures[] | undefined;
  let writes: WriteFigures | undefined;
  let rules: RulesFigures | undefined;
  let bundle: BundleFigures | undefined;
  let routes: RouteJs[] | undefined;
  let vitals: VitalsSummary | undefined;
  let auth: AuthFigures | undefined;
  let hotSpots: HotSpot[] | undefined;
  const notes: string[] = [];

  try {
    const dbFile = path.join(dataDir, 'warmfold.db');
    seed = await seedLargeUnit(dbFile, { infants: SETTINGS.infants, days: SETTINGS.days, nurseInfants: SETTINGS.nurseInfants });
    log(`Seeded ${seed.infantIds.length} infants, ${seed.readings.toLocaleString('en-GB')} readings, ${seed.flags} flags, ${seed.actions} actions in ${seed.seconds.toFixed(1)} s`);

    if (!skip.has('rules')) {
      rules = benchRules(dbFile, seed.unitId, seed.infantIds, SETTINGS.rulesRounds);
      log(`Rules: ${rules.totalMs.toFixed(1)} ms for ${rules.infants} infants`);
    }

    if (!skip.has('bundle')) bundle = analyseBundle(webDir);

    const needServer = !skip.has('api') || !skip.has('writes') || !skip.has('vitals') || !skip.has('auth');
    if (needServer) {
      const server = await startServer(dataDir, { webDir, profileDir: profile ? profileDir : undefined });
      log(`Server (build/server/index.js) at ${server.base}, pid ${server.pid}`);
      try {
        const chargeToken = await signIn(server.base, CHARGE_EMAIL, BENCH_PASSWORD);
        const nurseToken = await signIn(server.base, NURSE_EMAIL, BENCH_PASSWORD);
        const flowsheetInfant = seed.nurseInfantIds[0]!;
        // Nothing is measured while the server compresses the web build at start-up: it takes both
        // cores for a second or two (a writes-only run measured a quarter of its rate meanwhile).
        const waited = performance.now();
        await untilBuildCompressed(server.base, webDir);
        log(`Server finished compressing the web build (${((performance.now() - waited) / 1000).toFixed(1)} s after start-up)`);
        if (!skip.has('api')) {
          log(
            `Reads: ${SETTINGS.warmup} s warm-up, then ${SETTINGS.seconds} s at ${SETTINGS.connections} connections each, in ${SETTINGS.readRounds} round(s) that take the routes in turn`,
          );
          api = await benchReads(
            server.base,
            { boardPath: `/api/units/${seed.unitId}/board`, flowsheetPath: `/api/infants/${flowsheetInfant}/flowsheet?hours=72`, chargeToken, nurseToken },
            { connections: SETTINGS.connections, seconds: SETTINGS.seconds, warmupSeconds: SETTINGS.warmup, rounds: SETTINGS.readRounds },
          );
        }
        if (!skip.has('vitals')) {
          const exe = chromiumPath();
          if (!exe) notes.push('Core Web Vitals skipped: no Chromium (set CHROMIUM_PATH).');
          else {
            log(
              `Core Web Vitals: ${SETTINGS.vitalsRuns} run(s), ${MOBILE.width}x${MOBILE.height} DPR ${MOBILE.deviceScaleFactor}, ${MOBILE.latencyMs} ms RTT, 1.6 Mbps, CPU x${MOBILE.cpuSlowdown}`,
            );
            const name = (await (await fetch(`${server.base}/api/infants/${flowsheetInfant}`, { headers: { authorization: `Bearer ${nurseToken}` } })).json()) as {
              infant: { displayName: string };
            };
            const runs = await benchVitals(
              {
                base: server.base,
                runs: SETTINGS.vitalsRuns,
                email: NURSE_EMAIL,
                password: BENCH_PASSWORD,
                infantId: flowsheetInfant,
                infantName: name.infant.displayName,
                executablePath: exe,
              },
              log,
            );
            vitals = summariseVitals(runs);
            const last = runs[runs.length - 1]!;
            routes = (
              [
                ['/sign-in', last.signIn.scripts],
                ['/infants (My infants)', last.myInfants.scripts],
                ['/infants/:id (flowsheet)', last.flowsheet.scripts],
              ] as const
            ).map(([route, scripts]) => ({ route, scripts: [...scripts], sizes: scriptsSize(webDir, [...scripts]) }));
          }
        }
        if (!skip.has('auth')) {
          log(`Accounts: ${SETTINGS.resetRounds} reset requests each for known and unknown addresses, then /api/ping during 10 parallel sign-ins for ${SETTINGS.authSeconds} s`);
          const knownEmails = [NURSE_EMAIL, CHARGE_EMAIL, ...Array.from({ length: 9 }, (_, i) => `bench.nurse${i + 1}@warmfold.test`)];
          auth = await benchAuth(server.base, { email: NURSE_EMAIL, password: BENCH_PASSWORD, knownEmails, seconds: SETTINGS.authSeconds, resetRounds: SETTINGS.resetRounds });
        }
        // Writes last: they add readings, which would change what the reads and pages measure.
        if (!skip.has('writes')) {
          log(`Writes: ${SETTINGS.writeSeconds} s at ${WRITE_CONNECTIONS} connections`);
          writes = await benchWrites(server.base, seed.nurseInfantIds, nurseToken, { connections: WRITE_CONNECTIONS, seconds: SETTINGS.writeSeconds });
        }
      } finally {
        await server.stop();
      }
      if (profile) hotSpots = summariseProfile(profileDir);
    }
    if (!routes && bundle) {
      notes.push('Initial JS per route taken from index.html (no browser run): split chunks a route loads are not counted.');
      routes = [{ route: 'entry (every route)', scripts: bundle.entry.files, sizes: bundle.entry }];
    }
  } finally {
    fs.rmSync(work, { recursive: true, force: true });
  }

  const list = budgets({ api, writes, routes, vitals, auth });
  printReport({ api, writes, rules, bundle, routes, vitals, auth, budgets: list }, log);
  if (hotSpots?.length) {
    log('\nServer CPU profile (self time, top functions)');
    for (const h of hotSpots) log(`  ${h.selfPct.toFixed(1).padStart(5)} %  ${h.fn}  ${h.where}`);
  }
  for (const n of notes) log(`Note: ${n}`);

  const failed = list.filter((b) => !b.pass);
  const results = {
    mode: smoke ? 'smoke' : 'full',
    at: new Date().toISOString(),
    machine: { cores: os.cpus().length, cpu: os.cpus()[0]?.model ?? 'unknown', node: process.version, platform: `${os.platform()} ${os.arch()}` },
    settings: { ...SETTINGS, writeConnections: WRITE_CONNECTIONS, mobile: MOBILE },
    seed: seed ? { ...seed, infantIds: seed.infantIds.length } : null,
    api,
    writes,
    rules,
    bundle,
    routes,
    vitals,
    auth,
    hotSpots,
    budgets: list,
    notes,
    seconds: (performance.now() - started) / 1000,
  };
  fs.mkdirSync(path.join('bench', 'results'), { recursive: true });
  fs.writeFileSync(path.join('bench', 'results', 'latest.json'), `${JSON.stringify(results, null, 2)}\n`);
  log(`\n${list.length - failed.length}/${list.length} budgets pass; figures in bench/results/latest.json (${results.seconds.toFixed(0)} s)`);
  if (failed.length && smoke) log('Smoke mode: budgets are reported, not enforced.');
  return failed.length && !smoke ? 1 : 0;
}

main().then(
  (code) => process.exit(code),
  (err: unknown) => {
    process.stderr.write(`bench failed: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}\n`);
    process.exit(2);
  },
);
