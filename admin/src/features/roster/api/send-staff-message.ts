import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { contactsKey, type ContactLog } from './get-contacts';
import { rosterKey } from './get-roster';

export type StaffMessageBody = components['schemas']['SendStaffMessageDto'];

// SendStaffMessageDto in api/src/reminders/dto/reminders.dto.ts.
export const staffMessageInputSchema = z.object({
  subject: z.string().trim().min(1, 'Enter a subject.').max(200, 'Keep the subject under 200 characters.'),
  message: z.string().trim().min(1, 'Write the message.').max(5000, 'Keep the message under 5,000 characters.'),
});
export type StaffMessageInput = z.infer<typeof staffMessageInputSchema>;

export async function sendStaffMessage(
  studyId: string,
  enrollmentId: string,
  body: StaffMessageBody,
): Promise<ContactLog> {
  return unwrap(
    apiClient.POST('/api/studies/{studyId}/enrollments/{enrollmentId}/contacts', {
      params: { path: { studyId, enrollmentId } },
      body,
    }),
  );
}

/** E-mails one participant and logs it as a contact; the answer is the whole contact log. */
export function useSendStaffMessage(studyId: string, enrollmentId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: StaffMessageBody) => sendStaffMessage(studyId, enrollmentId, body),
    onSuccess: (log) => {
      queryClient.setQueryData(contactsKey(studyId, enrollmentId), log);
      return queryClient.invalidateQueries({ queryKey: rosterKey(studyId) });
    },
  });
}
