import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { paths } from '@evenhand/contract';

export type StudyList = paths['/api/studies']['get']['responses'][200]['content']['application/json'];
export type StudySummary = StudyList['items'][number];

export const studiesKey = ['studies'] as const;

export async function getStudies(): Promise<StudyList> {
  return unwrap(apiClient.GET('/api/studies'));
}

export const studiesQueryOptions = () => queryOptions({ queryKey: studiesKey, queryFn: getStudies });

export function useStudies() {
  return useQuery(studiesQueryOptions());
}
