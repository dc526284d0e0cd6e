import { ApiError } from '@/lib/api-error';
import type { ConsentValueField } from '../api/create-consent-draft';
import { templateFieldLabels } from './template-field-labels';

/** Every template value input, as forms name them (for `applyServerErrors`). */
export const templateValueFieldNames = Object.keys(templateFieldLabels) as ConsentValueField[];

/** The api names template values `values.<field>`; the forms name them `<field>`. */
export function withoutValuesPrefix(error: unknown): unknown {
  if (!(error instanceof ApiError)) return error;
  return new ApiError({
    statusCode: error.statusCode,
    code: error.code,
    message: error.message,
    errors: error.fieldErrors.map((problem) => ({ ...problem, field: problem.field.replace(/^values\./, '') })),
  });
}
