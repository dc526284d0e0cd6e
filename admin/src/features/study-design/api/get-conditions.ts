import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { studyKeys } from '@/lib/study-keys';

export type Condition = components['schemas']['ConditionDto'];

export async function getConditions(studyId: string): Promise<Condition[]> {
  const list = await unwrap(apiClient.GET('/api/studies/{studyId}/conditions', { params: { path: { studyId } } }));
  return list.items;
}

export const conditionsQueryOptions = (studyId: string) =>
  queryOptions({ queryKey: studyKeys.conditions(studyId), queryFn: () => getConditions(studyId) });

export function useConditions(studyId: string) {
  return useQuery(conditionsQueryOptions(studyId));
}
