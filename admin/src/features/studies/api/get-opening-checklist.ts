import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { studyKeys } from '@/lib/study-keys';

export type OpeningChecklist = components['schemas']['OpeningChecklistDto'];
export type OpeningChecklistItem = components['schemas']['OpeningChecklistItemDto'];

export async function getOpeningChecklist(studyId: string): Promise<OpeningChecklist> {
  return unwrap(apiClient.GET('/api/studies/{studyId}/opening-checklist', { params: { path: { studyId } } }));
}

export const openingChecklistQueryOptions = (studyId: string) =>
  queryOptions({ queryKey: studyKeys.openingChecklist(studyId), queryFn: () => getOpeningChecklist(studyId) });

export function useOpeningChecklist(studyId: string, { enabled = true }: { enabled?: boolean } = {}) {
  return useQuery({ ...openingChecklistQueryOptions(studyId), enabled });
}
