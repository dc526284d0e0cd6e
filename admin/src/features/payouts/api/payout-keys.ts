import { studyKeys } from '@/lib/study-keys';

/** Under the study's keys, so refreshing a study refreshes its pay data too. */
export const payoutKeys = {
  all: (studyId: string) => [...studyKeys.detail(studyId), 'pay'] as const,
  queue: (studyId: string) => [...payoutKeys.all(studyId), 'payouts'] as const,
  budget: (studyId: string) => [...payoutKeys.all(studyId), 'budget'] as const,
  reconciliation: (studyId: string) => [...payoutKeys.all(studyId), 'reconciliation'] as const,
  taxThreshold: (studyId: string) => [...payoutKeys.all(studyId), 'tax-threshold'] as const,
};
