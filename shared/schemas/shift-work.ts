import { z } from 'zod';
import { safeNote } from './safe-text';

/** The handover plan for one infant and the current shift, written on the handover screen. */
export const handoverPlanSchema = z.strictObject({
  plan: safeNote('Write the plan.').min(1, 'Write the plan, or leave it as it was.').max(2000, 'Keep the plan under 2,000 characters.'),
});
export type HandoverPlanInput = z.infer<typeof handoverPlanSchema>;

export interface HandoverPlan {
  infantId: string;
  shiftDate: string;
  shift: 'day' | 'night';
  plan: string;
  writtenBy: string | null;
  writtenAt: string;
}

const id = (what: string) =>
  z
    .string({ error: `Choose ${what}.` })
    .trim()
    .min(1, `Choose ${what}.`)
    .max(100);

/** Shift change: each nurse's infants in one step (one row per nurse). */
export const bulkAssignSchema = z
  .strictObject({
    shift: z.enum(['current', 'next'], { error: 'Choose this shift or the next.' }).default('next'),
    assignments: z
      .array(z.strictObject({ nurseId: id('a nurse'), infantIds: z.array(id('an infant')).min(1, 'Choose at least one infant for this nurse.').max(40) }))
      .min(1, 'Choose at least one nurse and their infants.')
      .max(40),
  })
  .superRefine((v, ctx) => {
    const seen = new Map<string, number>();
    v.assignments.forEach((a, i) =>
      a.infantIds.forEach((infantId, j) => {
        if (seen.has(infantId)) ctx.addIssue({ code: 'custom', path: ['assignments', i, 'infantIds', j], message: 'This infant is given to two nurses; choose one.' });
        seen.set(infantId, i);
      }),
    );
  });
export type BulkAssignInput = z.input<typeof bulkAssignSchema>;
export type BulkAssign = z.output<typeof bulkAssignSchema>;
