import { Badge, type BadgeTone } from '@/components/ui/badge';
import type { PayoutStatus } from '../api/get-payouts';

export const payoutStatusOrder: readonly PayoutStatus[] = [
  'owed',
  'approved',
  'sending',
  'paid',
  'failed',
  'reversed',
  'cancelled',
];

export const payoutStatusLabels: Record<PayoutStatus, { label: string; tone: BadgeTone }> = {
  owed: { label: 'Owed', tone: 'neutral' },
  approved: { label: 'Approved', tone: 'spruce' },
  sending: { label: 'Sending', tone: 'spruce' },
  paid: { label: 'Paid', tone: 'success' },
  failed: { label: 'Failed', tone: 'danger' },
  reversed: { label: 'Reversed', tone: 'caution' },
  cancelled: { label: 'Cancelled', tone: 'neutral' },
};

export function PayoutStatusBadge({ status }: { status: PayoutStatus }) {
  const { label, tone } = payoutStatusLabels[status] ?? { label: status, tone: 'neutral' };
  return <Badge tone={tone}>{label}</Badge>;
}
