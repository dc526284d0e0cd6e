import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { payoutKeys } from './payout-keys';

export type TaxThreshold = components['schemas']['TaxThresholdDto'];
export type TaxThresholdEntry = components['schemas']['TaxThresholdEntryDto'];

export async function getTaxThreshold(studyId: string): Promise<TaxThreshold> {
  return unwrap(apiClient.GET('/api/studies/{studyId}/payouts/tax-threshold', { params: { path: { studyId } } }));
}

export const taxThresholdQueryOptions = (studyId: string) =>
  queryOptions({ queryKey: payoutKeys.taxThreshold(studyId), queryFn: () => getTaxThreshold(studyId) });

export function useTaxThreshold(studyId: string) {
  return useQuery(taxThresholdQueryOptions(studyId));
}
