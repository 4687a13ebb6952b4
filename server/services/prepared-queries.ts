/**
 * Drizzle prepared queries for the hot reads (the board, the flowsheet, the summaries they share):
 * compiled once per connection and reused by every request, as a query prepared on one handle
 * runs only on that handle. Everything else builds its query where it runs.
 */
import type Database from 'better-sqlite3';
import { sql, type SQL } from 'drizzle-orm';
import { drizzleOf, type Db } from '../../db/client';

/** `make(db)` once per connection, on first use. */
export function perConnection<T>(make: (db: Db) => T): (sqlite: Database.Database) => T {
  const made = new WeakMap<Database.Database, T>();
  return (sqlite) => {
    let query = made.get(sqlite);
    if (query === undefined) {
      query = make(drizzleOf(sqlite));
      made.set(sqlite, query);
    }
    return query;
  };
}

/**
 * The values of the JSON array bound to placeholder `name`, for `inArray(column, jsonList('ids'))`
 * in a prepared query; the caller passes `{ [name]: JSON.stringify(values) }`.
 */
// sql fragment: Drizzle binds a list as one parameter per item, so one prepared statement for lists of any length needs SQLite's json_each.
export const jsonList = (name: string): SQL => sql`(select value from json_each(${sql.placeholder(name)}))`;
