import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import { studyKeys } from '@/lib/study-keys';
import { studiesKey } from './get-studies';
import type { Study } from './get-study';

export type StudyTransition = 'open' | 'pause' | 'close';

export async function changeStudyStatus(studyId: string, transition: StudyTransition): Promise<Study> {
  const params = { params: { path: { studyId } } };
  if (transition === 'open') return unwrap(apiClient.POST('/api/studies/{studyId}/open', params));
  if (transition === 'pause') return unwrap(apiClient.POST('/api/studies/{studyId}/pause', params));
  return unwrap(apiClient.POST('/api/studies/{studyId}/close', params));
}

/** Opening seals the sequence and closing reveals the seed, so everything about the study is refreshed. */
export function useChangeStudyStatus(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (transition: StudyTransition) => changeStudyStatus(studyId, transition),
    onSuccess: async (study) => {
      queryClient.setQueryData(studyKeys.detail(studyId), study);
      await Promise.all([
        queryClient.invalidateQueries({ queryKey: studyKeys.detail(studyId) }),
        queryClient.invalidateQueries({ queryKey: studiesKey, exact: true }),
      ]);
    },
  });
}
