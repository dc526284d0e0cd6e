import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import { consentVersionsKey, type ConsentVersion } from './get-consent-versions';

export const consentVersionKey = (studyId: string, versionId: string) =>
  [...consentVersionsKey(studyId), versionId] as const;

export async function getConsentVersion(studyId: string, versionId: string): Promise<ConsentVersion> {
  const version = await unwrap(
    apiClient.GET('/api/studies/{studyId}/consent-versions/{versionId}', { params: { path: { studyId, versionId } } }),
  );
  return version as ConsentVersion;
}

export const consentVersionQueryOptions = (studyId: string, versionId: string) =>
  queryOptions({
    queryKey: consentVersionKey(studyId, versionId),
    queryFn: () => getConsentVersion(studyId, versionId),
  });

export function useConsentVersion(studyId: string, versionId: string) {
  return useQuery(consentVersionQueryOptions(studyId, versionId));
}
