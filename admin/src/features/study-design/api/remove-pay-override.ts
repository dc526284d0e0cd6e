import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import { studyKeys } from '@/lib/study-keys';
import type { StepList } from './get-steps';

export async function removePayOverride(studyId: string, stepId: string, conditionId: string): Promise<StepList> {
  return unwrap(
    apiClient.DELETE('/api/studies/{studyId}/steps/{stepId}/pay-overrides/{conditionId}', {
      params: { path: { studyId, stepId, conditionId } },
    }),
  );
}

export function useRemovePayOverride(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ stepId, conditionId }: { stepId: string; conditionId: string }) =>
      removePayOverride(studyId, stepId, conditionId),
    onSuccess: (steps) => {
      queryClient.setQueryData(studyKeys.steps(studyId), steps);
      return queryClient.invalidateQueries({ queryKey: studyKeys.steps(studyId) });
    },
  });
}
