import { useMutation } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';

export type AuditVerification = components['schemas']['AuditReportDto'];
export type ChainVerdict = components['schemas']['ChainVerdictDto'];

/** Asks the api to re-compute every chain from its first link. Run on request: it reads the whole log. */
export async function verifyAuditChains(): Promise<AuditVerification> {
  return unwrap(apiClient.GET('/api/audit/verify'));
}

export function useVerifyAuditChains() {
  return useMutation({ mutationFn: verifyAuditChains });
}
