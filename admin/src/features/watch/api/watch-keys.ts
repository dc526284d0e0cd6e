import { studyKeys } from '@/lib/study-keys';

// Under the study's detail key, so invalidating the study refreshes the watch too.
export const watchKeys = {
  all: (studyId: string) => [...studyKeys.detail(studyId), 'attrition'] as const,
  report: (studyId: string, comparisonConditionId: string | null) =>
    [...watchKeys.all(studyId), 'report', comparisonConditionId ?? 'default'] as const,
  alerts: (studyId: string) => [...watchKeys.all(studyId), 'alerts'] as const,
};
