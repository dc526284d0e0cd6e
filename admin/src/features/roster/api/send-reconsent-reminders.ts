import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import { rosterKey } from './get-roster';

/** E-mails everyone who still has to sign the newest consent version. Resolves to the number of reminders sent. */
export async function sendReconsentReminders(studyId: string): Promise<number> {
  const result = await unwrap(
    apiClient.POST('/api/studies/{studyId}/enrollments/reconsent-reminders', { params: { path: { studyId } } }),
  );
  return result.count;
}

export function useSendReconsentReminders(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => sendReconsentReminders(studyId),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: rosterKey(studyId) }),
  });
}
