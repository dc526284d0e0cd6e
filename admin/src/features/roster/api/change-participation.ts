import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiClient, unwrap } from '@/lib/api-client';
import { studyKeys } from '@/lib/study-keys';
import { rosterKey, type RosterEntry } from './get-roster';

export type ParticipationChange = 'lost' | 'withdraw' | 'undo-lost';

// MarkLostDto / WithdrawDto in api/src/enrollments/dto/enrollment.dto.ts: the reason is optional, at most 1000 characters.
export const participationReasonInputSchema = z.object({
  reason: z.string().trim().max(1000, 'Keep the reason under 1000 characters.'),
});
export type ParticipationReasonInput = z.infer<typeof participationReasonInputSchema>;

// UndoLostDto in api/src/enrollments/dto/follow-up.dto.ts: the audit trail needs a reason of 5 to 1000 characters.
export const undoLostInputSchema = z.object({
  reason: z
    .string()
    .trim()
    .min(5, 'Say in a few words why they are taking part again (at least 5 characters).')
    .max(1000, 'Keep the reason under 1000 characters.'),
});

export const reasonSchemaFor = (change: ParticipationChange) =>
  change === 'undo-lost' ? undoLostInputSchema : participationReasonInputSchema;

export interface ParticipationChangeRequest {
  change: ParticipationChange;
  enrollmentId: string;
  reason: string;
}

/**
 * Marks someone lost to follow-up, undoes that mark when they turn up again, or records their withdrawal on their
 * behalf. The record is kept either way.
 */
export async function changeParticipation(
  studyId: string,
  { change, enrollmentId, reason }: ParticipationChangeRequest,
): Promise<RosterEntry> {
  const body = reason.trim() ? { reason: reason.trim() } : {};
  const params = { path: { studyId, enrollmentId } };
  if (change === 'undo-lost')
    return unwrap(
      apiClient.POST('/api/studies/{studyId}/enrollments/{enrollmentId}/lost/undo', {
        params,
        body: { reason: reason.trim() },
      }),
    );
  return change === 'lost'
    ? unwrap(apiClient.POST('/api/studies/{studyId}/enrollments/{enrollmentId}/lost', { params, body }))
    : unwrap(apiClient.POST('/api/studies/{studyId}/enrollments/{enrollmentId}/withdraw', { params, body }));
}

export function useChangeParticipation(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (request: ParticipationChangeRequest) => changeParticipation(studyId, request),
    // The dropout watch counts from the same statuses, so it is refetched too.
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: rosterKey(studyId) }),
        queryClient.invalidateQueries({ queryKey: [...studyKeys.detail(studyId), 'attrition'] }),
      ]),
  });
}
