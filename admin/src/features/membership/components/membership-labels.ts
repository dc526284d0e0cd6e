import type { SelectOption } from '@/components/ui/select-field';
import type { MembershipRole } from '../api/membership-keys';

export const membershipRoleLabels: Record<MembershipRole, SelectOption<MembershipRole>> = {
  coordinator: { value: 'coordinator', label: 'Coordinator', description: 'Runs the study: roster, steps, payouts' },
  researcher: { value: 'researcher', label: 'Researcher', description: 'Designs conditions, watches dropout' },
  auditor: { value: 'auditor', label: 'Auditor', description: 'Reads consent records and the trail' },
};

/** The api's refusal in plain words; it already speaks in sentences, so only a lost connection needs our own. */
export function membershipErrorMessage(error: unknown, fallback: string): string {
  return error instanceof Error && error.message ? error.message : fallback;
}
