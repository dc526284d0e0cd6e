import { queryOptions, useQuery } from '@tanstack/react-query';
import type { components } from '@evenhand/contract';
import { apiClient, unwrap } from '@/lib/api-client';
import { studyKeys } from '@/lib/study-keys';

/** Where the dry run's covariate mix starts: the people screened so far, or an even mix before anyone is. */
export type DryRunStartingMix = components['schemas']['DryRunStartingMix'];

export const startingMixQueryOptions = (studyId: string) =>
  queryOptions({
    queryKey: [...studyKeys.assignment(studyId), 'starting-mix'] as const,
    queryFn: () =>
      unwrap(
        apiClient.GET('/api/studies/{studyId}/assignment/dry-run/starting-mix', { params: { path: { studyId } } }),
      ),
  });

export function useStartingMix(studyId: string, { enabled = true }: { enabled?: boolean } = {}) {
  return useQuery({ ...startingMixQueryOptions(studyId), enabled });
}
