import { useMutation } from '@tanstack/react-query';
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

// The api documents these fields only as objects in its OpenAPI document; the shapes are those of
// DryRunResult in api/src/randomization/dry-run.ts.
export interface DryRunArm {
  armId: string;
  label: string;
  count: number;
  share: number;
  targetShare: number;
}

export interface DryRunStratum {
  stratumKey: string;
  total: number;
  counts: Record<string, number>;
  imbalance: number;
}

export interface DryRunFactorLevel {
  factorId: string;
  level: string;
  total: number;
  counts: Record<string, number>;
  imbalance: number;
}

export interface DryRunImbalancePoint {
  arrivals: number;
  overall: number;
  largestInStratum: number;
  largestInFactorLevel: number;
}

export interface DryRunResult {
  arrivals: number;
  arms: DryRunArm[];
  strata: DryRunStratum[];
  factorLevels: DryRunFactorLevel[];
  imbalanceOverTime: DryRunImbalancePoint[];
  largestImbalance: { overall: number; inStratum: number; inFactorLevel: number };
  finalImbalance: { overall: number; inStratum: number; inFactorLevel: number };
  matchedPairs: { pairs: number; leftoverParticipantId: string | null } | null;
  seed: string;
}

export async function runDryRun(studyId: string, request: DryRunRequest): Promise<DryRunResult> {
  const result = await unwrap(
    apiClient.POST('/api/studies/{studyId}/assignment/dry-run', { params: { path: { studyId } }, body: request }),
  );
  return result as unknown as DryRunResult;
}

/** A simulation changes nothing stored, so nothing is invalidated. */
export function useRunDryRun(studyId: string) {
  return useMutation({ mutationFn: (request: DryRunRequest) => runDryRun(studyId, request) });
}
