import { can, ROLES, type Permission, type Role } from './roles';

export type Caller = Role | 'anonymous';
export type Outcome = 'allowed' | 'unauthorized' | 'forbidden';

/**
 * The expected outcome of a call, read from the permission table in roles.ts: the one place
 * the role-matrix test and the server agree on. `unitScoped` routes name a unit's record in
 * their path; calling one for a unit the caller is not part of is forbidden.
 */
export function expectedOutcome(access: 'public' | 'signed-in' | Permission, caller: Caller, unit: 'own' | 'other', unitScoped: boolean): Outcome {
  if (access === 'public') return 'allowed';
  if (caller === 'anonymous') return 'unauthorized';
  if (access !== 'signed-in' && !can(caller, access)) return 'forbidden';
  if (unitScoped && unit === 'other') return 'forbidden';
  return 'allowed';
}

export const CALLERS: Caller[] = [...ROLES, 'anonymous'];
