/**
 * The infant's current placement (probe site, heat-reflecting cover, position) and its prompt,
 * stored at write time in infant_placements so every view reads the same thing and none judges
 * the placement its own way. It is derived from the chained record: the settings charted with
 * each current reading (not replaced, not entered in error), the placement changes charted on
 * their own, and where a moved-probe action (not undone) put the probe. Each setting is the latest
 * charted by clinical time; the prompt is shared/thermal/placement.ts's on the result.
 */
import type Database from 'better-sqlite3';
import { and, eq, inArray, isNotNull, isNull, notExists, or } from 'drizzle-orm';
import { alias } from 'drizzle-orm/sqlite-core';
import { drizzleOf } from '../../db/client';
import { actions, actionUndos, infantPlacements, placementChanges, readings } from '../../db/schema';
import type { PlacementChange } from '../../shared/schemas/placement';
import { placementPrompt, placementPromptWords, type Placement } from '../../shared/thermal/placement';
import type { CurrentPlacement } from '../../shared/types/bedside';
import { appendAudit } from '../audit';
import { badRequest, conflict } from '../errors';
import type { Infant } from './infants';

interface Charted extends Placement {
  at: number;
  /** Orders entries of one instant: the later written wins. */
  written: number;
}

/** Every charted placement setting of the infant, oldest first. */
function chartedPlacements(sqlite: Database.Database, infantId: string): Charted[] {
  const db = drizzleOf(sqlite);
  const newer = alias(readings, 'newer');
  const fromReadings = db
    .select({ at: readings.takenAt, written: readings.recordedAt, probeSite: readings.probeSite, probeCovered: readings.probeCovered, position: readings.infantPosition })
    .from(readings)
    .where(
      and(
        eq(readings.infantId, infantId),
        eq(readings.enteredInError, false),
        or(isNotNull(readings.probeSite), isNotNull(readings.probeCovered), isNotNull(readings.infantPosition)),
        notExists(db.select({ id: newer.id }).from(newer).where(eq(newer.replacesId, readings.id))),
      ),
    )
    .all();
  const fromChanges = db
    .select({
      at: placementChanges.at,
      written: placementChanges.createdAt,
      probeSite: placementChanges.probeSite,
      probeCovered: placementChanges.probeCovered,
      position: placementChanges.infantPosition,
    })
    .from(placementChanges)
    .where(eq(placementChanges.infantId, infantId))
    .all();
  const fromActions = db
    .select({ at: actions.at, written: actions.createdAt, probeSite: actions.probeSite })
    .from(actions)
    .leftJoin(actionUndos, eq(actionUndos.actionId, actions.id))
    .where(and(eq(actions.infantId, infantId), eq(actions.kind, 'moved-probe'), isNotNull(actions.probeSite), isNull(actionUndos.id)))
    .all();
  const all: Charted[] = [
    ...fromReadings.map((r) => ({ ...r, at: r.at.getTime(), written: r.written.getTime() })),
    ...fromChanges.map((r) => ({ ...r, at: r.at.getTime(), written: r.written.getTime() })),
    ...fromActions.map((r) => ({ at: r.at.getTime(), written: r.written.getTime(), probeSite: r.probeSite, probeCovered: null, position: null })),
  ];
  return all.sort((a, b) => a.at - b.at || a.written - b.written);
}

/** Each setting as last charted; null when nothing was ever charted. */
export function currentPlacementOf(entries: readonly Charted[]): (Placement & { chartedAt: number }) | null {
  if (entries.length === 0) return null;
  const out: Placement & { chartedAt: number } = { probeSite: null, probeCovered: null, position: null, chartedAt: 0 };
  for (const e of entries) {
    if (e.probeSite != null) out.probeSite = e.probeSite;
    if (e.probeCovered != null) out.probeCovered = e.probeCovered;
    if (e.position != null) out.position = e.position;
    out.chartedAt = Math.max(out.chartedAt, e.at);
  }
  return out;
}

/**
 * Work out the infant's current placement and store it with its prompt (inside the caller's
 * transaction, after the write that may have changed it). Written only when it changed, so the
 * board's and flowsheet's caches are not bumped for nothing.
 */
