/** Budgets, percentiles and the printed table. */
import type { LoadFigures } from './api';
import type { AuthFigures } from './auth';
import type { BundleFigures, Sizes } from './bundle';
import type { RulesFigures } from './rules';
import type { VitalsRun } from './vitals';
import type { WriteFigures } from './writes';

export interface Budget {
  name: string;
  value: number | null;
  limit: string;
  pass: boolean;
  shown: string;
}

export interface Spread {
  median: number | null;
  p75: number | null;
  values: number[];
}

/** Nearest-rank percentile: with 5 runs the median is the 3rd and the p75 the 4th value. */
export function spread(values: (number | null)[]): Spread {
  const v = values.filter((x): x is number => x !== null && Number.isFinite(x)).sort((a, b) => a - b);
  const rank = (p: number) => (v.length ? v[Math.max(0, Math.ceil(p * v.length) - 1)]! : null);
  return { median: rank(0.5), p75: rank(0.75), values: v };
}

export interface VitalsSummary {
  runs: number;
  signIn: { lcp: Spread; cls: Spread };
  myInfants: { lcp: Spread; cls: Spread };
  flowsheet: { lcp: Spread; cls: Spread };
  inp: Spread;
}

export function summariseVitals(runs: VitalsRun[]): VitalsSummary {
  const page = (k: 'signIn' | 'myInfants' | 'flowsheet') => ({ lcp: spread(runs.map((r) => r[k].lcp)), cls: spread(runs.map((r) => r[k].cls)) });
  return { runs: runs.length, signIn: page('signIn'), myInfants: page('myInfants'), flowsheet: page('flowsheet'), inp: spread(runs.map((r) => r.inp)) };
}

const KiB = 1024;
export const kib = (bytes: number) => `${(bytes / KiB).toFixed(1)} KiB`;
const ms = (v: number | null) => (v === null ? 'n/a' : `${Math.round(v)} ms`);
const num = (v: number, d = 0) => v.toLocaleString('en-GB', { maximumFractionDigits: d, minimumFractionDigits: d });

export interface RouteJs {
  route: string;
  sizes: Sizes;
  scripts: string[];
}

export function budgets(input: { api?: LoadFigures[]; writes?: WriteFigures; routes?: RouteJs[]; vitals?: VitalsSummary; auth?: AuthFigures }): Budget[] {
  const out: Budget[] = [];
  for (const f of input.api?.slice(1) ?? []) {
    const ratio = f.ratioToBaseline;
    out.push({
      name: `${f.name} req/s vs baseline`,
      value: ratio,
      limit: '≥ 50 %',
      pass: ratio !== null && ratio >= 0.5 && f.non2xx === 0 && f.errors === 0,
      shown: ratio === null ? 'n/a' : `${(ratio * 100).toFixed(1)} %`,
    });
  }
  for (const r of input.routes ?? []) {
    out.push({ name: `initial JS, ${r.route}`, value: r.sizes.gzip, limit: '≤ 300 KiB gzip', pass: r.sizes.gzip <= 300 * KiB, shown: `${kib(r.sizes.gzip)} gzip` });
  }
  if (input.vitals) {
    const v = input.vitals;
    for (const [label, page] of [
      ['sign-in', v.signIn],
      ['My infants', v.myInfants],
      ['flowsheet', v.flowsheet],
    ] as const) {
      out.push({ name: `LCP p75, ${label}`, value: page.lcp.p75, limit: '≤ 2,500 ms', pass: page.lcp.p75 !== null && page.lcp.p75 <= 2500, shown: ms(page.lcp.p75) });
      out.push({
        name: `CLS p75, ${label}`,
        value: page.cls.p75,
        limit: '≤ 0.1',
        pass: page.cls.p75 !== null && page.cls.p75 <= 0.1,
        shown: page.cls.p75 === null ? 'n/a' : page.cls.p75.toFixed(3),
      });
    }
    out.push({ name: 'INP p75, record a reading', value: v.inp.p75, limit: '≤ 200 ms', pass: v.inp.p75 !== null && v.inp.p75 <= 200, shown: ms(v.inp.p75) });
  }
  if (input.writes) {
    const w = input.writes;
    out.push({
      name: 'durable writes',
      value: w.commitsPerSec,
      limit: '≥ 200 /s',
      pass: w.commitsPerSec >= 200 && w.non2xx === 0 && w.errors === 0,
      shown: `${num(w.commitsPerSec)} /s`,
    });
  }
  if (input.auth) {
    const a = input.auth;
    const gap = Math.abs(a.reset.knownMedian - a.reset.unknownMedian);
    out.push({ name: 'reset request, known vs unknown (median gap)', value: gap, limit: '≤ 5 ms', pass: gap <= 5 && a.reset.non202 === 0, shown: `${gap.toFixed(1)} ms` });
    out.push({
      name: '/api/ping p99 during 10 sign-ins',
      value: a.ping.duringP99,
      limit: '≤ 20 ms',
      pass: a.ping.duringP99 <= 20 && a.ping.signInFailures === 0,
      shown: `${a.ping.duringP99.toFixed(1)} ms`,
    });
  }
  return out;
}

