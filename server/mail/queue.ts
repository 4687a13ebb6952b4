import type { AppContext } from '../context';

/**
 * Work that sends mail after the answer has gone out (a reset request answers at once, the same
 * way whether or not the account exists, and its link is made and mailed here). Jobs run one at a
 * time in order; a failing job is logged and the next one runs.
 */
interface MailQueue {
  jobs: (() => Promise<void>)[];
  running: Promise<void> | null;
}

const queues = new WeakMap<AppContext, MailQueue>();

function queueOf(ctx: AppContext): MailQueue {
  let q = queues.get(ctx);
  if (!q) queues.set(ctx, (q = { jobs: [], running: null }));
  return q;
}

async function run(ctx: AppContext, q: MailQueue): Promise<void> {
  // Start on a later turn of the event loop, after the answer that queued the job is written.
  await new Promise((resolve) => setImmediate(resolve));
  for (let job = q.jobs.shift(); job; job = q.jobs.shift()) {
    try {
      await job();
    } catch (err) {
      ctx.log(`queued mail job failed: ${err instanceof Error ? err.message : String(err)}`);
    }
  }
  q.running = null;
}

export function enqueueMailJob(ctx: AppContext, job: () => Promise<void>): void {
  const q = queueOf(ctx);
  q.jobs.push(job);
  if (!q.running) q.running = run(ctx, q);
}

/** Resolves when every queued job has run, or after `timeoutMs` (shutdown, tests). */
export async function drainMailQueue(ctx: AppContext, timeoutMs = 10_000): Promise<void> {
  const q = queueOf(ctx);
  const deadline = Date.now() + timeoutMs;
  while (q.running && Date.now() < deadline) {
    let timer: NodeJS.Timeout | undefined;
    await Promise.race([q.running, new Promise((resolve) => (timer = setTimeout(resolve, Math.max(0, deadline - Date.now()))))]);
    clearTimeout(timer);
  }
}
