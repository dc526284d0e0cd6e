import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { toApiError } from '@/lib/api-problem';
import type { paths } from '@evenhand/contract';
import { storeMyEnrollment } from './get-my-enrollment';
import type { ScreeningRequest } from './screening-schema';

export type ScreeningResult =
  paths['/api/studies/{studyId}/enrollments/me/screening']['put']['responses'][200]['content']['application/json'];

export async function submitScreening({
  studyId,
  body,
}: {
  studyId: string;
  body: ScreeningRequest;
}): Promise<ScreeningResult> {
  const { data, error, response } = await api.PUT('/api/studies/{studyId}/enrollments/me/screening', {
    params: { path: { studyId } },
    body,
  });
  if (error !== undefined || data === undefined) throw toApiError(error, response);
  return data;
}

export function useSubmitScreening() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: submitScreening,
    onSuccess: (result) => storeMyEnrollment(queryClient, result.enrollment),
  });
}