function table(rows: string[][]): string {
  const widths = rows[0]!.map((_, i) => Math.max(...rows.map((r) => (r[i] ?? '').length)));
  return rows.map((r) => r.map((c, i) => (i === 0 ? c.padEnd(widths[i]!) : c.padStart(widths[i]!))).join('  ')).join('\n');
}

export function printReport(
  r: {
    api?: LoadFigures[];
    writes?: WriteFigures;
    rules?: RulesFigures;
    bundle?: BundleFigures;
    routes?: RouteJs[];
    vitals?: VitalsSummary;
    auth?: AuthFigures;
    budgets: Budget[];
  },
  log: (line: string) => void,
): void {
  if (r.auth) {
    const { reset, ping } = r.auth;
    const f = (v: number) => `${v.toFixed(1)} ms`;
    log('\nAccounts (reset requests alternating known and unknown addresses; /api/ping one at a time)');
    log(
      table([
        ['reset request', 'median', 'p95', 'non-202'],
        ['known address', f(reset.knownMedian), f(reset.knownP95), String(reset.non202)],
        ['unknown address', f(reset.unknownMedian), f(reset.unknownP95), ''],
      ]),
    );
    log(
      table([
        ['/api/ping', 'p50', 'p99', 'sign-ins'],
        ['idle', f(ping.idleP50), f(ping.idleP99), '0'],
        ['10 parallel sign-ins', f(ping.duringP50), f(ping.duringP99), `${ping.signIns} (${ping.signInFailures} failed)`],
      ]),
    );
  }
  if (r.api) {
    log('\nAPI (autocannon)');
    log(
      table([
        ['endpoint', 'req/s', 'p50', 'p97.5', 'p99', 'vs baseline', 'non-2xx'],
        ...r.api.map((f) => [
          f.name,
          num(f.reqPerSec),
          `${f.p50} ms`,
          `${f.p975} ms`,
          `${f.p99} ms`,
          f.ratioToBaseline === null ? '—' : `${(f.ratioToBaseline * 100).toFixed(1)} %`,
          String(f.non2xx + f.errors),
        ]),
      ]),
    );
  }
  if (r.writes) {
    log('\nDurable writes (POST a reading, synchronous=FULL)');
    log(
      table([
        ['commits/s', 'p50', 'p99', 'non-2xx'],
        [num(r.writes.commitsPerSec), `${r.writes.p50} ms`, `${r.writes.p99} ms`, String(r.writes.non2xx + r.writes.errors)],
      ]),
    );
  }
  if (r.rules) {
    log('\nRules (evaluateInfant over the whole stay)');
    log(
      table([
        ['infants', 'readings', 'total (best)', 'total (median)', 'per infant'],
        [String(r.rules.infants), num(r.rules.readings), `${r.rules.totalMs.toFixed(1)} ms`, `${r.rules.medianMs.toFixed(1)} ms`, `${r.rules.perInfantMs.toFixed(2)} ms`],
      ]),
    );
  }
  if (r.bundle) {
    const b = r.bundle;
    log('\nWeb build (dist/)');
    const row = (name: string, s: Sizes, files?: number) => [name, files === undefined ? '' : String(files), kib(s.raw), kib(s.gzip), kib(s.brotli)];
    log(
      table([
        ['', 'files', 'raw', 'gzip', 'brotli'],
        row('all JavaScript', b.js, b.js.files),
        row('entry (index.html)', b.entry, b.entry.files.length),
        ...(r.routes ?? []).map((x) => row(`initial JS ${x.route}`, x.sizes, x.scripts.length)),
        row('CSS', b.css, b.css.files),
        row('fonts', b.fonts, b.fonts.files),
        row('other assets', b.assets, b.assets.files),
        row('HTML', b.html),
      ]),
    );
  }
  if (r.vitals) {
    const v = r.vitals;
    log(`\nCore Web Vitals (Chromium, mobile settings, ${v.runs} run${v.runs === 1 ? '' : 's'})`);
    const cls = (x: number | null) => (x === null ? 'n/a' : x.toFixed(3));
    log(
      table([
        ['page', 'LCP median', 'LCP p75', 'CLS median', 'CLS p75'],
        ...(
          [
            ['sign-in', v.signIn],
            ['My infants', v.myInfants],
            ['flowsheet', v.flowsheet],
          ] as const
        ).map(([n, p]) => [n, ms(p.lcp.median), ms(p.lcp.p75), cls(p.cls.median), cls(p.cls.p75)]),
        ['record a reading (INP)', ms(v.inp.median), ms(v.inp.p75), '', ''],
      ]),
    );
  }
  log('\nBudgets');
  log(table([['budget', 'measured', 'limit', ''], ...r.budgets.map((b) => [b.name, b.shown, b.limit, b.pass ? 'PASS' : 'FAIL'])]));
}
