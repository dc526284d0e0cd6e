export type Role = 'participant' | 'coordinator' | 'researcher' | 'auditor' | 'admin';
export type StaffRole = Exclude<Role, 'participant'>;
export type StaffArea = 'staff' | 'studies' | 'audit';

export const staffRoles: readonly StaffRole[] = ['coordinator', 'researcher', 'auditor', 'admin'];

export const roleLabels: Record<Role, string> = {
  participant: 'Participant',
  coordinator: 'Coordinator',
  researcher: 'Researcher',
  auditor: 'Auditor',
  admin: 'Admin',
};

export const areaPaths: Record<StaffArea, string> = {
  staff: '/staff',
  studies: '/studies',
  audit: '/audit',
};

export const areaLabels: Record<StaffArea, string> = {
  staff: 'Staff',
  studies: 'Studies',
  audit: 'Audit trail',
};

// What each role gets done, per DESIGN.md "People and what they do".
const areasByRole: Record<Role, readonly StaffArea[]> = {
  participant: [],
  coordinator: ['studies'],
  researcher: ['studies'],
  // Auditors read every study's records; admins manage staff and see every study and the trail.
  auditor: ['audit', 'studies'],
  admin: ['staff', 'studies', 'audit'],
};

export function isStaffRole(role: Role): role is StaffRole {
  return role !== 'participant';
}

export function areasFor(role: Role): readonly StaffArea[] {
  return areasByRole[role];
}

export function mayUse(role: Role, area: StaffArea): boolean {
  return areasByRole[role].includes(area);
}

/** Where a signed-in person lands: their first area, or null when this site has nothing for them. */
export function homePathFor(role: Role): string | null {
  const first = areasByRole[role][0];
  return first ? areaPaths[first] : null;
}
