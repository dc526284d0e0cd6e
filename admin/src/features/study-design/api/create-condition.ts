import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { studyKeys } from '@/lib/study-keys';
import type { Condition } from './get-conditions';

export type CreateConditionBody = components['schemas']['CreateConditionDto'];

export async function createCondition(studyId: string, body: CreateConditionBody): Promise<Condition> {
  return unwrap(apiClient.POST('/api/studies/{studyId}/conditions', { params: { path: { studyId } }, body }));
}

/** A new condition changes the design, so an open study’s sealed sequence (on the assignment query) changes too. */
export function useCreateCondition(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateConditionBody) => createCondition(studyId, body),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: studyKeys.conditions(studyId) }),
        queryClient.invalidateQueries({ queryKey: studyKeys.assignment(studyId) }),
        queryClient.invalidateQueries({ queryKey: studyKeys.openingChecklist(studyId) }),
      ]),
  });
}
