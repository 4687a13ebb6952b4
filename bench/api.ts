/**
 * Read throughput: the board, one infant's 72-hour flowsheet and the bare /api/ping route, in the
 * same server process and the same run, so the ratio to the baseline cancels out the machine.
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
  seconds: number;
  warmupSeconds: number;
}

/**
 * autocannon stops sending at the end of a window, but the server still owes answers to the
 * requests in flight; one request sent afterwards comes back only when that queue has drained,
 * so the next window does not start behind the last one's backlog.
 */
async function drained(url: string, headers: Record<string, string>): Promise<void> {
  await fetch(url, { headers }).then((r) => r.arrayBuffer());
}

function figures(name: string, path: string, r: Result): LoadFigures {
  return {
    name,
    path,
    reqPerSec: r.requests.average,
    p50: r.latency.p50,
    p975: r.latency.p97_5,
    p99: r.latency.p99,
    requests: r.requests.total,
    errors: r.errors + r.timeouts,
    non2xx: r.non2xx,
    ratioToBaseline: null,
  };
}

export async function measure(base: string, path: string, headers: Record<string, string>, opts: LoadOptions, extra: Partial<Parameters<typeof autocannon>[0]> = {}): Promise<Result> {
  const common = { url: `${base}${path}`, connections: opts.connections, headers, timeout: 30, ...extra };
  if (opts.warmupSeconds > 0) await autocannon({ ...common, duration: opts.warmupSeconds });
  await drained(common.url, headers);
  const result = await autocannon({ ...common, duration: opts.seconds });
  await drained(common.url, headers);
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
  for (const [path, token] of [[targets.boardPath, targets.chargeToken], [targets.flowsheetPath, targets.nurseToken]] as const) {
    const res = await fetch(`${base}${path}`, { headers: { authorization: `Bearer ${token}` } });
    if (!res.ok) throw new Error(`GET ${path} answered ${res.status}: ${(await res.text()).slice(0, 300)}`);
  }
  const ping = figures('baseline /api/ping', '/api/ping', await measure(base, '/api/ping', AS_A_BROWSER, opts));
  const board = figures('unit board', targets.boardPath, await measure(base, targets.boardPath, { ...AS_A_BROWSER, authorization: `Bearer ${targets.chargeToken}` }, opts));
  const flowsheet = figures('72-h flowsheet', targets.flowsheetPath, await measure(base, targets.flowsheetPath, { ...AS_A_BROWSER, authorization: `Bearer ${targets.nurseToken}` }, opts));
  for (const f of [board, flowsheet]) f.ratioToBaseline = ping.reqPerSec > 0 ? f.reqPerSec / ping.reqPerSec : null;
  return [ping, board, flowsheet];
}
