import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { isCalendarDate, localToday } from '../utils/calendar-date';
import { consentVersionKey } from './get-consent-version';
import { consentVersionsKey, type ConsentVersion } from './get-consent-versions';

export type ConsentDraftChanges = components['schemas']['UpdateConsentVersionDto'];

// Limits mirror UpdateConsentVersionDto in api/src/consent/dto/consent.dto.ts.
export const maxConsentBodyLength = 200_000;

export const consentBodyInputSchema = z.object({
  body: z
    .string()
    .refine((body) => body.trim().length > 0, 'The form needs some text.')
    .refine(
      (body) => body.length <= maxConsentBodyLength,
      `Keep the form under ${maxConsentBodyLength.toLocaleString('en')} characters.`,
    ),
});
export type ConsentBodyInput = z.infer<typeof consentBodyInputSchema>;

export const approvalDetailsInputSchema = z.object({
  approvalReference: z
    .string()
    .trim()
    .min(1, 'Enter the reference on the approval letter.')
    .max(120, 'Keep the reference under 120 characters.'),
  approvedAt: z
    .string()
    .min(1, 'Enter the date on the approval letter.')
    .refine(isCalendarDate, 'Enter the date as on the letter, for example 2026-11-20.')
    .refine(
      (date) => !isCalendarDate(date) || date <= localToday(),
      'The approval date cannot be in the future: enter the date printed on the letter.',
    ),
});
export type ApprovalDetailsInput = z.infer<typeof approvalDetailsInputSchema>;

export async function updateConsentDraft(
  studyId: string,
  versionId: string,
  changes: ConsentDraftChanges,
): Promise<ConsentVersion> {
  const updated = await unwrap(
    apiClient.PATCH('/api/studies/{studyId}/consent-versions/{versionId}', {
      params: { path: { studyId, versionId } },
      body: changes,
    }),
  );
  return updated as ConsentVersion;
}

/** Saves the form text or the approval details of a draft; the api answers with the new preview. */
export function useUpdateConsentDraft(studyId: string, versionId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (changes: ConsentDraftChanges) => updateConsentDraft(studyId, versionId, changes),
    onSuccess: (version) => {
      queryClient.setQueryData(consentVersionKey(studyId, versionId), version);
      return queryClient.invalidateQueries({ queryKey: consentVersionsKey(studyId), exact: true });
    },
  });
}
