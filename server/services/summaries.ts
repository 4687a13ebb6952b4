import { prepared } from '../../db/client';
import type Database from 'better-sqlite3';
import { evaluateInfant, flagEscalation, type EvaluatedFlag, type InfantEvaluation, type UnitPolicy } from '../../shared/thermal';
import { shiftAt } from '../../shared/shifts';
import type { InfantSummary, NextCheck, OpenFlagSummary } from '../../shared/types/bedside';
import { policyForUnit, RULE_COLUMNS, ruleReadingFromValues, type InfantState, type UnitRow } from './flags';

const DAY_MS = 86_400_000;
/** How far back the summaries read the chart: enough for the board and the shift, fast for a unit. */
export const SUMMARY_WINDOW_HOURS = 72;

interface InfantRow {
  id: string;
  unit_id: string;
  bed_id: string | null;
  bed_label: string | null;
  display_name: string;
  birth_at: number;
  gestation_weeks: number;
  gestation_days: number;
  weight_grams: number;
  heat_source: InfantSummary['heatSource'];
  admitted_at: number;
}

/** The rules' columns, qualified for a query that aliases readings as r. */
const RULE_COLUMNS_R = RULE_COLUMNS.split(', ')
  .map((c) => `r.${c}`)
  .join(', ');

/** JSON-safe copy of the rules' detail (Dates become ISO strings). */
export function plainDetail(detail: unknown): Record<string, unknown> {
  return JSON.parse(JSON.stringify(detail ?? {})) as Record<string, unknown>;
}

export function nextCheckJson(next: InfantEvaluation['nextCheck']): NextCheck {
  return { status: next.status, dueAt: next.dueAt ? next.dueAt.toISOString() : null, minutesLate: next.minutesLate };
}

export function openFlagJson(flag: EvaluatedFlag, storedId: string | null, escalated: boolean): OpenFlagSummary {
  return {
    id: storedId,
    key: flag.key,
    kind: flag.kind,
    raisedAt: flag.raisedAt.toISOString(),
    detail: plainDetail(flag.detail),
    recheckDueAt: flag.recheckDueAt ? flag.recheckDueAt.toISOString() : null,
    escalated,
  };
}

/** Postmenstrual age and days since birth at `now`. */
export function ages(birthAtMs: number, gestationWeeks: number, gestationDays: number, now: Date) {
  const ageDays = Math.max(0, Math.floor((now.getTime() - birthAtMs) / DAY_MS));
  const total = gestationWeeks * 7 + gestationDays + ageDays;
  return { ageDays, correctedWeeks: Math.floor(total / 7), correctedDays: total % 7 };
}

function groupBy<T>(rows: T[], key: (row: T) => string): Map<string, T[]> {
  const map = new Map<string, T[]>();
  for (const row of rows) {
    const k = key(row);
    const list = map.get(k);
    if (list) list.push(row);
    else map.set(k, [row]);
  }
  return map;
}

/**
 * Summaries of many infants at once: one query per table for all the ids, then the rules per
 * infant in memory. Readings are those of the last 72 h, plus the last remote-site check when
 * none falls in the window (the schedule runs from it), plus every version of each chain.
 * Returned in the order of `infantIds`; unknown ids are skipped.
 */
