import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { studyKeys } from '@/lib/study-keys';

export type StratificationFactorList = components['schemas']['StratificationFactorListDto'];
export type StratificationFactor = components['schemas']['StratificationFactorDto'];

export async function getStratificationFactors(studyId: string): Promise<StratificationFactorList> {
  return unwrap(apiClient.GET('/api/studies/{studyId}/stratification-factors', { params: { path: { studyId } } }));
}

export const stratificationFactorsQueryOptions = (studyId: string) =>
  queryOptions({ queryKey: studyKeys.factors(studyId), queryFn: () => getStratificationFactors(studyId) });

export function useStratificationFactors(studyId: string) {
  return useQuery(stratificationFactorsQueryOptions(studyId));
}
