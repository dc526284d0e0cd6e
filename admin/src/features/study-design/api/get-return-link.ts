import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { studyKeys } from '@/lib/study-keys';

export type ReturnLinkSetup = components['schemas']['ReturnLinkSetupDto'];

export async function getReturnLink(studyId: string): Promise<ReturnLinkSetup> {
  return unwrap(apiClient.GET('/api/studies/{studyId}/steps/return-link', { params: { path: { studyId } } }));
}

export const returnLinkQueryOptions = (studyId: string) =>
  queryOptions({ queryKey: studyKeys.returnLink(studyId), queryFn: () => getReturnLink(studyId) });

export function useReturnLink(studyId: string) {
  return useQuery(returnLinkQueryOptions(studyId));
}
