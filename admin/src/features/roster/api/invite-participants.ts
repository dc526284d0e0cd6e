import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import { rosterKey } from './get-roster';

/** Sends invitation e-mails; without ids, to everyone on the roster not yet invited. Resolves to the number sent. */
export async function inviteParticipants(studyId: string, enrollmentIds?: string[]): Promise<number> {
  const result = await unwrap(
    apiClient.POST('/api/studies/{studyId}/enrollments/invite', {
      params: { path: { studyId } },
      body: enrollmentIds ? { enrollmentIds } : {},
    }),
  );
  return result.count;
}

export function useInviteParticipants(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (enrollmentIds?: string[]) => inviteParticipants(studyId, enrollmentIds),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: rosterKey(studyId) }),
  });
}
