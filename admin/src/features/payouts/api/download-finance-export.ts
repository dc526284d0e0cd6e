import { useMutation } from '@tanstack/react-query';
import { apiClient } from '@/lib/api-client';
import { ApiError, toApiProblem } from '@/lib/api-error';
import { saveBlob } from '@/lib/save-blob';

export interface FinancePeriod {
  from: string;
  to: string;
}

/** Fetches the period's CSV through the session-aware client and saves it under the name the api gives it. */
export async function downloadFinanceExport(studyId: string, period: FinancePeriod): Promise<string> {
  let result;
  try {
    result = await apiClient.GET('/api/studies/{studyId}/payouts/finance-export.csv', {
      params: { path: { studyId }, query: period },
      parseAs: 'blob',
    });
  } catch {
    throw new ApiError({
      statusCode: 0,
      code: 'NETWORK',
      message: 'Could not reach the Evenhand server. Check your connection and try again.',
    });
  }
  if (!result.response.ok || !result.data) throw new ApiError(toApiProblem(result.response.status, result.error));
  const disposition = result.response.headers.get('Content-Disposition') ?? '';
  const fileName = /filename="([^"]+)"/.exec(disposition)?.[1] ?? `payments-${period.from}-to-${period.to}.csv`;
  saveBlob(result.data as Blob, fileName);
  return fileName;
}

export function useDownloadFinanceExport(studyId: string) {
  return useMutation({ mutationFn: (period: FinancePeriod) => downloadFinanceExport(studyId, period) });
}
