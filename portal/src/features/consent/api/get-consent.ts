import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { toApiError } from '@/lib/api-problem';
import type { paths } from '@evenhand/contract';
import { queryKeys } from '@/lib/query-keys';

/** The active consent form to read and sign; the first section of the full form is the key information. */
export type ConsentToSign =
  paths['/api/studies/{studyId}/enrollments/me/consent']['get']['responses'][200]['content']['application/json'];

export async function getConsentToSign(studyId: string): Promise<ConsentToSign> {
  const { data, error, response } = await api.GET('/api/studies/{studyId}/enrollments/me/consent', {
    params: { path: { studyId } },
  });
  if (error !== undefined || data === undefined) throw toApiError(error, response);
  return data;
}

export const consentToSignQueryOptions = (studyId: string) =>
  queryOptions({ queryKey: queryKeys.consentToSign(studyId), queryFn: () => getConsentToSign(studyId) });

export function useConsentToSign(studyId: string) {
  return useQuery(consentToSignQueryOptions(studyId));
}