export function summarizeInfants(sqlite: Database.Database, infantIds: string[], now: Date): InfantSummary[] {
  if (infantIds.length === 0) return [];
  const ids = JSON.stringify([...new Set(infantIds)]);
  const since = now.getTime() - SUMMARY_WINDOW_HOURS * 3_600_000;

  const infants = prepared(
    sqlite,
      `SELECT i.id, i.unit_id, i.bed_id, b.label AS bed_label, i.display_name, i.birth_at, i.gestation_weeks, i.gestation_days,
              i.weight_grams, i.heat_source, i.admitted_at
         FROM infants i LEFT JOIN beds b ON b.id = i.bed_id
        WHERE i.id IN (SELECT value FROM json_each(?))`,
    )
    .all(ids) as InfantRow[];
  if (infants.length === 0) return [];

  const unitIds = JSON.stringify([...new Set(infants.map((i) => i.unit_id))]);
  const units = prepared(sqlite, 'SELECT * FROM units WHERE id IN (SELECT value FROM json_each(?))').all(unitIds) as UnitRow[];
  const policies = new Map<string, UnitPolicy>(units.map((u) => [u.id, policyForUnit(u)]));

  // Correction chains are rare: the version-chain walk (a recursive query, two thirds of a board
  // build when it ran for every unit) is needed only when one of these infants has one.
  const corrected = prepared(sqlite, 'SELECT 1 FROM readings INDEXED BY readings_replaces WHERE replaces_id IS NOT NULL AND infant_id IN (SELECT value FROM json_each(?)) LIMIT 1')
    .get(ids);
  const picked = `
         picked(id) AS (
           SELECT r.id FROM readings r WHERE r.infant_id IN (SELECT id FROM ids) AND r.taken_at >= @since
           UNION
           SELECT (SELECT x.id FROM readings x
                    WHERE x.infant_id = ids.id AND x.remote_centi IS NOT NULL AND x.entered_in_error = 0 AND x.taken_at < @since
                      AND NOT EXISTS (SELECT 1 FROM readings y WHERE y.replaces_id = x.id)
                    ORDER BY x.taken_at DESC, x.recorded_at DESC LIMIT 1)
             FROM ids
            WHERE NOT EXISTS (SELECT 1 FROM readings z WHERE z.infant_id = ids.id AND z.remote_centi IS NOT NULL AND z.taken_at >= @since)
         )`;
  const rawReadings = prepared(
    sqlite,
      corrected
        ? `WITH RECURSIVE
         ids(id) AS (SELECT value FROM json_each(@ids)),${picked},
         up(id) AS (
           SELECT id FROM picked WHERE id IS NOT NULL
           UNION SELECT r.replaces_id FROM readings r JOIN up ON r.id = up.id WHERE r.replaces_id IS NOT NULL
         ),
         down(id) AS (
           SELECT id FROM up
           UNION SELECT r.id FROM readings r JOIN down ON r.replaces_id = down.id
         )
       SELECT r.infant_id, ${RULE_COLUMNS_R} FROM readings r WHERE r.id IN (SELECT id FROM down) ORDER BY r.taken_at, r.recorded_at`
        : `WITH
         ids(id) AS (SELECT value FROM json_each(@ids)),${picked}
       SELECT r.infant_id, ${RULE_COLUMNS_R} FROM readings r WHERE r.id IN (SELECT id FROM picked) ORDER BY r.taken_at, r.recorded_at`,
    )
    .raw()
    .all({ ids, since }) as unknown[][];
  // Positional rows (see ruleReadingFromValues): the infant's id, then the rules' columns.
  const readings = rawReadings.map((values) => ({ infantId: values[0] as string, reading: ruleReadingFromValues(values, 1) }));

  const actions = prepared(
    sqlite,
      `SELECT a.id, a.infant_id, f.key AS flag_key, a.kind, a.at FROM actions a JOIN flags f ON f.id = a.flag_id
        WHERE a.infant_id IN (SELECT value FROM json_each(?)) AND a.at >= ? ORDER BY a.at`,
    )
    .all(ids, since) as Array<{ id: string; infant_id: string; flag_key: string; kind: string; at: number }>;

  const sessions = prepared(
    sqlite,
      `SELECT id, infant_id, started_at, ended_at, reference_centi, limit_centi FROM skin_to_skin_sessions
        WHERE infant_id IN (SELECT value FROM json_each(?)) AND (ended_at IS NULL OR ended_at >= ?) ORDER BY started_at`,
    )
    .all(ids, since) as Array<{ id: string; infant_id: string; started_at: number; ended_at: number | null; reference_centi: number; limit_centi: number }>;

  const storedFlags = prepared(
    sqlite,
      `SELECT f.id, f.infant_id, f.key, e.id AS escalation_id FROM flags f
         LEFT JOIN flag_resolutions r ON r.flag_id = f.id
         LEFT JOIN escalations e ON e.flag_id = f.id
        WHERE f.infant_id IN (SELECT value FROM json_each(?)) AND r.flag_id IS NULL`,
    )
    .all(ids) as Array<{ id: string; infant_id: string; key: string; escalation_id: string | null }>;

  const assignments = prepared(
    sqlite,
      `SELECT a.infant_id, a.shift_date, a.shift, a.created_at, u.id AS nurse_id, u.name AS nurse_name
         FROM assignments a JOIN users u ON u.id = a.nurse_id
        WHERE a.infant_id IN (SELECT value FROM json_each(?)) AND a.shift_date >= ?
        ORDER BY a.created_at, a.id`,
    )
    .all(ids, new Date(now.getTime() - 2 * DAY_MS).toISOString().slice(0, 10)) as Array<{
    infant_id: string;
    shift_date: string;
    shift: string;
    created_at: number;
    nurse_id: string;
    nurse_name: string;
  }>;

  const readingsBy = groupBy(readings, (r) => r.infantId);
  const actionsBy = groupBy(actions, (a) => a.infant_id);
  const sessionsBy = groupBy(sessions, (s) => s.infant_id);
  const flagsBy = groupBy(storedFlags, (f) => f.infant_id);
  const assignmentsBy = groupBy(assignments, (a) => a.infant_id);
  const slots = new Map(
    units.map((u) => [u.id, shiftAt(now, { dayShiftStart: u.day_shift_start, nightShiftStart: u.night_shift_start, timeZone: u.time_zone })]),
  );

  const byId = new Map<string, InfantSummary>();
  for (const infant of infants) {
    const policy = policies.get(infant.unit_id)!;
    const state: InfantState = {
      readings: (readingsBy.get(infant.id) ?? []).map((r) => r.reading),
      actions: (actionsBy.get(infant.id) ?? []).map((a) => ({ id: a.id, flagKey: a.flag_key, kind: a.kind, at: new Date(a.at) })),
      sessions: (sessionsBy.get(infant.id) ?? []).map((s) => ({
        id: s.id,
        startedAt: new Date(s.started_at),
        endedAt: s.ended_at === null ? null : new Date(s.ended_at),
        referenceCenti: s.reference_centi,
        limitCenti: s.limit_centi,
      })),
      admittedAt: new Date(infant.admitted_at),
    };
    const evaluation = evaluateInfant(state, now, policy);
    const stored = new Map((flagsBy.get(infant.id) ?? []).map((f) => [f.key, f]));
    const running = (sessionsBy.get(infant.id) ?? []).filter((s) => s.ended_at === null && s.started_at <= now.getTime()).pop();
    const slot = slots.get(infant.unit_id)!;
    const assigned = (assignmentsBy.get(infant.id) ?? []).filter((a) => a.shift_date === slot.shiftDate && a.shift === slot.shift).pop();
    const { latest } = evaluation;
    byId.set(infant.id, {
      id: infant.id,
      unitId: infant.unit_id,
      timeZone: policy.timeZone,
      bedId: infant.bed_id,
      bedLabel: infant.bed_label,
      displayName: infant.display_name,
      gestationWeeks: infant.gestation_weeks,
      gestationDays: infant.gestation_days,
      ...ages(infant.birth_at, infant.gestation_weeks, infant.gestation_days, now),
      weightGrams: infant.weight_grams,
      heatSource: infant.heat_source,
      controlMode: latest.controlMode,
      setCenti: latest.setCenti,
      latest: {
        probe: latest.probeCenti !== null && latest.probeTakenAt ? { centi: latest.probeCenti, takenAt: latest.probeTakenAt.toISOString() } : null,
        remote:
          latest.remoteCenti !== null && latest.remoteTakenAt
            ? { centi: latest.remoteCenti, site: latest.remoteSite, takenAt: latest.remoteTakenAt.toISOString() }
            : null,
      },
      nextCheck: nextCheckJson(evaluation.nextCheck),
      openFlags: evaluation.openFlags.map((flag) => {
        const row = stored.get(flag.key);
        const escalated = row?.escalation_id != null || flagEscalation(flag, now, policy).escalated;
        return openFlagJson(flag, row?.id ?? null, escalated);
      }),
      skinToSkin: running
        ? { id: running.id, startedAt: new Date(running.started_at).toISOString(), referenceCenti: running.reference_centi, limitCenti: running.limit_centi }
        : null,
      assignedNurse: assigned ? { id: assigned.nurse_id, name: assigned.nurse_name } : null,
    });
  }
  return [...new Set(infantIds)].map((id) => byId.get(id)).filter((s): s is InfantSummary => s !== undefined);
}
