import { Cron } from 'croner';
import type { AppContext } from './context';
import { runEscalations } from './services/escalations';

export interface Scheduler {
  stop(): void;
}

/** Periodic work: escalations every minute, the weekly digest on Monday morning. */
export function startScheduler(ctx: AppContext, jobs: { name: string; pattern: string; run: (ctx: AppContext) => Promise<void> | void }[] = []): Scheduler {
  const crons = jobs.map(
    (job) =>
      new Cron(job.pattern, { protect: true, catch: (err) => ctx.log(`job ${job.name} failed: ${String(err)}`) }, async () => {
        await job.run(ctx);
      }),
  );
  return { stop: () => crons.forEach((c) => c.stop()) };
}

export interface Job {
  name: string;
  pattern: string;
  run: (ctx: AppContext) => Promise<void> | void;
}

/**
 * Store time-based flags and escalate the ones past the unit's delay: every minute, or every
 * `intervalSeconds` (1–59) when set, which the end-to-end run uses to see escalations quickly.
 */
export function escalationJob(intervalSeconds?: string): Job {
  const seconds = Number(intervalSeconds);
  const pattern = Number.isInteger(seconds) && seconds >= 1 && seconds <= 59 ? `*/${seconds} * * * * *` : '0 * * * * *';
  return {
    name: 'escalations',
    pattern,
    run: async (ctx) => {
      const result = await runEscalations(ctx, ctx.clock.now());
      if (result.created.length || result.mailed.length) ctx.log(`escalations: ${result.created.length} raised, ${result.mailed.length} e-mailed`);
    },
  };
}
