import { useMutation } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';

export type ConsentCheck = components['schemas']['ConsentCheckDto'];
export type ConsentFinding = components['schemas']['ConsentFindingDto'];

/** Runs the required-elements check on the saved text of a version. */
export async function checkConsentVersion(studyId: string, versionId: string): Promise<ConsentCheck> {
  return unwrap(
    apiClient.POST('/api/studies/{studyId}/consent-versions/{versionId}/check', {
      params: { path: { studyId, versionId } },
    }),
  );
}

export function useCheckConsentVersion(studyId: string, versionId: string) {
  return useMutation({ mutationFn: () => checkConsentVersion(studyId, versionId) });
}
