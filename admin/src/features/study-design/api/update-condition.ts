import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { studyKeys } from '@/lib/study-keys';
import type { Condition } from './get-conditions';

export type UpdateConditionBody = components['schemas']['UpdateConditionDto'];

export async function updateCondition(
  studyId: string,
  conditionId: string,
  body: UpdateConditionBody,
): Promise<Condition> {
  return unwrap(
    apiClient.PATCH('/api/studies/{studyId}/conditions/{conditionId}', {
      params: { path: { studyId, conditionId } },
      body,
    }),
  );
}

export function useUpdateCondition(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ conditionId, body }: { conditionId: string; body: UpdateConditionBody }) =>
      updateCondition(studyId, conditionId, body),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: studyKeys.conditions(studyId) }),
        queryClient.invalidateQueries({ queryKey: studyKeys.assignment(studyId) }),
        queryClient.invalidateQueries({ queryKey: studyKeys.openingChecklist(studyId) }),
      ]),
  });
}
