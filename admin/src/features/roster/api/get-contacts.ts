import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { rosterKey } from './get-roster';

export type ContactLog = components['schemas']['ContactLogDto'];
export type Contact = components['schemas']['ContactDto'];

export const contactsKey = (studyId: string, enrollmentId: string) =>
  [...rosterKey(studyId), 'record', enrollmentId, 'contacts'] as const;

export async function getContacts(studyId: string, enrollmentId: string): Promise<ContactLog> {
  return unwrap(
    apiClient.GET('/api/studies/{studyId}/enrollments/{enrollmentId}/contacts', {
      params: { path: { studyId, enrollmentId } },
    }),
  );
}

export const contactsQueryOptions = (studyId: string, enrollmentId: string) =>
  queryOptions({ queryKey: contactsKey(studyId, enrollmentId), queryFn: () => getContacts(studyId, enrollmentId) });

export function useContacts(studyId: string, enrollmentId: string) {
  return useQuery(contactsQueryOptions(studyId, enrollmentId));
}
