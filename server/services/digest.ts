import { TZDate } from '@date-fns/tz';
import { formatMinutes, formatPercent } from '../../shared/reports';
import { REVIEW_KIND_LABELS } from '../../shared/schemas/review';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { unitReport } from './reports';
import { and, asc, eq } from 'drizzle-orm';
import { drizzleOf, writeTx } from '../../db/client';
import { settings, units as unitsTable, userUnits, users } from '../../db/schema';
import { localDateOf, reviewQueue } from './review';

/** "16 Nov, 08:40" (or "16 Nov, 8:40 am") in the unit's zone, on the reader's clock: never UTC. */
export function digestTime(iso: string, timeZone: string, clock: '12h' | '24h'): string {
  return new Intl.DateTimeFormat('en-GB', {
    timeZone,
    day: 'numeric',
    month: 'short',
    hour: clock === '12h' ? 'numeric' : '2-digit',
    minute: '2-digit',
    hour12: clock === '12h',
  }).format(new Date(iso));
}

/** Monday 07:00 in each unit's own time zone. */
export const DIGEST_WEEKDAY = 1;
export const DIGEST_HOUR = 7;

function addDays(date: string, days: number): string {
  const [y, m, d] = date.split('-').map(Number);
  return new Date(Date.UTC(y!, m! - 1, d! + days)).toISOString().slice(0, 10);
}

export interface DigestResult {
  sent: number;
  units: string[];
}

/**
 * The weekly digest: for each unit, the last seven local days' figures and the review items
 * still without a teaching note, e-mailed to each active educator of the unit. Without `force`
 * a unit is sent only in its Monday 07:00 hour and only once that day.
 */
export async function sendWeeklyDigests(ctx: AppContext, now: Date, options: { unitIds?: string[]; force?: boolean; actorId?: string | null } = {}): Promise<DigestResult> {
  const { sqlite } = ctx.database;
  const db = drizzleOf(sqlite);
  const units = db.select({ id: unitsTable.id, name: unitsTable.name, timeZone: unitsTable.timeZone }).from(unitsTable).orderBy(asc(unitsTable.name)).all();
  const result: DigestResult = { sent: 0, units: [] };
  for (const unit of units) {
    if (options.unitIds && !options.unitIds.includes(unit.id)) continue;
    const today = localDateOf(now, unit.timeZone);
    const key = `digest:${unit.id}`;
    if (!options.force) {
      const local = new TZDate(now.getTime(), unit.timeZone);
      if (local.getDay() !== DIGEST_WEEKDAY || local.getHours() !== DIGEST_HOUR) continue;
      const last = db.select({ value: settings.value }).from(settings).where(eq(settings.key, key)).get();
      if (last?.value === today) continue;
    }
    const educators = db
      .select({ email: users.email, name: users.name, tempUnit: users.tempUnit, clock: users.clock })
      .from(users)
      .innerJoin(userUnits, eq(userUnits.userId, users.id))
      .where(and(eq(userUnits.unitId, unit.id), eq(users.role, 'educator'), eq(users.active, true)))
      .orderBy(asc(users.name))
      .all();
    const from = addDays(today, -7);
    const to = addDays(today, -1);
    const report = unitReport(ctx, { unitId: unit.id, from, to }, options.actorId ?? null);
    const openIn = (tempUnit: 'C' | 'F') => reviewQueue(ctx, [unit.id], { unitId: unit.id, status: 'unreviewed', from, to }, tempUnit).items;
    const open = openIn('C');
    const all = report.responseTimes[0]!;
    // Each educator reads the items' times in the unit's zone on her own clock, and temperatures in her own unit.
    const itemLines = (tempUnit: 'C' | 'F', clock: '12h' | '24h') =>
      openIn(tempUnit)
        .slice(0, 20)
        .map(
          (i) =>
            `  ${digestTime(i.raisedAt, unit.timeZone, clock)} · ${REVIEW_KIND_LABELS[i.kind]} · ${i.infantName} · ${i.shift} shift · ${i.nurse?.name ?? 'nurse unknown'} · ${i.summary}`,
        );
    const lines = (tempUnit: 'C' | 'F', clock: '12h' | '24h') =>
      [
        `Weekly digest for ${unit.name}, ${from} to ${to}.`,
        '',
        `On-time remote-site checks: ${formatPercent(report.onTime.overall.rate)} (${report.onTime.overall.onTime} of ${report.onTime.overall.checks})`,
        ...report.onTime.byShift.map((s) => `  ${s.shift} shifts: ${formatPercent(s.rate)} (${s.onTime} of ${s.checks})`),
        `Gap flags per 100 remote-site checks: ${report.gapRate.per100 === null ? '—' : report.gapRate.per100.toFixed(1)} (${report.gapRate.gapFlags} gap flags)`,
        `Flag to first action: median ${formatMinutes(all.toFirstAction.medianMinutes)}, 90th percentile ${formatMinutes(all.toFirstAction.p90Minutes)}`,
        `Flag to resolution: median ${formatMinutes(all.toResolution.medianMinutes)}, 90th percentile ${formatMinutes(all.toResolution.p90Minutes)}`,
        `Skin-to-skin time with a deviation: ${formatPercent(report.skinToSkin.share)}`,
        '',
        `Review items not yet reviewed: ${open.length} (times in the unit's time zone, ${unit.timeZone})`,
        ...itemLines(tempUnit, clock),
        open.length > 20 ? `  …and ${open.length - 20} more.` : '',
        '',
        `Open the review queue: ${ctx.config.publicUrl}/review`,
        'Medians are the middle value (for an even count, the mean of the two middle values); 90th percentiles are by nearest rank.',
      ].filter((l, i, a) => !(l === '' && a[i - 1] === ''));
    for (const educator of educators) {
      try {
        await ctx.mailer.send({
          to: [educator.email],
          subject: `Warmfold weekly digest: ${unit.name}, week to ${to}`,
          text: [`Hello ${educator.name},`, '', ...lines(educator.tempUnit === 'F' ? 'F' : 'C', educator.clock === '12h' ? '12h' : '24h')].join('\n'),
        });
        result.sent += 1;
      } catch (err) {
        ctx.log(`digest to ${educator.email} failed: ${String(err)}`);
      }
    }
    writeTx(sqlite, () => {
      // A send-now by an admin does not stand in for the Monday run.
      if (!options.force) {
        db.insert(settings)
          .values({ key, value: today, updatedAt: now })
          .onConflictDoUpdate({ target: settings.key, set: { value: today, updatedAt: now } })
          .run();
      }
      appendAudit(sqlite, {
        at: now,
        actorId: options.actorId ?? null,
        action: 'digest-sent',
        entityType: 'unit',
        entityId: unit.id,
        unitId: unit.id,
        after: { from, to, educators: educators.length, openItems: open.length },
      });
    });
    result.units.push(unit.id);
  }
  return result;
}

/** Checked hourly so each unit's Monday 07:00 is met in its own time zone. */
export function weeklyDigestJob() {
  return {
    name: 'weekly-digest',
    pattern: '0 0 * * * *',
    run: async (ctx: AppContext) => {
      const result = await sendWeeklyDigests(ctx, ctx.clock.now());
      if (result.units.length) ctx.log(`weekly digest: ${result.sent} e-mails for ${result.units.length} units`);
    },
  };
}
