import { and, asc, eq, inArray, lte } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { beds, bedStays } from '../../db/schema';

/** Append one bed-stay row: the infant lies in `bedId` from `at` (null: discharged, no bed). */
export function recordBedStay(
  db: Db,
  stay: { infantId: string; unitId: string; bedId: string | null; event: 'admitted' | 'moved' | 'discharged'; at: Date; recordedBy: string | null; id: string },
): void {
  db.insert(bedStays).values(stay).run();
}

/**
 * The bed each infant lay in at a given instant, from the append-only stays: the latest row at
 * or before the instant. Loads the stays of the infants once; answers null before admission.
 */
export function bedAtLookup(db: Db, infantIds: readonly string[], until?: Date): (infantId: string, at: Date | number) => string | null {
  const byInfant = new Map<string, { at: number; label: string | null }[]>();
  if (infantIds.length) {
    const ids = [...new Set(infantIds)];
    for (let i = 0; i < ids.length; i += 500) {
      const rows = db
        .select({ infantId: bedStays.infantId, at: bedStays.at, label: beds.label })
        .from(bedStays)
        .leftJoin(beds, eq(beds.id, bedStays.bedId))
        .where(and(inArray(bedStays.infantId, ids.slice(i, i + 500)), until ? lte(bedStays.at, until) : undefined))
        .orderBy(asc(bedStays.at), asc(bedStays.id))
        .all();
      for (const r of rows) {
        const list = byInfant.get(r.infantId) ?? [];
        list.push({ at: r.at.getTime(), label: r.label });
        byInfant.set(r.infantId, list);
      }
    }
  }
  return (infantId, at) => {
    const t = typeof at === 'number' ? at : at.getTime();
    const list = byInfant.get(infantId);
    if (!list) return null;
    let label: string | null = null;
    for (const s of list) {
      if (s.at > t) break;
      label = s.label;
    }
    return label;
  };
}
