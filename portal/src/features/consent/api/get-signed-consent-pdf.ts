import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { isApiError, toApiError } from '@/lib/api-problem';
import { queryKeys } from '@/lib/query-keys';

/** The signed PDF is made by a background job a few seconds after signing; until then the api says 404. */
export const PDF_READY_TRIES = 6;
export const PDF_RETRY_DELAY_MS = 2_000;

export async function getSignedConsentPdf(studyId: string): Promise<Blob> {
  const { data, error, response } = await api.GET('/api/studies/{studyId}/enrollments/me/consent.pdf', {
    params: { path: { studyId } },
    parseAs: 'blob',
  });
  if (error !== undefined || data === undefined) throw toApiError(error, response);
  return data;
}

export const isPdfNotReadyYet = (error: unknown) => isApiError(error) && error.statusCode === 404;

export const signedConsentPdfQueryOptions = (studyId: string, signedVersionId: string) =>
  queryOptions({
    queryKey: queryKeys.signedConsentPdf(studyId, signedVersionId),
    queryFn: () => getSignedConsentPdf(studyId),
    staleTime: Infinity,
    retry: (failureCount, error) => isPdfNotReadyYet(error) && failureCount < PDF_READY_TRIES - 1,
    retryDelay: PDF_RETRY_DELAY_MS,
  });

export function useSignedConsentPdf(studyId: string, signedVersionId: string) {
  return useQuery(signedConsentPdfQueryOptions(studyId, signedVersionId));
}
