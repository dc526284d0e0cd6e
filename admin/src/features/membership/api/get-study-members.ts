import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import { studyMembersKey } from './membership-keys';

export async function getStudyMembers(studyId: string) {
  return unwrap(apiClient.GET('/api/studies/{studyId}/members', { params: { path: { studyId } } }));
}

export const studyMembersQueryOptions = (studyId: string) =>
  queryOptions({ queryKey: studyMembersKey(studyId), queryFn: () => getStudyMembers(studyId) });

export function useStudyMembers(studyId: string) {
  return useQuery(studyMembersQueryOptions(studyId));
}
