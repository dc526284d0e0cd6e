import type { Role } from './role-access';

// Who may do what in a study, as the api's controllers allow it (studies, steps and assignment controllers).
const designers: readonly Role[] = ['coordinator', 'researcher', 'admin'];

/** Set up conditions, steps, factors, screening and the scheme; open, pause and close; run dry runs. */
export function mayDesignStudy(role: Role): boolean {
  return designers.includes(role);
}

/** Pay one condition differently: a researcher's decision. */
export function mayOverridePay(role: Role): boolean {
  return role === 'researcher' || role === 'admin';
}

/** Reveal the allocation before the study closes, with a recorded reason. */
export function mayUnblind(role: Role): boolean {
  return role === 'researcher' || role === 'admin';
}
