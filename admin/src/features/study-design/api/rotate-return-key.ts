import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import { studyKeys } from '@/lib/study-keys';
import type { ReturnLinkSetup } from './get-return-link';

export async function rotateReturnKey(studyId: string): Promise<ReturnLinkSetup> {
  return unwrap(
    apiClient.POST('/api/studies/{studyId}/steps/return-link/rotate-key', { params: { path: { studyId } } }),
  );
}

/** New return links are signed with a fresh key; links already handed out keep working for the grace period. */
export function useRotateReturnKey(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => rotateReturnKey(studyId),
    onSuccess: (setup) => {
      queryClient.setQueryData(studyKeys.returnLink(studyId), setup);
      return queryClient.invalidateQueries({ queryKey: studyKeys.returnLink(studyId) });
    },
  });
}
