import { queryOptions, useQueries } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { toApiError } from '@/lib/api-problem';
import { queryKeys } from '@/lib/query-keys';
import type { paths } from '@evenhand/contract';

/** The signed-in person's own part in one study: where they are (`next`) and their standing (`status`). */
export type MyPlace =
  paths['/api/studies/{studyId}/enrollments/me']['get']['responses'][200]['content']['application/json'];

/**
 * Read under the same cache key as the study page's enrollment, so signing, finishing or stopping there shows here at
 * once. Null when the person has not joined (the api says 404).
 */
async function getMyPlace(studyId: string): Promise<MyPlace | null> {
  const { data, error, response } = await api.GET('/api/studies/{studyId}/enrollments/me', {
    params: { path: { studyId } },
  });
  if (response.status === 404) return null;
  if (error !== undefined || data === undefined) throw toApiError(error, response);
  return data;
}

const myPlaceQueryOptions = (studyId: string) =>
  queryOptions({ queryKey: queryKeys.myEnrollment(studyId), queryFn: () => getMyPlace(studyId) });

/** One question per study in the list; each card waits only for its own answer. */
export function useMyPlaces(studyIds: string[]) {
  return useQueries({ queries: studyIds.map((studyId) => myPlaceQueryOptions(studyId)) });
}
