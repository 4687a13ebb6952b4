import type { z } from 'zod';
import { dischargeInfantSchema, moveInfantSchema, updateInfantSchema, type DischargeInfant, type MoveInfantInput } from '../../shared/schemas/unit';
import type { AppContext } from '../context';
import { allow, secureRouter } from '../middleware/access';
import { valid, validate } from '../middleware/validate';
import { dischargeInfant, moveInfant, updateInfant } from '../services/admissions';
import { loadInfantFor } from '../services/infants';

type InfantParams = { id: string };

/** Moving, changing and discharging an admitted infant, mounted at /api/infants: the charge nurse's work. */
export function admissionsRouter(ctx: AppContext) {
  const router = secureRouter();
  const { sqlite } = ctx.database;

  router.post('/:id/move', allow(ctx, 'unit:manage'), validate('body', moveInfantSchema), (req, res) => {
    const infant = loadInfantFor(sqlite, req.auth!, (req.params as InfantParams).id);
    const { bedId } = valid<MoveInfantInput>(req, 'body');
    res.json({ infant: { id: infant.id, ...moveInfant(ctx, infant, bedId, req.auth!.userId) } });
  });

  router.patch('/:id', allow(ctx, 'unit:manage'), validate('body', updateInfantSchema), (req, res) => {
    const infant = loadInfantFor(sqlite, req.auth!, (req.params as InfantParams).id);
    res.json({ infant: updateInfant(ctx, infant, valid<z.output<typeof updateInfantSchema>>(req, 'body'), req.auth!.userId) });
  });

  router.post('/:id/discharge', allow(ctx, 'unit:manage'), validate('body', dischargeInfantSchema), (req, res) => {
    const infant = loadInfantFor(sqlite, req.auth!, (req.params as InfantParams).id);
    const result = dischargeInfant(ctx, infant, valid<DischargeInfant>(req, 'body'), req.auth!.userId);
    res.json({ infant: { id: infant.id, status: 'discharged' }, ...result });
  });

  return router;
}
