/**
 * `npm run setup:first-admin -- --email … --name … --unit … --hospital … [--time-zone …] [--beds N]`
 *
 * A production database starts empty: this lays down its first unit and the administrator who
 * manages it, and prints that administrator's invitation link (72 hours, single use) on this
 * terminal. Everyone else is invited from the app. It runs only on a database without accounts.
 */
import { count } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { parseArgs } from 'node:util';
import { openDatabase, writeTx } from '../db/client';
import { beds, units, userUnits, users } from '../db/schema';
import { appendAudit } from '../server/audit';
import { systemClock } from '../server/clock';
import { loadConfig } from '../server/config';
import type { AppContext } from '../server/context';
import { issueLink } from '../server/services/email-links';
import { emailSchema } from '../shared/schemas/auth';

function fail(message: string): never {
  process.stderr.write(`${message}\n`);
  process.exit(1);
}

const { values } = parseArgs({
  options: {
    email: { type: 'string' },
    name: { type: 'string' },
    unit: { type: 'string' },
    hospital: { type: 'string' },
    'time-zone': { type: 'string', default: 'Europe/London' },
    beds: { type: 'string', default: '0' },
  },
});

const email = emailSchema.safeParse(values.email ?? '');
if (!email.success) fail("--email: the administrator's work e-mail address.");
const name = (values.name ?? '').trim();
const unitName = (values.unit ?? '').trim();
const hospital = (values.hospital ?? '').trim();
if (!name || !unitName || !hospital) fail("Give --name (the administrator), --unit (the unit's name) and --hospital.");
const timeZone = values['time-zone']!;
try {
  new Intl.DateTimeFormat('en-GB', { timeZone }).format(0);
} catch {
  fail(`--time-zone: "${timeZone}" is not an IANA time zone (for example Europe/London).`);
}
const bedCount = Number(values.beds);
if (!Number.isInteger(bedCount) || bedCount < 0 || bedCount > 60) fail('--beds: a whole number from 0 to 60 (beds can also be added in the app).');

const config = loadConfig();
const database = openDatabase(config.databasePath);
const existing = database.db.select({ n: count() }).from(users).get()?.n ?? 0;
if (existing > 0) {
  database.close();
  fail(`${config.databasePath} already has ${existing} account(s): invite people from the app (Administration) instead.`);
}

const ctx: AppContext = { database, mailer: { send: async () => {}, close() {} }, clock: systemClock, config, log: () => {} };
const now = systemClock.now();
const unitId = randomUUID();
const userId = randomUUID();
const link = writeTx(database.sqlite, () => {
  database.db.insert(units).values({ id: unitId, name: unitName, hospitalName: hospital, timeZone, createdAt: now }).run();
  appendAudit(database.sqlite, {
    at: now,
    actorId: null,
    action: 'unit-created',
    entityType: 'unit',
    entityId: unitId,
    unitId,
    after: { name: unitName, hospitalName: hospital, timeZone },
  });
  for (let i = 1; i <= bedCount; i++)
    database.db
      .insert(beds)
      .values({ id: randomUUID(), unitId, label: `Bed ${i}`, sortOrder: i })
      .run();
  database.db.insert(users).values({ id: userId, email: email.data, name, role: 'admin', createdAt: now, updatedAt: now }).run();
  database.db.insert(userUnits).values({ userId, unitId }).run();
  appendAudit(database.sqlite, {
    at: now,
    actorId: null,
    action: 'user-created',
    entityType: 'user',
    entityId: userId,
    unitId,
    after: { email: email.data, name, role: 'admin', unitIds: [unitId] },
  });
  return issueLink(ctx, userId, 'invite', null);
});
database.close();
process.stdout.write(
  [
    `Created ${unitName} (${hospital}, ${timeZone}${bedCount ? `, ${bedCount} beds` : ''}) and its administrator ${name} <${email.data}>.`,
    `Give them this invitation link to choose a password (single use, until ${link.expiresAt.toISOString()}):`,
    `  ${link.url}`,
    '',
  ].join('\n'),
);
