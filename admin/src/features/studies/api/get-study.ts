import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { studyKeys } from '@/lib/study-keys';

export type Study = components['schemas']['StudyDto'];
export type StudyStatus = Study['status'];
export type StudyDesign = Study['design'];

export async function getStudy(studyId: string): Promise<Study> {
  return unwrap(apiClient.GET('/api/studies/{studyId}', { params: { path: { studyId } } }));
}

export const studyQueryOptions = (studyId: string) =>
  queryOptions({ queryKey: studyKeys.detail(studyId), queryFn: () => getStudy(studyId) });

export function useStudy(studyId: string) {
  return useQuery(studyQueryOptions(studyId));
}
