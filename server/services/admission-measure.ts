/**
 * The admission-temperature measure (UK National Neonatal Audit Programme, 2021 Measures Guide,
 * "Promoting normal temperature on admission for very preterm babies"): of infants born before
 * 32 weeks' gestation, the share whose first temperature on admission was both 36.5–37.5 °C and
 * measured within one hour of birth. Here the first temperature is the first current (not
 * replaced, not entered in error) remote-site reading taken axillary or rectal, never the skin
 * probe. Counted by the month of admission in the unit's zone.
 */
import { and, asc, eq, gte, inArray, isNotNull, isNull, lt } from 'drizzle-orm';
import { alias } from 'drizzle-orm/sqlite-core';
import { infants, readings } from '../../db/schema';
import { rate } from '../../shared/reports';
import { NORMAL_MAX_CENTI, NORMAL_MIN_CENTI } from '../../shared/thermal/bands';
import type { UnitRangeQuery } from '../../shared/schemas/review';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { dbOf } from './flag-lifecycle';
import { unitWindow } from './reports';

/** Born before 32+0 weeks. */
export const MEASURE_GESTATION_BELOW_WEEKS = 32;
/** Within one hour of birth (60 minutes inclusive). */
export const MEASURE_WITHIN_MINUTES = 60;

export type MissReason = 'too-cold' | 'too-warm' | 'too-late' | 'none-recorded';

export interface MeasureInfant {
  infantId: string;
  displayName: string;
  hospitalNumber: string | null;
  birthAt: string;
  admittedAt: string;
  gestationWeeks: number;
  gestationDays: number;
  /** The first axillary or rectal temperature: when, what, where; null when none was recorded. */
  first: { takenAt: string; centi: number; site: 'axilla' | 'rectal'; minutesAfterBirth: number } | null;
  met: boolean;
  /** Why it was missed (empty when met); a reading can be both too cold and too late. */
  reasons: MissReason[];
}

export interface MeasureMonth {
  month: string;
  eligible: number;
  met: number;
  rate: number | null;
}

export interface AdmissionMeasure {
  unitId: string;
  from: string;
  to: string;
  eligible: number;
  met: number;
  rate: number | null;
  byMonth: MeasureMonth[];
  /** Every eligible infant that missed the measure, oldest admission first. */
  missed: MeasureInfant[];
}

/** Judges one infant's first remote-site temperature (pure: the test checks it by hand). */
export function judgeFirstTemperature(birthAt: Date, first: { takenAt: Date; centi: number } | null): { met: boolean; reasons: MissReason[] } {
  if (!first) return { met: false, reasons: ['none-recorded'] };
  const reasons: MissReason[] = [];
  if (first.centi < NORMAL_MIN_CENTI) reasons.push('too-cold');
  if (first.centi > NORMAL_MAX_CENTI) reasons.push('too-warm');
  if (first.takenAt.getTime() - birthAt.getTime() > MEASURE_WITHIN_MINUTES * 60_000) reasons.push('too-late');
  return { met: reasons.length === 0, reasons };
}

function monthOf(instant: Date, timeZone: string): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit' }).format(instant).slice(0, 7);
}

export function admissionMeasure(ctx: AppContext, query: UnitRangeQuery, actorId: string): AdmissionMeasure {
  const { sqlite } = ctx.database;
  const db = dbOf(sqlite);
  const w = unitWindow(sqlite, query);
  const eligible = db
    .select()
    .from(infants)
    .where(
      and(
        eq(infants.unitId, w.unit.id),
        gte(infants.admittedAt, new Date(w.fromMs)),
        lt(infants.admittedAt, new Date(w.toMs)),
        lt(infants.gestationWeeks, MEASURE_GESTATION_BELOW_WEEKS),
      ),
    )
    .orderBy(asc(infants.admittedAt), asc(infants.id))
    .all();
  const replacement = alias(readings, 'replacement');
  const remote = eligible.length
    ? db
        .select({ infantId: readings.infantId, takenAt: readings.takenAt, centi: readings.remoteCenti, site: readings.remoteSite })
        .from(readings)
        .leftJoin(replacement, eq(replacement.replacesId, readings.id))
        .where(
          and(
            inArray(
              readings.infantId,
              eligible.map((i) => i.id),
            ),
            isNotNull(readings.remoteCenti),
            inArray(readings.remoteSite, ['axilla', 'rectal']),
            eq(readings.enteredInError, false),
            isNull(replacement.id),
          ),
        )
        .orderBy(asc(readings.takenAt), asc(readings.recordedAt))
        .all()
    : [];
  const firstOf = new Map<string, (typeof remote)[number]>();
  for (const r of remote) if (!firstOf.has(r.infantId)) firstOf.set(r.infantId, r);
  const months = new Map<string, [number, number]>();
  const missed: MeasureInfant[] = [];
  let met = 0;
  for (const i of eligible) {
    const r = firstOf.get(i.id);
    const first = r && r.centi !== null ? { takenAt: r.takenAt, centi: r.centi } : null;
    const verdict = judgeFirstTemperature(i.birthAt, first);
    const month = monthOf(i.admittedAt, w.unit.timeZone);
    const m = months.get(month) ?? [0, 0];
    m[0] += 1;
    if (verdict.met) {
      m[1] += 1;
      met += 1;
    }
    months.set(month, m);
    if (!verdict.met) {
      missed.push({
        infantId: i.id,
        displayName: i.displayName,
        hospitalNumber: i.hospitalNumber,
        birthAt: i.birthAt.toISOString(),
        admittedAt: i.admittedAt.toISOString(),
        gestationWeeks: i.gestationWeeks,
        gestationDays: i.gestationDays,
        first:
          r && first
            ? {
                takenAt: first.takenAt.toISOString(),
                centi: first.centi,
                site: r.site === 'rectal' ? 'rectal' : 'axilla',
                minutesAfterBirth: Math.round((first.takenAt.getTime() - i.birthAt.getTime()) / 60_000),
              }
            : null,
        met: false,
        reasons: verdict.reasons,
      });
    }
  }
  // The list names infants: the read is audited with them, as other list reads are.
  sqlite
    .transaction(() =>
      appendAudit(sqlite, {
        at: ctx.clock.now(),
        actorId,
        action: 'report-read',
        entityType: 'unit',
        entityId: w.unit.id,
        unitId: w.unit.id,
        after: { ...query, view: 'admission-measure', infantIds: missed.map((m) => m.infantId) },
      }),
    )
    .immediate();
  return {
    unitId: w.unit.id,
    from: query.from,
    to: query.to,
    eligible: eligible.length,
    met,
    rate: rate(met, eligible.length),
    byMonth: [...months.entries()].sort(([a], [b]) => (a < b ? -1 : 1)).map(([month, [e, m]]) => ({ month, eligible: e, met: m, rate: rate(m, e) })),
    missed,
  };
}
