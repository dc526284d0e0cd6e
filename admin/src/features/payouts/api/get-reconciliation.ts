import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { payoutKeys } from './payout-keys';

export type Reconciliation = components['schemas']['ReconciliationDto'];
export type ReconciliationDifference = components['schemas']['ReconciliationDifferenceDto'];

export async function getReconciliation(studyId: string): Promise<Reconciliation> {
  return unwrap(apiClient.GET('/api/studies/{studyId}/payouts/reconciliation', { params: { path: { studyId } } }));
}

/** Asks the provider only when someone presses the button: it lists every transfer, which takes a moment. */
export const reconciliationQueryOptions = (studyId: string, requested: boolean) =>
  queryOptions({
    queryKey: payoutKeys.reconciliation(studyId),
    queryFn: () => getReconciliation(studyId),
    enabled: requested,
    staleTime: Infinity,
  });

export function useReconciliation(studyId: string, requested: boolean) {
  return useQuery(reconciliationQueryOptions(studyId, requested));
}
