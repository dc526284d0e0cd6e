/** Everyone's role; the guards read it from the session, so it lives below every domain. */
export const USER_ROLES = ['participant', 'coordinator', 'researcher', 'auditor', 'admin'] as const;
export type UserRole = (typeof USER_ROLES)[number];
export const STAFF_ROLES = ['coordinator', 'researcher', 'auditor', 'admin'] as const;
export type StaffRole = (typeof STAFF_ROLES)[number];
