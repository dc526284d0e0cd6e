import type { SelectOption } from '@/components/ui/select-field';
import type { StaffRole } from '@/lib/role-access';

// Wording from DESIGN.md "People and what they do", shortened.
export const staffRoleOptions: readonly SelectOption<StaffRole>[] = [
  { value: 'coordinator', label: 'Coordinator', description: 'Runs studies day to day: roster, steps, payouts' },
  { value: 'researcher', label: 'Researcher', description: 'Designs conditions, watches dropout, exports data' },
  { value: 'auditor', label: 'Auditor', description: 'Read-only: consent records and the audit trail' },
  { value: 'admin', label: 'Admin', description: 'Manages staff accounts' },
];
