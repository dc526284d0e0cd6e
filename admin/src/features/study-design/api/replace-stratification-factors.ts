import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { studyKeys } from '@/lib/study-keys';
import type { StratificationFactorList } from './get-stratification-factors';

export type StratificationFactorInput = components['schemas']['StratificationFactorInputDto'];

export async function replaceStratificationFactors(
  studyId: string,
  factors: StratificationFactorInput[],
): Promise<StratificationFactorList> {
  return unwrap(
    apiClient.PUT('/api/studies/{studyId}/stratification-factors', {
      params: { path: { studyId } },
      body: { factors },
    }),
  );
}

/** Factors are asked during screening and change the strata, so screening and the assignment refresh too. */
export function useReplaceStratificationFactors(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (factors: StratificationFactorInput[]) => replaceStratificationFactors(studyId, factors),
    onSuccess: (list) => {
      queryClient.setQueryData(studyKeys.factors(studyId), list);
      return Promise.all([
        queryClient.invalidateQueries({ queryKey: studyKeys.factors(studyId) }),
        queryClient.invalidateQueries({ queryKey: studyKeys.screening(studyId) }),
        queryClient.invalidateQueries({ queryKey: studyKeys.assignment(studyId) }),
      ]);
    },
  });
}
