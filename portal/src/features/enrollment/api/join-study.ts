import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { toApiError } from '@/lib/api-problem';
import { queryKeys } from '@/lib/query-keys';
import { type MyEnrollment, storeMyEnrollment } from './get-my-enrollment';

/** Joins the study; asking twice gives the same enrollment back (the api answers 200 the second time). */
export async function joinStudy(studyId: string): Promise<MyEnrollment> {
  const { data, error, response } = await api.POST('/api/studies/{studyId}/enrollments/me', {
    params: { path: { studyId } },
  });
  if (error !== undefined || data === undefined) throw toApiError(error, response);
  return data;
}

export function useJoinStudy() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: joinStudy,
    onSuccess: (enrollment) => {
      storeMyEnrollment(queryClient, enrollment);
      void queryClient.invalidateQueries({ queryKey: queryKeys.myStudies });
    },
  });
}
