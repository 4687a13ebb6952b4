/**
 * Read throughput: the board, one infant's 72-hour flowsheet and the bare /api/ping route, in the
 * same server process and the same run, so the ratio to the baseline cancels out the machine. The
 * measured time is cut into rounds that take the three routes in turn, so a slow spell of this
 * shared machine lands on all three rather than on whichever route was measured then.
 */
import autocannon, { type Result } from 'autocannon';

export interface LoadFigures {
  name: string;
  path: string;
  reqPerSec: number;
  p50: number;
  p975: number;
  p99: number;
  requests: number;
  errors: number;
  non2xx: number;
  ratioToBaseline: number | null;
}

export interface LoadOptions {
  connections: number;
  /** Measured seconds per route, over all rounds. */
  seconds: number;
  warmupSeconds: number;
  /** How many turns the measured time is cut into (1: each route measured in one go). */
  rounds: number;
}

/**
 * autocannon stops sending at the end of a window, but the server still owes answers to the
 * requests in flight; one request sent afterwards comes back only when that queue has drained,
 * so the next window does not start behind the last one's backlog.
 */
async function drained(url: string, headers: Record<string, string>): Promise<void> {
  await fetch(url, { headers }).then((r) => r.arrayBuffer());
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor((xs.length - 1) / 2)]!;

/**
 * One route's figures over its rounds: req/s is all its answers over all its measured time; p50
 * is the median of the rounds' p50s and the tails are the worst round's (autocannon reports
 * percentiles, not the histograms that would merge exactly).
 */
function figures(name: string, path: string, rounds: Result[]): LoadFigures {
  const requests = rounds.reduce((n, r) => n + r.requests.total, 0);
  const seconds = rounds.reduce((n, r) => n + r.duration, 0);
  return {
    name,
    path,
    reqPerSec: seconds > 0 ? requests / seconds : 0,
    p50: median(rounds.map((r) => r.latency.p50)),
    p975: Math.max(...rounds.map((r) => r.latency.p97_5)),
    p99: Math.max(...rounds.map((r) => r.latency.p99)),
    requests,
    errors: rounds.reduce((n, r) => n + r.errors + r.timeouts, 0),
    non2xx: rounds.reduce((n, r) => n + r.non2xx, 0),
    ratioToBaseline: null,
  };
}

/** One window of load on one route, answered in full before the next window starts. */
async function loadWindow(base: string, path: string, headers: Record<string, string>, connections: number, seconds: number): Promise<Result> {
  const url = `${base}${path}`;
  const result = await autocannon({ url, connections, headers, timeout: 30, duration: seconds });
  await drained(url, headers);
  return result;
}

/**
 * Every request asks for compression as the browsers on the ward do (Chromium's header), the
 * baseline's included; the board and flowsheet answer with their cached compressed bytes.
 */
const AS_A_BROWSER = { 'accept-encoding': 'gzip, deflate, br, zstd' };

export async function benchReads(
  base: string,
  targets: { boardPath: string; flowsheetPath: string; chargeToken: string; nurseToken: string },
  opts: LoadOptions,
): Promise<LoadFigures[]> {
  // One plain request first: a 401 or 500 would otherwise show up only as a silent zero.
  for (const [path, token] of [
    [targets.boardPath, targets.chargeToken],
    [targets.flowsheetPath, targets.nurseToken],
  ] as const) {
    const res = await fetch(`${base}${path}`, { headers: { authorization: `Bearer ${token}` } });
    if (!res.ok) throw new Error(`GET ${path} answered ${res.status}: ${(await res.text()).slice(0, 300)}`);
  }
  const routes = [
    { name: 'baseline /api/ping', path: '/api/ping', headers: AS_A_BROWSER },
    { name: 'unit board', path: targets.boardPath, headers: { ...AS_A_BROWSER, authorization: `Bearer ${targets.chargeToken}` } },
    { name: '72-h flowsheet', path: targets.flowsheetPath, headers: { ...AS_A_BROWSER, authorization: `Bearer ${targets.nurseToken}` } },
  ];
  if (opts.warmupSeconds > 0) for (const r of routes) await loadWindow(base, r.path, r.headers, opts.connections, opts.warmupSeconds);
  const windows = routes.map(() => [] as Result[]);
  for (let round = 0; round < opts.rounds; round++) {
    for (const [i, r] of routes.entries()) windows[i]!.push(await loadWindow(base, r.path, r.headers, opts.connections, opts.seconds / opts.rounds));
  }
  const [ping, board, flowsheet] = routes.map((r, i) => figures(r.name, r.path, windows[i]!)) as [LoadFigures, LoadFigures, LoadFigures];
  for (const f of [board, flowsheet]) f.ratioToBaseline = ping.reqPerSec > 0 ? f.reqPerSec / ping.reqPerSec : null;
  return [ping, board, flowsheet];
}
