import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { RosterEntry } from './get-roster';
import { rosterKey } from './get-roster';

/** Staff mark one participant's step done; it is owed its pay at once. */
export async function completeStep(studyId: string, enrollmentId: string, stepId: string): Promise<RosterEntry> {
  return unwrap(
    apiClient.POST('/api/studies/{studyId}/enrollments/{enrollmentId}/steps/{stepId}/complete', {
      params: { path: { studyId, enrollmentId, stepId } },
    }),
  );
}

/** Refreshes the roster and this person's record (both under the roster's key). */
export function useCompleteStep(studyId: string, enrollmentId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (stepId: string) => completeStep(studyId, enrollmentId, stepId),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: rosterKey(studyId) }),
  });
}
