import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { isApiError, toApiError } from '@/lib/api-problem';
import type { paths } from '@evenhand/contract';
import { isWebAddress, leaveForExternalPage } from '@/lib/external-page';
import { queryKeys } from '@/lib/query-keys';

export type StepTaskStart =
  paths['/api/studies/{studyId}/enrollments/me/steps/{stepId}/start']['get']['responses'][200]['content']['application/json'];

/** The lab's task for one step, addressed to this person: their reference and a freshly signed way back. */
export async function getStepTaskStart({
  studyId,
  stepId,
}: {
  studyId: string;
  stepId: string;
}): Promise<StepTaskStart> {
  const { data, error, response } = await api.GET('/api/studies/{studyId}/enrollments/me/steps/{stepId}/start', {
    params: { path: { studyId, stepId } },
  });
  if (error !== undefined || data === undefined) throw toApiError(error, response);
  if (!isWebAddress(data.url)) throw new Error(`url: the task address is not a web address ("${data.url}")`);
  return data;
}

/**
 * "Open the task": asks for the address, then leaves the portal for it. A mutation, not a cached query, although the
 * route is a GET: each press needs a fresh signed return address, and nothing on screen reads it.
 */
export function useStartStepTask() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: getStepTaskStart,
    onSuccess: (start) => leaveForExternalPage(start.url),
    onError: (error, { studyId }) => {
      // A 409 means the step's state moved on (not open yet, a new consent form, no longer taking part): show it as it is.
      if (isApiError(error, 'STEP_NOT_AVAILABLE') || isApiError(error, 'STEP_HAS_NO_TASK'))
        void queryClient.invalidateQueries({ queryKey: queryKeys.myEnrollmentAll(studyId) });
    },
  });
}
