import { ApiError } from '@evenhand/contract';

// The problem shape, its codes and the error class are the contract's (api/contract/src/problem.ts).
export { ApiError, isApiError, toApiProblem } from '@evenhand/contract';
export type { ApiProblem, FieldError as ApiFieldError } from '@evenhand/contract';

export interface FieldErrorPlacement<Field extends string> {
  fields: { field: Field; message: string }[];
  /** Problems that belong to no field on this form; shown above the form. */
  formMessage: string | null;
}

/**
 * Places a failed save onto a form: each `errors[]` entry on its field when the form has it,
 * an EMAIL_TAKEN conflict on `email`, everything else as a form-level message.
 */
export function placeFieldErrors<Field extends string>(
  error: unknown,
  formFields: readonly Field[],
): FieldErrorPlacement<Field> {
  if (!(error instanceof ApiError)) {
    return { fields: [], formMessage: 'Something went wrong. Check your connection and try again.' };
  }
  const isFormField = (name: string): name is Field => (formFields as readonly string[]).includes(name);
  const fields: { field: Field; message: string }[] = [];
  const leftOver: string[] = [];

  const emailField = 'email';
  if (error.code === 'EMAIL_TAKEN' && isFormField(emailField)) {
    fields.push({ field: emailField, message: error.message });
  }
  for (const problem of error.fieldErrors) {
    // class-validator reports nested fields with dots; the first segment names our input.
    const name = problem.field.split('.')[0] ?? problem.field;
    if (isFormField(name)) {
      if (!fields.some((placed) => placed.field === name)) fields.push({ field: name, message: problem.message });
    } else {
      leftOver.push(`${problem.field}: ${problem.message}`);
    }
  }

  if (fields.length === 0) return { fields, formMessage: leftOver.length > 0 ? leftOver.join(' ') : error.message };
  return { fields, formMessage: leftOver.length > 0 ? leftOver.join(' ') : null };
}
