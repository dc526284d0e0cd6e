import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiClient, unwrap } from '@/lib/api-client';
import { rosterKey, type RosterEntry } from './get-roster';

// UndoCompletionDto in api/src/enrollments/dto/enrollment.dto.ts: 5 to 1000 characters, kept in the audit trail.
export const undoCompletionInputSchema = z.object({
  reason: z
    .string()
    .trim()
    .min(5, 'Say in at least 5 characters why the step is undone; the reason is kept in the audit trail.')
    .max(1000, 'Keep the reason under 1,000 characters.'),
});
export type UndoCompletionInput = z.infer<typeof undoCompletionInputSchema>;

export async function undoCompletion(
  studyId: string,
  enrollmentId: string,
  stepId: string,
  reason: string,
): Promise<RosterEntry> {
  return unwrap(
    apiClient.DELETE('/api/studies/{studyId}/enrollments/{enrollmentId}/steps/{stepId}/complete', {
      params: { path: { studyId, enrollmentId, stepId } },
      body: { reason },
    }),
  );
}

/** Undoes a completion (its unapproved pay is cancelled); refreshes the roster and the record. */
export function useUndoCompletion(studyId: string, enrollmentId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ stepId, reason }: { stepId: string; reason: string }) =>
      undoCompletion(studyId, enrollmentId, stepId, reason),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: rosterKey(studyId) }),
  });
}
