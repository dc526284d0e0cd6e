import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiClient, unwrap } from '@/lib/api-client';
import { rosterKey, type RosterEntry } from './get-roster';

export type ParticipationChange = 'lost' | 'withdraw';

// MarkLostDto / WithdrawDto in api/src/enrollments/dto/enrollment.dto.ts: the reason is optional, at most 1000 characters.
export const participationReasonInputSchema = z.object({
  reason: z.string().trim().max(1000, 'Keep the reason under 1000 characters.'),
});
export type ParticipationReasonInput = z.infer<typeof participationReasonInputSchema>;

export interface ParticipationChangeRequest {
  change: ParticipationChange;
  enrollmentId: string;
  reason: string;
}

/** Marks someone lost to follow-up, or records their withdrawal on their behalf. The record is kept either way. */
export async function changeParticipation(
  studyId: string,
  { change, enrollmentId, reason }: ParticipationChangeRequest,
): Promise<RosterEntry> {
  const body = reason.trim() ? { reason: reason.trim() } : {};
  const params = { path: { studyId, enrollmentId } };
  return change === 'lost'
    ? unwrap(apiClient.POST('/api/studies/{studyId}/enrollments/{enrollmentId}/lost', { params, body }))
    : unwrap(apiClient.POST('/api/studies/{studyId}/enrollments/{enrollmentId}/withdraw', { params, body }));
}

export function useChangeParticipation(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (request: ParticipationChangeRequest) => changeParticipation(studyId, request),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: rosterKey(studyId) }),
  });
}
