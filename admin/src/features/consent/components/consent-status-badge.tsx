import { Badge, type BadgeTone } from '@/components/ui/badge';
import type { ConsentVersionStatus } from '../api/get-consent-versions';

export const consentStatusLabels: Record<ConsentVersionStatus, { label: string; tone: BadgeTone }> = {
  draft: { label: 'Draft', tone: 'caution' },
  active: { label: 'Active', tone: 'success' },
  retired: { label: 'Retired', tone: 'neutral' },
};

export function ConsentStatusBadge({ status }: { status: ConsentVersionStatus }) {
  return <Badge tone={consentStatusLabels[status].tone}>{consentStatusLabels[status].label}</Badge>;
}
