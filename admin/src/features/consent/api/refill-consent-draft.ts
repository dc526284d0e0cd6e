import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import { templateValuesFrom, type ConsentValuesInput } from './create-consent-draft';
import { consentVersionKey } from './get-consent-version';
import { consentVersionsKey, type ConsentVersion } from './get-consent-versions';

export async function refillConsentDraft(
  studyId: string,
  versionId: string,
  input: ConsentValuesInput,
): Promise<ConsentVersion> {
  const refilled = await unwrap(
    apiClient.POST('/api/studies/{studyId}/consent-versions/{versionId}/refill', {
      params: { path: { studyId, versionId } },
      body: { values: templateValuesFrom(input) },
    }),
  );
  return refilled as ConsentVersion;
}

/** Fills a draft in again from its template and the study as it is now; the api answers with the new text. */
export function useRefillConsentDraft(studyId: string, versionId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: ConsentValuesInput) => refillConsentDraft(studyId, versionId, input),
    onSuccess: (version) => {
      queryClient.setQueryData(consentVersionKey(studyId, versionId), version);
      return queryClient.invalidateQueries({ queryKey: consentVersionsKey(studyId), exact: true });
    },
  });
}
