import { z } from 'zod';
import { checkPlausibility } from '@/shared/thermal/limits';
import type { TempUnit } from '@/shared/thermal/units';
import { centiOf, parseNumber } from './reading-form-values';

/** The start-skin-to-skin form's checks, loaded when the form first validates (components/forms/lazy-resolver.ts). */
export function startSessionFormSchema(unit: TempUnit) {
  return z
    .object({
      reference: z.string(),
      limit: z.enum(['50', '100']),
      carer: z.string().max(80, 'Keep the name under 80 characters.'),
    })
    .superRefine((v, ctx) => {
      const n = parseNumber(v.reference);
      const centi = centiOf(v.reference, unit);
      if (n === null) ctx.addIssue({ code: 'custom', path: ['reference'], message: 'Enter the reference temperature.' });
      else if (n === 'invalid' || centi === null)
        ctx.addIssue({ code: 'custom', path: ['reference'], message: `Reference temperature must be a number, like ${unit === 'C' ? '36.8' : '98.2'}.` });
      else {
        const check = checkPlausibility('remote', centi, unit);
        if (check.result === 'refuse') ctx.addIssue({ code: 'custom', path: ['reference'], message: check.reason });
      }
    });
}
