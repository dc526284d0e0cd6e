import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import { studyKeys } from '@/lib/study-keys';

/**
 * The study's steps, which a consent draft lists with their pay. Same request and cache entry as the set-up tab's
 * step list, so adding a step there refreshes this too.
 */
export const studyStepsQueryOptions = (studyId: string) =>
  queryOptions({
    queryKey: studyKeys.steps(studyId),
    queryFn: () => unwrap(apiClient.GET('/api/studies/{studyId}/steps', { params: { path: { studyId } } })),
  });

export function useStudySteps(studyId: string) {
  return useQuery(studyStepsQueryOptions(studyId));
}
