import { useMutation } from '@tanstack/react-query';
import type { DryRunResult } from '@evenhand/contract';
import { apiClient, unwrap } from '@/lib/api-client';
import type { SchemeMethod, SchemeSettings } from '../utils/scheme-settings';

/** How one covariate is spread among simulated arrivals (api/src/randomization/dry-run.ts). */
export type CovariateDistribution =
  | { kind: 'normal'; mean: number; sd: number }
  | { kind: 'categorical'; proportions: Record<string, number> }
  | { kind: 'numeric-values'; values: { value: number; probability: number }[] };

export interface DryRunRequest {
  arrivals: number;
  seed?: string;
  covariateMix: Record<string, CovariateDistribution>;
  method?: SchemeMethod;
  settings?: SchemeSettings;
}

export type { DryRunResult };
export type DryRunArm = DryRunResult['arms'][number];
export type DryRunStratum = DryRunResult['strata'][number];
export type DryRunFactorLevel = DryRunResult['factorLevels'][number];
export type DryRunImbalancePoint = DryRunResult['imbalanceOverTime'][number];

export async function runDryRun(studyId: string, request: DryRunRequest): Promise<DryRunResult> {
  const result = await unwrap(
    apiClient.POST('/api/studies/{studyId}/assignment/dry-run', { params: { path: { studyId } }, body: request }),
  );
  return result;
}

/** A simulation changes nothing stored, so nothing is invalidated. */
export function useRunDryRun(studyId: string) {
  return useMutation({ mutationFn: (request: DryRunRequest) => runDryRun(studyId, request) });
}
