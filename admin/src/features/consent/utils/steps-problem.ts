import { ApiError } from '@/lib/api-error';

/** In place of the api's "steps: must list at least one step with its pay": the words staff act on. */
export const noStepsMessage =
  'Add at least one step with its pay on the Set-up tab first: the form tells people what each step pays.';

/** The api names the study's steps `steps`; no consent form has such an input, so the forms word it themselves. */
export function isStepsProblem(error: unknown): boolean {
  return error instanceof ApiError && error.fieldErrors.some((problem) => problem.field === 'steps');
}
