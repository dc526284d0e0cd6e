import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import { studyKeys } from '@/lib/study-keys';
import { consentVersionKey } from './get-consent-version';
import { consentVersionsKey, type ConsentVersion } from './get-consent-versions';

export async function activateConsentVersion(studyId: string, versionId: string): Promise<ConsentVersion> {
  const activated = await unwrap(
    apiClient.POST('/api/studies/{studyId}/consent-versions/{versionId}/activate', {
      params: { path: { studyId, versionId } },
    }),
  );
  return activated as ConsentVersion;
}

/** Activation also retires the previous version, so the whole list is refetched. */
export function useActivateConsentVersion(studyId: string, versionId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => activateConsentVersion(studyId, versionId),
    onSuccess: (version) => {
      queryClient.setQueryData(consentVersionKey(studyId, versionId), version);
      return Promise.all([
        queryClient.invalidateQueries({ queryKey: consentVersionsKey(studyId) }),
        queryClient.invalidateQueries({ queryKey: studyKeys.openingChecklist(studyId) }),
      ]);
    },
  });
}
