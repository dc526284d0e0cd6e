import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { paths } from '@evenhand/contract';

export type StudyList = paths['/api/studies']['get']['responses'][200]['content']['application/json'];
export type StudySummary = StudyList['items'][number];

export const studiesKey = ['studies'] as const;

export async function getStudies(archived = false): Promise<StudyList> {
  return unwrap(apiClient.GET('/api/studies', archived ? { params: { query: { archived: 'true' } } } : {}));
}

// The current list keeps the plain key (others refresh it with exact: true); the archive sits beneath it.
export const studiesQueryOptions = (archived = false) =>
  queryOptions({ queryKey: archived ? [...studiesKey, 'archived'] : studiesKey, queryFn: () => getStudies(archived) });

export function useStudies(archived = false) {
  return useQuery(studiesQueryOptions(archived));
}
