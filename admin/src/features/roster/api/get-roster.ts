import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { studyKeys } from '@/lib/study-keys';

export type RosterPage = components['schemas']['RosterPageDto'];
export type RosterEntry = components['schemas']['RosterEntryDto'];
export type EnrollmentStatus = RosterEntry['status'];

export interface RosterQuery {
  status: EnrollmentStatus | null;
  needsReconsent: boolean;
  search: string;
  page: number;
  pageSize: number;
}

/** Under the study's keys, so refreshing a study (or an activation) refreshes its roster too. */
export const rosterKey = (studyId: string) => [...studyKeys.detail(studyId), 'roster'] as const;

export async function getRoster(
  studyId: string,
  { status, needsReconsent, search, page, pageSize }: RosterQuery,
): Promise<RosterPage> {
  const query = {
    page,
    pageSize,
    ...(status ? { status } : {}),
    ...(needsReconsent ? { needsReconsent: true } : {}),
    ...(search ? { search } : {}),
  };
  return unwrap(apiClient.GET('/api/studies/{studyId}/enrollments', { params: { path: { studyId }, query } }));
}

export const rosterQueryOptions = (studyId: string, query: RosterQuery) =>
  queryOptions({
    queryKey: [...rosterKey(studyId), 'page', query],
    queryFn: () => getRoster(studyId, query),
    // Keep the current rows on screen while the next filter, search or page loads.
    placeholderData: keepPreviousData,
  });

export function useRoster(studyId: string, query: RosterQuery) {
  return useQuery(rosterQueryOptions(studyId, query));
}

/** How many people still have to sign the newest consent version: one row is enough to read the total. */
export function useReconsentCount(studyId: string) {
  return useQuery({
    queryKey: [...rosterKey(studyId), 'reconsent-count'],
    queryFn: async () =>
      (await getRoster(studyId, { status: null, needsReconsent: true, search: '', page: 1, pageSize: 1 })).total,
  });
}
