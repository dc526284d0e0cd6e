import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { studyKeys } from '@/lib/study-keys';

export type Assignment = components['schemas']['AssignmentDto'];
export type StratumBalance = components['schemas']['StratumBalanceDto'];

export async function getAssignment(studyId: string): Promise<Assignment> {
  return unwrap(apiClient.GET('/api/studies/{studyId}/assignment', { params: { path: { studyId } } }));
}

export const assignmentQueryOptions = (studyId: string) =>
  queryOptions({ queryKey: studyKeys.assignment(studyId), queryFn: () => getAssignment(studyId) });

/** `live` polls, so the balance table follows allocations as participants sign. */
export function useAssignment(studyId: string, { live = false }: { live?: boolean } = {}) {
  return useQuery({ ...assignmentQueryOptions(studyId), refetchInterval: live ? 15_000 : false });
}
