import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { studyKeys } from '@/lib/study-keys';
import type { ScreeningQuestion } from './get-screening-questions';

export type ScreeningQuestionInput = components['schemas']['ScreeningQuestionInputDto'];

export async function replaceScreeningQuestions(
  studyId: string,
  questions: ScreeningQuestionInput[],
): Promise<ScreeningQuestion[]> {
  const list = await unwrap(
    apiClient.PUT('/api/studies/{studyId}/screening-questions', { params: { path: { studyId } }, body: { questions } }),
  );
  return list.items;
}

export function useReplaceScreeningQuestions(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (questions: ScreeningQuestionInput[]) => replaceScreeningQuestions(studyId, questions),
    onSuccess: (items) => {
      queryClient.setQueryData(studyKeys.screening(studyId), items);
      return queryClient.invalidateQueries({ queryKey: studyKeys.screening(studyId) });
    },
  });
}
