import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { studyKeys } from '@/lib/study-keys';
import type { StepList } from './get-steps';

export type CreateStepBody = components['schemas']['CreateStepDto'];

export async function createStep(studyId: string, body: CreateStepBody): Promise<StepList> {
  return unwrap(apiClient.POST('/api/studies/{studyId}/steps', { params: { path: { studyId } }, body }));
}

/** The api answers with the whole list in its new order, so the cache takes it as is. */
export function useCreateStep(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateStepBody) => createStep(studyId, body),
    onSuccess: (steps) => {
      queryClient.setQueryData(studyKeys.steps(studyId), steps);
      return Promise.all([
        queryClient.invalidateQueries({ queryKey: studyKeys.steps(studyId) }),
        queryClient.invalidateQueries({ queryKey: studyKeys.openingChecklist(studyId) }),
      ]);
    },
  });
}
