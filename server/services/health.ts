import type { Database_ } from '../../db/client';
import { units } from '../../db/schema';

/** The health check's one question: the database answers a read (it throws, and the check fails, when it cannot). */
export function checkDatabase(database: Database_): void {
  database.db.select({ id: units.id }).from(units).limit(1).all();
}
