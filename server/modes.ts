import { inArray, like, or } from 'drizzle-orm';
import type { Database_ } from '../db/client';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../db/seed';
import { users } from '../db/schema';
import type { AppConfig } from './config';

/** Every demo account's address ends here: `.test` is reserved (RFC 2606), so no real person has one. */
export const DEMO_EMAIL_DOMAIN = 'warmfold.test';

/** Accounts of the demo (or made like them) found in the database: production refuses to start with any. */
export function demoAccountsIn(database: Database_): string[] {
  return database.db
    .select({ email: users.email })
    .from(users)
    .where(
      or(
        inArray(
          users.email,
          DEMO_ACCOUNTS.map((a) => a.email),
        ),
        like(users.email, `%@${DEMO_EMAIL_DOMAIN}`),
      ),
    )
    .orderBy(users.email)
    .all()
    .map((r) => r.email);
}

/** What production refuses in the database; empty when it may start. */
export function productionDatabaseProblems(database: Database_, config: AppConfig): string[] {
  const demo = demoAccountsIn(database);
  if (demo.length === 0) return [];
  const shown = demo.slice(0, 10).join(', ') + (demo.length > 10 ? ` and ${demo.length - 10} more` : '');
  return [
    `DATA_DIR (or DATABASE_PATH): the database ${config.databasePath} holds ${demo.length} demo account(s), whose password is published: ${shown}. ` +
      'Point DATA_DIR at a new, empty folder for production; a demo database is never turned into a production one.',
  ];
}

/** The lines printed when the server is up: the demo says loudly that it is one. */
export function startBanner(config: AppConfig, url: string, mailCatcherPort: number | null): string[] {
  if (config.mode === 'production') {
    return [`Warmfold is running at ${url} (production mode; links in e-mail point to ${config.publicUrl}).`];
  }
  const lines = [
    `Warmfold is running at ${url}`,
    '*** DEMO MODE: an invented hospital, accounts with a published password, mail kept by a local catcher. Never enter real patient data. ***',
    '*** For a real deployment see "Running in production" in the README (WARMFOLD_MODE=production). ***',
  ];
  if (mailCatcherPort !== null) lines.push(`Local mail catcher (fake SMTP) on 127.0.0.1:${mailCatcherPort}; each person reads their own mail under Settings → Mailbox.`);
  if (config.seedDemo) {
    lines.push(`Demo accounts (password for all: "${DEMO_PASSWORD}"):`);
    for (const a of DEMO_ACCOUNTS) lines.push(`  ${a.role.padEnd(9)} ${a.email}`);
  }
  return lines;
}
