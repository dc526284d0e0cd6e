import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { studyKeys } from '@/lib/study-keys';
import type { StepList } from './get-steps';

export type UpdateStepBody = components['schemas']['UpdateStepDto'];

export async function updateStep(studyId: string, stepId: string, body: UpdateStepBody): Promise<StepList> {
  return unwrap(
    apiClient.PATCH('/api/studies/{studyId}/steps/{stepId}', { params: { path: { studyId, stepId } }, body }),
  );
}

export function useUpdateStep(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ stepId, body }: { stepId: string; body: UpdateStepBody }) => updateStep(studyId, stepId, body),
    onSuccess: (steps) => {
      queryClient.setQueryData(studyKeys.steps(studyId), steps);
      return queryClient.invalidateQueries({ queryKey: studyKeys.steps(studyId) });
    },
  });
}
