/**
 * The account edges, measured (never as timed tests): how long a password-reset request takes for
 * an address with an account and for one without (the answer must not tell them apart), and how
 * slow a bare route gets while ten people sign in at once (bcrypt runs in worker threads, so the
 * event loop should stay free).
 *
 * The bench server trusts loopback as a proxy (TRUST_PROXY in bench/server.ts), so each reset
 * request can come from its own X-Forwarded-For address and the per-address throttle does not
 * turn the measurement into 429s.
 */
import { performance } from 'node:perf_hooks';

export interface AuthFigures {
  reset: { knownMedian: number; unknownMedian: number; knownP95: number; unknownP95: number; samples: number; non202: number };
  ping: { idleP50: number; idleP99: number; duringP50: number; duringP99: number; samples: number; signIns: number; signInFailures: number };
}

const pct = (xs: number[], p: number) => {
  const v = [...xs].sort((a, b) => a - b);
  return v.length ? v[Math.max(0, Math.ceil(p * v.length) - 1)]! : Number.NaN;
};
const pause = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function timed(fn: () => Promise<Response>): Promise<{ ms: number; status: number }> {
  const t0 = performance.now();
  const res = await fn();
  await res.arrayBuffer();
  return { ms: performance.now() - t0, status: res.status };
}

/** Reset requests alternating between known and unknown addresses, each from its own client address. */
async function resetTimes(base: string, knownEmails: string[], rounds: number) {
  const known: number[] = [];
  const unknown: number[] = [];
  let non202 = 0;
  const post = (email: string, n: number) =>
    fetch(`${base}/api/auth/password-reset/request`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'x-forwarded-for': `10.77.${Math.floor(n / 250)}.${(n % 250) + 1}` },
      body: JSON.stringify({ email }),
    });
  for (let i = 0; i < rounds; i++) {
    // Each known address at most three times (the per-e-mail throttle), cycling through the accounts.
    const k = await timed(() => post(knownEmails[i % knownEmails.length]!, 2 * i));
    // Let the queued link and mail finish, so the next request is not timed behind it.
    await pause(40);
    const u = await timed(() => post(`no.account.${i}@warmfold.test`, 2 * i + 1));
    await pause(40);
    known.push(k.ms);
    unknown.push(u.ms);
    non202 += Number(k.status !== 202) + Number(u.status !== 202);
  }
  return { knownMedian: pct(known, 0.5), unknownMedian: pct(unknown, 0.5), knownP95: pct(known, 0.95), unknownP95: pct(unknown, 0.95), samples: rounds, non202 };
}

/** One request at a time to /api/ping for `seconds`, each timed. */
async function pingLoop(base: string, until: () => boolean): Promise<number[]> {
  const times: number[] = [];
  while (!until()) {
    times.push((await timed(() => fetch(`${base}/api/ping`))).ms);
    await pause(2);
  }
  return times;
}

export async function benchAuth(base: string, opts: { email: string; password: string; knownEmails: string[]; seconds: number; resetRounds: number }): Promise<AuthFigures> {
  const reset = await resetTimes(base, opts.knownEmails, opts.resetRounds);

  const idleEnd = performance.now() + (opts.seconds * 1000) / 2;
  const idle = await pingLoop(base, () => performance.now() > idleEnd);

  let stop = false;
  let signIns = 0;
  let signInFailures = 0;
  const signer = async () => {
    while (!stop) {
      const r = await timed(() =>
        fetch(`${base}/api/auth/sign-in`, {
          method: 'POST',
          headers: { 'content-type': 'application/json' },
          body: JSON.stringify({ email: opts.email, password: opts.password }),
        }),
      );
      signIns += 1;
      if (r.status !== 200) signInFailures += 1;
    }
  };
  const signers = Array.from({ length: 10 }, signer);
  await pause(200); // let all ten be in flight before timing
  const end = performance.now() + opts.seconds * 1000;
  const during = await pingLoop(base, () => performance.now() > end);
  stop = true;
  await Promise.all(signers);
  return {
    reset,
    ping: { idleP50: pct(idle, 0.5), idleP99: pct(idle, 0.99), duringP50: pct(during, 0.5), duringP99: pct(during, 0.99), samples: during.length, signIns, signInFailures },
  };
}
