import { describe, expect, it } from 'vitest';
import { areasFor, homePathFor, isStaffRole, mayUse, type Role } from './role-access';

// Checked against DESIGN.md "People and what they do" and the foundation brief (issue #2):
// admin manages staff (and, as lab owner, sees every study and the trail); coordinator and researcher work on
// studies; auditor reads the audit trail and every study's records (read-only); participants use the portal.
const expected: Record<Role, string[]> = {
  admin: ['staff', 'studies', 'audit'],
  coordinator: ['studies'],
  researcher: ['studies'],
  auditor: ['audit', 'studies'],
  participant: [],
};

describe('role access', () => {
  it.each(Object.entries(expected) as [Role, string[]][])('gives %s exactly its areas', (role, areas) => {
    expect([...areasFor(role)]).toEqual(areas);
  });

  it('keeps the staff page for admins only', () => {
    const roles: Role[] = ['participant', 'coordinator', 'researcher', 'auditor', 'admin'];
    expect(roles.filter((role) => mayUse(role, 'staff'))).toEqual(['admin']);
  });

  it('sends each staff role to its first area and participants nowhere', () => {
    expect(homePathFor('admin')).toBe('/staff');
    expect(homePathFor('coordinator')).toBe('/studies');
    expect(homePathFor('auditor')).toBe('/audit');
    expect(homePathFor('participant')).toBeNull();
    expect(isStaffRole('participant')).toBe(false);
    expect(isStaffRole('researcher')).toBe(true);
  });
});
