import { getTableName, is } from 'drizzle-orm';
import { SQLiteTable } from 'drizzle-orm/sqlite-core';
import * as schema from './schema';

/** Every table of db/schema.ts by its SQL name. */
export const SCHEMA_TABLES: ReadonlyMap<string, SQLiteTable> = new Map(
  (Object.values(schema) as unknown[]).filter((t): t is SQLiteTable => is(t, SQLiteTable)).map((t) => [getTableName(t), t]),
);
