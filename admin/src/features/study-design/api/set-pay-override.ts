import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { studyKeys } from '@/lib/study-keys';
import type { StepList } from './get-steps';

export type SetPayOverrideBody = components['schemas']['SetPayOverrideDto'];

export async function setPayOverride(
  studyId: string,
  stepId: string,
  conditionId: string,
  body: SetPayOverrideBody,
): Promise<StepList> {
  return unwrap(
    apiClient.PUT('/api/studies/{studyId}/steps/{stepId}/pay-overrides/{conditionId}', {
      params: { path: { studyId, stepId, conditionId } },
      body,
    }),
  );
}

export function useSetPayOverride(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ stepId, conditionId, body }: { stepId: string; conditionId: string; body: SetPayOverrideBody }) =>
      setPayOverride(studyId, stepId, conditionId, body),
    onSuccess: (steps) => {
      queryClient.setQueryData(studyKeys.steps(studyId), steps);
      return queryClient.invalidateQueries({ queryKey: studyKeys.steps(studyId) });
    },
  });
}
