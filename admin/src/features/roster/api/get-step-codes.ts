import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { rosterKey } from './get-roster';

export type StepCodes = components['schemas']['StepCodesDto'];

export const stepCodesKey = (studyId: string, enrollmentId: string) =>
  [...rosterKey(studyId), 'record', enrollmentId, 'step-codes'] as const;

export async function getStepCodes(studyId: string, enrollmentId: string): Promise<StepCodes> {
  return unwrap(
    apiClient.GET('/api/studies/{studyId}/enrollments/{enrollmentId}/step-codes', {
      params: { path: { studyId, enrollmentId } },
    }),
  );
}

export const stepCodesQueryOptions = (studyId: string, enrollmentId: string) =>
  queryOptions({ queryKey: stepCodesKey(studyId, enrollmentId), queryFn: () => getStepCodes(studyId, enrollmentId) });

/** This participant's own codes; auditors may not see them, so the query waits until it is allowed. */
export function useStepCodes(studyId: string, enrollmentId: string, { enabled = true }: { enabled?: boolean } = {}) {
  return useQuery({ ...stepCodesQueryOptions(studyId, enrollmentId), enabled });
}