export function refreshPlacement(sqlite: Database.Database, infantId: string, unitId: string, now: Date): void {
  const db = drizzleOf(sqlite);
  const current = currentPlacementOf(chartedPlacements(sqlite, infantId));
  const stored = db.select().from(infantPlacements).where(eq(infantPlacements.infantId, infantId)).get();
  if (!current) {
    if (stored) db.delete(infantPlacements).where(eq(infantPlacements.infantId, infantId)).run();
    return;
  }
  const values = {
    unitId,
    probeSite: current.probeSite,
    probeCovered: current.probeCovered,
    infantPosition: current.position,
    chartedAt: new Date(current.chartedAt),
    prompt: placementPrompt(current),
  };
  if (
    stored &&
    stored.probeSite === values.probeSite &&
    stored.probeCovered === values.probeCovered &&
    stored.infantPosition === values.infantPosition &&
    stored.prompt === values.prompt &&
    stored.chartedAt.getTime() === values.chartedAt.getTime()
  ) {
    return;
  }
  db.insert(infantPlacements)
    .values({ infantId, ...values, computedAt: now })
    .onConflictDoUpdate({ target: infantPlacements.infantId, set: { ...values, computedAt: now } })
    .run();
}

type StoredRow = typeof infantPlacements.$inferSelect;

function placementJson(row: StoredRow): CurrentPlacement {
  const text = placementPromptWords(row.prompt);
  return {
    probeSite: row.probeSite,
    probeCovered: row.probeCovered,
    position: row.infantPosition,
    chartedAt: row.chartedAt.toISOString(),
    prompt: row.prompt && text ? { code: row.prompt, text } : null,
  };
}

/** The stored current placements of these infants, by infant id (absent: none charted). */
export function storedPlacements(sqlite: Database.Database, infantIds: readonly string[]): Map<string, CurrentPlacement> {
  if (infantIds.length === 0) return new Map();
  const rows = drizzleOf(sqlite)
    .select()
    .from(infantPlacements)
    .where(inArray(infantPlacements.infantId, [...infantIds]))
    .all();
  return new Map(rows.map((r) => [r.infantId, placementJson(r)]));
}

export function storedPlacement(sqlite: Database.Database, infantId: string): CurrentPlacement | null {
  return storedPlacements(sqlite, [infantId]).get(infantId) ?? null;
}

/**
 * Chart a placement change on its own (the probe moved, the infant turned). Idempotent by the
 * client's id: the same content again answers with the stored change, other content is a 409.
 * Runs inside the caller's transaction.
 */
export function recordPlacementChange(
  sqlite: Database.Database,
  infant: Pick<Infant, 'id' | 'unitId' | 'admittedAt'>,
  input: PlacementChange,
  actorId: string,
  now: Date,
  /** Checks before a new change is stored (not for a retry of a stored one). */
  beforeNew: () => void = () => {},
): { created: boolean } {
  const db = drizzleOf(sqlite);
  const at = input.at ? new Date(input.at) : now;
  const existing = db.select().from(placementChanges).where(eq(placementChanges.id, input.id)).get();
  if (existing) {
    const same =
      existing.infantId === infant.id &&
      existing.probeSite === (input.probeSite ?? null) &&
      existing.probeCovered === (input.probeCovered ?? null) &&
      existing.infantPosition === (input.position ?? null) &&
      (!input.at || existing.at.getTime() === at.getTime());
    if (!same) throw conflict('A different placement change was already saved with this id.', { id: 'This id belongs to another change.' });
    return { created: false };
  }
  beforeNew();
  if (at.getTime() > now.getTime() + 2 * 60_000) throw badRequest('The time is in the future.', { at: 'The time cannot be in the future.' });
  if (at.getTime() < infant.admittedAt.getTime() - 60 * 60_000) throw badRequest('The time is before the infant was admitted.', { at: 'The time is before admission.' });
  const row = {
    id: input.id,
    infantId: infant.id,
    unitId: infant.unitId,
    at,
    probeSite: input.probeSite ?? null,
    probeCovered: input.probeCovered ?? null,
    infantPosition: input.position ?? null,
    recordedBy: actorId,
    createdAt: now,
  };
  db.insert(placementChanges).values(row).run();
  appendAudit(sqlite, {
    at: now,
    actorId,
    action: 'placement-change',
    entityType: 'placement-change',
    entityId: row.id,
    unitId: infant.unitId,
    after: { infantId: infant.id, at: at.toISOString(), probeSite: row.probeSite, probeCovered: row.probeCovered, position: row.infantPosition },
  });
  refreshPlacement(sqlite, infant.id, infant.unitId, now);
  return { created: true };
}
