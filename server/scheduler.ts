import { Cron } from 'croner';
import type { AppContext } from './context';

export interface Scheduler {
  stop(): void;
}

/** Periodic work: escalations every minute, the weekly digest on Monday morning. */
export function startScheduler(ctx: AppContext, jobs: Array<{ name: string; pattern: string; run: (ctx: AppContext) => Promise<void> | void }> = []): Scheduler {
  const crons = jobs.map(
    (job) =>
      new Cron(job.pattern, { protect: true, catch: (err) => ctx.log(`job ${job.name} failed: ${String(err)}`) }, async () => {
        await job.run(ctx);
      }),
  );
  return { stop: () => crons.forEach((c) => c.stop()) };
}
