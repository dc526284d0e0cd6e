import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { toApiError } from '@/lib/api-problem';
import type { paths } from '@evenhand/contract';

export type StudySummary =
  paths['/api/studies']['get']['responses'][200]['content']['application/json']['items'][number];

/** The studies the signed-in participant has joined. */
export async function getStudies(): Promise<StudySummary[]> {
  const { data, error, response } = await api.GET('/api/studies');
  if (error !== undefined || data === undefined) throw toApiError(error, response);
  return data.items;
}

export const studiesQueryOptions = queryOptions({ queryKey: ['studies', 'mine'], queryFn: getStudies });

export function useStudies() {
  return useQuery(studiesQueryOptions);
}
