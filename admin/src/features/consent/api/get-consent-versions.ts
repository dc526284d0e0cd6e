import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';

type ConsentVersionSchema = components['schemas']['ConsentVersionDto'];

/** The uploaded ethics approval letter as the api sends it (its OpenAPI schema leaves the object untyped). */
export interface ApprovalLetter {
  name: string | null;
  size: number;
  sha256: string;
}

export type ConsentVersion = Omit<ConsentVersionSchema, 'approvalLetter'> & { approvalLetter: ApprovalLetter | null };
export type ConsentVersionStatus = ConsentVersion['status'];

export const consentVersionsKey = (studyId: string) => ['consent-versions', studyId] as const;

export async function getConsentVersions(studyId: string): Promise<ConsentVersion[]> {
  const list = await unwrap(
    apiClient.GET('/api/studies/{studyId}/consent-versions', { params: { path: { studyId } } }),
  );
  return list.items as ConsentVersion[];
}

export const consentVersionsQueryOptions = (studyId: string) =>
  queryOptions({ queryKey: consentVersionsKey(studyId), queryFn: () => getConsentVersions(studyId) });

export function useConsentVersions(studyId: string) {
  return useQuery(consentVersionsQueryOptions(studyId));
}
