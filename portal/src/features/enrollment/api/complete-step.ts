import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import { isApiError, toApiError } from '@/lib/api-problem';
import type { paths } from '@evenhand/contract';
import { queryKeys } from '@/lib/query-keys';
import { type MyEnrollment, storeMyEnrollment } from './get-my-enrollment';

type CompleteStepOperation = paths['/api/studies/{studyId}/enrollments/me/steps/{stepId}/complete']['post'];
export type CompleteStepRequest = CompleteStepOperation['requestBody']['content']['application/json'];

/** The api keeps codes to 64 characters. */
export const COMPLETION_CODE_MAX = 64;

export const completionCodeFormSchema = z.object({
  code: z
    .string()
    .trim()
    .min(1, 'Please enter the code you were given at the end of this step.')
    .max(COMPLETION_CODE_MAX, `That is longer than any code: codes have at most ${COMPLETION_CODE_MAX} characters.`),
});

export type CompletionCodeFormValues = z.input<typeof completionCodeFormSchema>;

export async function completeStep({
  studyId,
  stepId,
  body,
}: {
  studyId: string;
  stepId: string;
  body: CompleteStepRequest;
}): Promise<MyEnrollment> {
  const { data, error, response } = await api.POST('/api/studies/{studyId}/enrollments/me/steps/{stepId}/complete', {
    params: { path: { studyId, stepId } },
    body,
  });
  if (error !== undefined || data === undefined) throw toApiError(error, response);
  return data;
}

/** A 409 that names the consent version now current: the person must sign it before any further step. */
export function needsReconsent(error: unknown): boolean {
  return isApiError(error, 'CONSENT_VERSION_STALE');
}

export function useCompleteStep() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: completeStep,
    onSuccess: (enrollment) => {
      storeMyEnrollment(queryClient, enrollment);
      // A completed step is owed its pay: the "Getting paid" page changes too.
      void queryClient.invalidateQueries({ queryKey: queryKeys.myPayAll });
    },
    onError: (error, { studyId }) => {
      // The enrollment now says "re-consent"; fetching it moves the study page on to the new form.
      if (needsReconsent(error)) void queryClient.invalidateQueries({ queryKey: queryKeys.myEnrollmentAll(studyId) });
    },
  });
}
