import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import { studyKeys } from '@/lib/study-keys';
import { studiesKey } from './get-studies';
import type { Study } from './get-study';

export async function setStudyArchived(studyId: string, archived: boolean): Promise<Study> {
  const params = { params: { path: { studyId } } };
  return archived
    ? unwrap(apiClient.POST('/api/studies/{studyId}/archive', params))
    : unwrap(apiClient.POST('/api/studies/{studyId}/unarchive', params));
}

/** Archiving moves a closed study between the default list and the archive; both lists refresh. */
export function useSetStudyArchived(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (archived: boolean) => setStudyArchived(studyId, archived),
    onSuccess: async (study) => {
      queryClient.setQueryData(studyKeys.detail(studyId), study);
      await queryClient.invalidateQueries({ queryKey: studiesKey });
    },
  });
}
