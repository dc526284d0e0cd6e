import { describe, expect, it } from 'vitest';
import { mayDesignStudy, mayOverridePay, mayUnblind } from './study-permissions';

// The roles each api route names in @Roles (api/src/studies/studies.controller.ts, steps/steps.controller.ts,
// randomization/assignment.controller.ts), and DESIGN.md: the researcher "unblinds at the end, with a recorded reason".
describe('study permissions', () => {
  it('lets coordinators and researchers set studies up, not auditors or participants', () => {
    expect(mayDesignStudy('coordinator')).toBe(true);
    expect(mayDesignStudy('researcher')).toBe(true);
    expect(mayDesignStudy('auditor')).toBe(false);
    expect(mayDesignStudy('participant')).toBe(false);
  });

  it('keeps pay exceptions and unblinding to researchers (and admins)', () => {
    expect(mayOverridePay('coordinator')).toBe(false);
    expect(mayOverridePay('researcher')).toBe(true);
    expect(mayUnblind('coordinator')).toBe(false);
    expect(mayUnblind('researcher')).toBe(true);
    expect(mayUnblind('admin')).toBe(true);
  });
});
