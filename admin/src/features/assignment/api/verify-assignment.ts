import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { studyKeys } from '@/lib/study-keys';

export type Verification = components['schemas']['VerificationDto'];
export type AllocationCheck = components['schemas']['AllocationCheckDto'];

export async function verifyAssignment(studyId: string): Promise<Verification> {
  return unwrap(apiClient.GET('/api/studies/{studyId}/assignment/verify', { params: { path: { studyId } } }));
}

export const verificationQueryOptions = (studyId: string) =>
  queryOptions({ queryKey: studyKeys.verification(studyId), queryFn: () => verifyAssignment(studyId), staleTime: 0 });

/** Runs only when asked (`enabled`); the api answers 409 until the seed is revealed. */
export function useVerifyAssignment(studyId: string, enabled: boolean) {
  return useQuery({ ...verificationQueryOptions(studyId), enabled });
}
