import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { studyKeys } from '@/lib/study-keys';

export type ScreeningQuestion = components['schemas']['ScreeningQuestionDto'];

export async function getScreeningQuestions(studyId: string): Promise<ScreeningQuestion[]> {
  const list = await unwrap(
    apiClient.GET('/api/studies/{studyId}/screening-questions', { params: { path: { studyId } } }),
  );
  return list.items;
}

export const screeningQuestionsQueryOptions = (studyId: string) =>
  queryOptions({ queryKey: studyKeys.screening(studyId), queryFn: () => getScreeningQuestions(studyId) });

export function useScreeningQuestions(studyId: string) {
  return useQuery(screeningQuestionsQueryOptions(studyId));
}
