import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { rosterKey } from './get-roster';

export type ParticipantRecord = components['schemas']['ParticipantRecordDto'];
export type SignatureSummary = components['schemas']['SignatureSummaryDto'];
export type TimelineEvent = components['schemas']['TimelineEventDto'];

export const participantRecordKey = (studyId: string, enrollmentId: string) =>
  [...rosterKey(studyId), 'record', enrollmentId] as const;

export async function getParticipantRecord(studyId: string, enrollmentId: string): Promise<ParticipantRecord> {
  return unwrap(
    apiClient.GET('/api/studies/{studyId}/enrollments/{enrollmentId}', { params: { path: { studyId, enrollmentId } } }),
  );
}

export const participantRecordQueryOptions = (studyId: string, enrollmentId: string) =>
  queryOptions({
    queryKey: participantRecordKey(studyId, enrollmentId),
    queryFn: () => getParticipantRecord(studyId, enrollmentId),
  });

export function useParticipantRecord(studyId: string, enrollmentId: string) {
  return useQuery(participantRecordQueryOptions(studyId, enrollmentId));
}
