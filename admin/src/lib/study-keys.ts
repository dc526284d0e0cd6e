/**
 * Query keys for one study's data, shared so a mutation in one feature can refresh what it changes in another
 * (e.g. saving conditions re-seals an open study's commitment). Invalidating `detail(id)` refreshes all of them.
 */
export const studyKeys = {
  detail: (studyId: string) => ['study', studyId] as const,
  conditions: (studyId: string) => ['study', studyId, 'conditions'] as const,
  steps: (studyId: string) => ['study', studyId, 'steps'] as const,
  factors: (studyId: string) => ['study', studyId, 'stratification-factors'] as const,
  screening: (studyId: string) => ['study', studyId, 'screening-questions'] as const,
  assignment: (studyId: string) => ['study', studyId, 'assignment'] as const,
  verification: (studyId: string) => ['study', studyId, 'assignment', 'verify'] as const,
  /** What the study still needs before it opens; set-up changes in any feature refresh it. */
  openingChecklist: (studyId: string) => ['study', studyId, 'opening-checklist'] as const,
  returnLink: (studyId: string) => ['study', studyId, 'return-link'] as const,
  reminderPlan: (studyId: string) => ['study', studyId, 'reminder-plan'] as const,
};
