import { Badge, type BadgeTone } from '@/components/ui/badge';
import type { EnrollmentStatus } from '../api/get-roster';

export const enrollmentStatusOrder: readonly EnrollmentStatus[] = [
  'invited',
  'screened',
  'excluded',
  'consented',
  'assigned',
  'active',
  'completed',
  'withdrew',
  'lost',
];

export const enrollmentStatusLabels: Record<EnrollmentStatus, { label: string; tone: BadgeTone }> = {
  invited: { label: 'Invited', tone: 'neutral' },
  screened: { label: 'Screened', tone: 'neutral' },
  excluded: { label: 'Excluded', tone: 'neutral' },
  consented: { label: 'Consented', tone: 'spruce' },
  assigned: { label: 'Assigned', tone: 'spruce' },
  active: { label: 'Active', tone: 'success' },
  completed: { label: 'Completed', tone: 'success' },
  withdrew: { label: 'Withdrew', tone: 'caution' },
  lost: { label: 'Lost to follow-up', tone: 'danger' },
};

export function EnrollmentStatusBadge({ status }: { status: EnrollmentStatus }) {
  return <Badge tone={enrollmentStatusLabels[status].tone}>{enrollmentStatusLabels[status].label}</Badge>;
}
