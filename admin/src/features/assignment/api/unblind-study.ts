import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiClient, unwrap } from '@/lib/api-client';
import { studyKeys } from '@/lib/study-keys';
import type { Assignment } from './get-assignment';

export const unblindInputSchema = z.object({
  reason: z
    .string()
    .trim()
    .min(10, 'Explain the reason in at least 10 characters; it is kept in the audit trail.')
    .max(2000, 'Keep the reason under 2,000 characters.'),
  confirmed: z.boolean().refine((ticked) => ticked, 'Tick the box to confirm you understand what unblinding reveals.'),
});

export type UnblindFormValues = z.input<typeof unblindInputSchema>;
export type UnblindInput = z.output<typeof unblindInputSchema>;

export async function unblindStudy(studyId: string, reason: string): Promise<Assignment> {
  return unwrap(apiClient.POST('/api/studies/{studyId}/unblind', { params: { path: { studyId } }, body: { reason } }));
}

/** Unblinding reveals the seed and the condition names, so everything about the study is refreshed. */
export function useUnblindStudy(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (reason: string) => unblindStudy(studyId, reason),
    onSuccess: (assignment) => {
      queryClient.setQueryData(studyKeys.assignment(studyId), assignment);
      return queryClient.invalidateQueries({ queryKey: studyKeys.detail(studyId) });
    },
  });
}
