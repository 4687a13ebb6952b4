import type { AddressInfo } from 'node:net';
import { openDatabase } from '../db/client';
import { isEmpty } from '../db/seed';
import { seedDemo } from './demo-seed';
import { createApp } from './app';
import { systemClock } from './clock';
import { ConfigError, loadConfig } from './config';
import { listen } from './listen';
import { startFakeSmtp, type FakeSmtp } from './mail/fake-smtp';
import { smtpMailer } from './mail/mailer';
import { drainMailQueue } from './mail/queue';
import { timingDummy } from './services/auth';
import { closePasswordPool } from './services/password-hash';
import { productionDatabaseProblems, startBanner } from './modes';
import { startCheckpointing } from './checkpoints';
import { escalationJob, startScheduler } from './scheduler';
import { weeklyDigestJob } from './services/digest';
import { runEscalations } from './services/escalations';

async function main(): Promise<void> {
  const config = loadConfig();
  const log = (line: string) => process.stdout.write(`${line}\n`);
  const database = openDatabase(config.databasePath);
  if (config.mode === 'production') {
    const problems = productionDatabaseProblems(database, config);
    if (problems.length) {
      database.close();
      throw new ConfigError('production', problems);
    }
  }

  if (config.seedDemo && isEmpty(database)) {
    log('First start: adding the demo unit, infants and accounts.');
    await seedDemo(database, { now: new Date(), bcryptCost: config.bcryptCost });
  }

  // Sign the audit chain's head now, every minute it moves, and at shutdown (server/checkpoints.ts).
  const checkpoints = startCheckpointing(database.sqlite, config.dataDir, log, config.mode === 'production');

  let fake: FakeSmtp | null = null;
  let smtpPort = config.smtp.port;
  if (config.smtp.fake) {
    fake = await startFakeSmtp(database, config.smtp.port);
    smtpPort = fake.port;
  }
  // Mail to the catcher names the user whose action sent it, so each person's mailbox shows their own.
  const mailer = smtpMailer({ ...config.smtp, port: smtpPort, markSender: fake !== null });
  const app = createApp({ db: database, mailer, clock: systemClock, config, log });
  await timingDummy(config.bcryptCost);
  // Escalate what is already overdue at start-up, then keep checking on the scheduler.
  await runEscalations(app.context, systemClock.now()).catch((err: unknown) => log(`escalations at start-up failed: ${String(err)}`));
  const scheduler = startScheduler(app.context, [escalationJob(process.env.ESCALATION_INTERVAL_SECONDS), weeklyDigestJob(), checkpoints.job]);

  const server = listen(app, config, (srv, scheme) => {
    const { port } = srv.address() as AddressInfo;
    for (const line of startBanner(config, `${scheme}://localhost:${port}`, fake ? fake.port : null)) log(line);
  });

  let closing = false;
  const shutdown = (signal: string) => {
    if (closing) return;
    closing = true;
    log(`${signal}: finishing open requests, then closing.`);
    scheduler.stop();
    server.close(() => {
      void (async () => {
        await drainMailQueue(app.context, 5_000);
        await closePasswordPool();
        mailer.close();
        if (fake) await fake.close();
        checkpoints.atShutdown();
        database.close();
        process.exit(0);
      })();
    });
    server.closeIdleConnections();
    setTimeout(() => process.exit(1), 10_000).unref();
  };
  process.on('SIGTERM', () => shutdown('SIGTERM'));
  process.on('SIGINT', () => shutdown('SIGINT'));
}

main().catch((err: unknown) => {
  process.stderr.write(`Warmfold could not start: ${err instanceof Error ? err.message : String(err)}\n`);
  // 78 (EX_CONFIG): a configuration to fix, not a crash to retry.
  process.exit(err instanceof ConfigError ? 78 : 1);
});
