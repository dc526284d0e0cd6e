import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { studyKeys } from '@/lib/study-keys';

export type StepList = components['schemas']['StepListDto'];
export type Step = components['schemas']['StepDto'];
export type PayOverride = components['schemas']['PayOverrideDto'];

export async function getSteps(studyId: string): Promise<StepList> {
  return unwrap(apiClient.GET('/api/studies/{studyId}/steps', { params: { path: { studyId } } }));
}

export const stepsQueryOptions = (studyId: string) =>
  queryOptions({ queryKey: studyKeys.steps(studyId), queryFn: () => getSteps(studyId) });

export function useSteps(studyId: string) {
  return useQuery(stepsQueryOptions(studyId));
}
