import type { ApiFieldError } from '@/lib/api-error';

/** The checklist's keys (OpeningChecklistItemDto.key) in the words the set-up screen uses for its sections. */
export const openingRequirementLabels: Record<string, string> = {
  conditions: 'Conditions',
  assignmentScheme: 'Assignment scheme',
  steps: 'Steps and pay',
  consent: 'Consent form',
};

/** Where on the study's pages each item is put right. */
export const openingRequirementPlaces: Record<string, string> = {
  conditions: 'setup#conditions',
  assignmentScheme: 'setup#scheme',
  steps: 'setup#steps',
  consent: 'consent',
};

/** The items a refused opening names (STUDY_NOT_READY_TO_OPEN or SCHEME_MISSING, with errors[]), each with its section's name and what is missing. */
export function missingOpeningItems(
  fieldErrors: readonly ApiFieldError[],
): { key: string; label: string; detail: string }[] {
  return fieldErrors.map((error) => ({
    key: error.field,
    label: openingRequirementLabels[error.field] ?? error.field,
    detail: error.message,
  }));
}
