import { writeTx } from '../../db/client';
import type { HandoverResponse } from '../../shared/types/board';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { notFound } from '../errors';
import { allow, assertUnit, secureRouter } from '../middleware/access';
import { loadInfant } from '../services/admissions';
import { buildHandover, handoverCsv, myInfantIds, unitInfantIds } from '../services/handover';

/** The shift handover: one infant, all of mine, the whole unit, and one infant's readings as CSV. */
export function handoverRouter(ctx: AppContext) {
  const router = secureRouter();
  const { sqlite } = ctx.database;

  const audit = (actorId: string, infantId: string, unitId: string, action: string) =>
    appendAudit(sqlite, { at: ctx.clock.now(), actorId, action, entityType: 'infant', entityId: infantId, unitId });

  /** Many infants' handovers, each read audited, in one answer. */
  const answerMany = (actorId: string, infantIds: string[], now: Date): HandoverResponse => {
    const infants = infantIds.map((id) => buildHandover(ctx, id, now)).filter((h) => h !== null);
    writeTx(sqlite, () => {
      for (const h of infants) audit(actorId, h.infant.id, loadInfant(ctx, h.infant.id).unit_id, 'handover-read');
    });
    return { generatedAt: now.toISOString(), infants };
  };

  router.get('/nurses/me/handover', allow(ctx, 'chart:read'), (req, res) => {
    const auth = req.auth!;
    const now = ctx.clock.now();
    const body = answerMany(auth.userId, myInfantIds(ctx, auth.userId, auth.unitIds, now), now);
    body.infants.sort((a, b) => (a.infant.bedLabel ?? '').localeCompare(b.infant.bedLabel ?? ''));
    res.json(body);
  });

  /** The charge nurse's handover to the next charge nurse: every admitted infant of the unit, by bed. */
  router.get('/units/:unitId/handover', allow(ctx, 'unit:manage'), (req, res) => {
    const { unitId } = req.params as { unitId: string };
    res.json(answerMany(req.auth!.userId, unitInfantIds(ctx, unitId), ctx.clock.now()));
  });

  router.get('/infants/:id/handover', allow(ctx, 'chart:read'), (req, res) => {
    const infant = loadInfant(ctx, (req.params as { id: string }).id);
    assertUnit(req, infant.unit_id);
    const now = ctx.clock.now();
    const handover = buildHandover(ctx, infant.id, now);
    if (!handover) throw notFound('That infant');
    writeTx(sqlite, () => audit(req.auth!.userId, infant.id, infant.unit_id, 'handover-read'));
    const body: HandoverResponse = { generatedAt: now.toISOString(), infants: [handover] };
    res.json(body);
  });

  router.get('/infants/:id/handover.csv', allow(ctx, 'chart:read'), (req, res) => {
    const infant = loadInfant(ctx, (req.params as { id: string }).id);
    assertUnit(req, infant.unit_id);
    const now = ctx.clock.now();
    const handover = buildHandover(ctx, infant.id, now);
    if (!handover) throw notFound('That infant');
    const user = sqlite.prepare('SELECT temp_unit FROM users WHERE id = ?').get(req.auth!.userId) as { temp_unit: 'C' | 'F' } | undefined;
    const unit = sqlite.prepare('SELECT time_zone FROM units WHERE id = ?').get(infant.unit_id) as { time_zone: string };
    writeTx(sqlite, () => audit(req.auth!.userId, infant.id, infant.unit_id, 'handover-export'));
    const safeName = handover.infant.displayName.replace(/[^A-Za-z0-9-]+/g, '-').replace(/^-|-$/g, '') || 'infant';
    res.set('Content-Type', 'text/csv; charset=utf-8');
    res.set('Content-Disposition', `attachment; filename="handover-${safeName}-${now.toISOString().slice(0, 10)}.csv"`);
    res.send(handoverCsv(handover, user?.temp_unit ?? 'C', unit.time_zone));
  });

  return router;
}
