import type Database from 'better-sqlite3';
import { integer, sqliteTable } from 'drizzle-orm/sqlite-core';
import { drizzleOf } from '../../db/client';
import type { BoardResponse } from '../../shared/types/board';
import { CompressedJson } from '../compressed-body';
import { notFound } from '../errors';
import { auditRead } from '../read-audit';
import { buildBoard } from './board';

/**
 * The write counter, a temporary table of this connection (made below, never migrated: it lives
 * only as long as the connection), so it is declared here rather than in db/schema.ts.
 */
const boardGeneration = sqliteTable('board_generation', { n: integer('n').notNull() });

/** Every table the board reads. A write to any of them makes every cached board stale. */
const BOARD_TABLES = [
  'units',
  'beds',
  'users',
  'user_units',
  'infants',
  'assignments',
  'readings',
  'flags',
  'flag_resolutions',
  'actions',
  'escalations',
  'skin_to_skin_sessions',
  // What the views read of the stored flag truth: the lifecycle, the check clocks, the settings versions.
  'flag_events',
  'infant_clocks',
  'unit_policy_versions',
  // The stored current placement (and the changes charted on their own).
  'infant_placements',
  'placement_changes',
];

/**
 * How long a board may be served again when nothing was written: the rules also move with the
 * clock alone (a check turns due-soon, then overdue), so an unchanged unit is recomputed at
 * least this often. One second is below what a person at the board can notice, and the board
 * screen polls far less often; what it saves is a unit's worth of reads per request when many
 * screens and tabs poll at once.
 *
 * Kept for the bench budget "unit board req/s vs baseline >= 50 %": on the bench's 60-bed unit a
 * build per request measured 6.1 % of the baseline, the cached board 43 % in the same conditions
 * (2 shared cores, load around 13; `npm run bench -- --skip=writes,rules,bundle,vitals,auth`).
 */
export const BOARD_MAX_AGE_MS = 1000;

interface Cached {
  version: string;
  builtAt: number;
  body: CompressedJson;
}

const caches = new WeakMap<Database.Database, Map<string, Cached>>();
/** The infants each built board shows, for the read's audit event. */
const boardInfants = new WeakMap<CompressedJson, readonly string[]>();

/** The ids of the infants a board from boardBody shows, in bed order. */
function boardInfantIds(body: CompressedJson): readonly string[] {
  return boardInfants.get(body) ?? [];
}
const versions = new WeakMap<Database.Database, () => string>();

/**
 * A write counter the database keeps itself: temporary triggers on this connection bump it on any
 * insert, update or delete in the board's tables, and `PRAGMA data_version` changes when another
 * process commits. Together they say exactly when a cached board may be stale, without every
 * write path in the app having to remember to invalidate it.
 */
function versionOf(sqlite: Database.Database): () => string {
  const db = drizzleOf(sqlite);
  // DDL: Drizzle has no temporary tables or triggers (and migrations are for the main schema only).
  sqlite.exec('CREATE TEMP TABLE IF NOT EXISTS board_generation (n INTEGER NOT NULL)');
  if (!db.select().from(boardGeneration).get()) db.insert(boardGeneration).values({ n: 0 }).run();
  for (const table of BOARD_TABLES) {
    for (const op of ['INSERT', 'UPDATE', 'DELETE']) {
      sqlite.exec(`CREATE TEMP TRIGGER IF NOT EXISTS board_bump_${table}_${op.toLowerCase()} AFTER ${op} ON main.${table} BEGIN UPDATE board_generation SET n = n + 1; END`);
    }
  }
  // Prepared: read on every board and flowsheet request, cache hits included (the two read budgets of the bench).
  const generation = db.select().from(boardGeneration).prepare();
  // A PRAGMA is no query Drizzle builds; better-sqlite3's pragma() costs about 15 µs more than a prepared statement, nothing beside a request.
  return () => `${String(sqlite.pragma('data_version', { simple: true }))}:${String(generation.get()?.n)}`;
}

/**
 * A string that changes whenever anything a chart view shows may have changed (any write to the
 * board's tables, on this connection or another): the key the board and flowsheet caches check.
 */
export function chartDataVersion(sqlite: Database.Database): string {
  let version = versions.get(sqlite);
  if (!version) {
    version = versionOf(sqlite);
    versions.set(sqlite, version);
  }
  return version();
}

/**
 * The board as JSON bytes, rebuilt only when the unit's data changed or the last build is older
 * than BOARD_MAX_AGE_MS. Its `serverTime` is the instant it was built, the instant its statuses
 * were computed for, so a cached answer is one consistent picture at most a second old; the
 * board screen corrects its clock by it. Null when the unit does not exist.
 */
function boardBody(sqlite: Database.Database, unitId: string, now: Date): CompressedJson | null {
  let boards = caches.get(sqlite);
  if (!boards) {
    boards = new Map();
    caches.set(sqlite, boards);
  }
  const version = chartDataVersion(sqlite);
  const hit = boards.get(unitId);
  const age = hit ? now.getTime() - hit.builtAt : -1;
  if (hit && hit.version === version && age >= 0 && age < BOARD_MAX_AGE_MS) return hit.body;
  const board = buildBoard(sqlite, unitId, now);
  if (!board) {
    boards.delete(unitId);
    return null;
  }
  const body = new CompressedJson(JSON.stringify(board satisfies BoardResponse));
  boardInfants.set(
    body,
    board.beds.flatMap((b) => (b.infant ? [b.infant.id] : [])),
  );
  boards.set(unitId, { version, builtAt: now.getTime(), body });
  return body;
}

/** A unit's board for a reader, the read audited (the infants it shows) before it is answered; 404 for no such unit. */
export async function readBoard(sqlite: Database.Database, unitId: string, actorId: string, now: Date): Promise<CompressedJson> {
  const body = boardBody(sqlite, unitId, now);
  if (body === null) throw notFound('That unit');
  await auditRead(sqlite, { at: now, actorId, action: 'board-read', entityType: 'unit', entityId: unitId, unitId, after: { infantIds: boardInfantIds(body) } });
  return body;
}
