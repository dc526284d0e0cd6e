import { type QueryClient, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { toApiError } from '@/lib/api-problem';
import type { paths } from '@evenhand/contract';
import { queryKeys } from '@/lib/query-keys';

/**
 * The signed-in person's place in one study. `next` says what the portal shows; `assignment` is participant-facing
 * only (the internal condition name never reaches the portal).
 */
export type MyEnrollment =
  paths['/api/studies/{studyId}/enrollments/me']['get']['responses'][200]['content']['application/json'];
export type ScreeningQuestion = MyEnrollment['screening']['questions'][number];
export type EnrollmentStep = MyEnrollment['steps'][number];

/** The signed-in person's enrollment in the study, or null when they have not joined it. */
export async function getMyEnrollment(studyId: string): Promise<MyEnrollment | null> {
  const { data, error, response } = await api.GET('/api/studies/{studyId}/enrollments/me', {
    params: { path: { studyId } },
  });
  if (response.status === 404) return null;
  if (error !== undefined || data === undefined) throw toApiError(error, response);
  return data;
}

export const myEnrollmentQueryOptions = (studyId: string) =>
  queryOptions({ queryKey: queryKeys.myEnrollment(studyId), queryFn: () => getMyEnrollment(studyId) });

export function useMyEnrollment(studyId: string, { enabled = true } = {}) {
  return useQuery({ ...myEnrollmentQueryOptions(studyId), enabled });
}

/** Every answer about the enrollment carries it whole; put it straight into the cache. */
export function storeMyEnrollment(queryClient: QueryClient, enrollment: MyEnrollment): void {
  queryClient.setQueryData(myEnrollmentQueryOptions(enrollment.studyId).queryKey, enrollment);
}
