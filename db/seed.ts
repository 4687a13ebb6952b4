/**
 * The demo's accounts, and the database side of `npm run db:seed`: whether a database is empty,
 * and emptying it. Laying the demo down runs the app's own rules, so it lives in server/demo-seed.ts.
 */
import { and, count, eq, notLike } from 'drizzle-orm';
import { sqliteTable, text } from 'drizzle-orm/sqlite-core';
import type { Database_ } from './client';
import { users } from './schema';
import { SCHEMA_TABLES } from './tables';
import { withoutLedger } from '../server/ledger';

export const DEMO_PASSWORD = 'warm-hands-at-night';

export const DEMO_ACCOUNTS = [
  { id: 'u-nurse', email: 'nia.okafor@warmfold.test', name: 'Nia Okafor', role: 'nurse', units: ['unit-north'] },
  { id: 'u-charge', email: 'marta.lindqvist@warmfold.test', name: 'Marta Lindqvist', role: 'charge', units: ['unit-north'] },
  { id: 'u-educator', email: 'priya.raman@warmfold.test', name: 'Priya Raman', role: 'educator', units: ['unit-north', 'unit-south'] },
  { id: 'u-admin', email: 'tomas.vidal@warmfold.test', name: 'Tomás Vidal', role: 'admin', units: ['unit-north', 'unit-south'] },
] as const;

/** SQLite's own catalogue (made by SQLite, so not in db/schema.ts): the triggers the migrations made. */
const sqliteMaster = sqliteTable('sqlite_master', { type: text('type').notNull(), name: text('name').notNull(), sql: text('sql') });

export function isEmpty(database: Database_): boolean {
  return (database.db.select({ n: count() }).from(users).get()?.n ?? 0) === 0;
}

/** Empty every table (the seed command resets). Triggers keep the app from doing this, so drop them for the reset only. */
export function resetDatabase(database: Database_): void {
  const { sqlite, db } = database;
  const triggers = db
    .select({ name: sqliteMaster.name, sql: sqliteMaster.sql })
    .from(sqliteMaster)
    .where(and(eq(sqliteMaster.type, 'trigger'), notLike(sqliteMaster.name, 'sqlite_%')))
    .all();
  sqlite.pragma('foreign_keys = OFF');
  // The row ledger's triggers are off for the reset, which empties the audit trail too; it starts again after.
  withoutLedger(sqlite, () =>
    db.transaction(
      (tx) => {
        // SQL text: dropping the append-only triggers and putting back the text SQLite kept of them (Drizzle has no triggers).
        for (const t of triggers) sqlite.exec(`DROP TRIGGER "${t.name.replace(/"/g, '""')}"`);
        for (const table of SCHEMA_TABLES.values()) tx.delete(table).run();
        for (const t of triggers) if (t.sql) sqlite.exec(t.sql);
      },
      { behavior: 'immediate' },
    ),
  );
  sqlite.pragma('foreign_keys = ON');
}
