import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { placeFieldErrors } from './api-error';

/** Shows a failed save on the form: field problems on their inputs (focusing the first), the rest above the form. */
export function applyServerErrors<Values extends FieldValues>(
  error: unknown,
  formFields: readonly Path<Values>[],
  setError: UseFormSetError<Values>,
): void {
  const placement = placeFieldErrors(error, formFields);
  placement.fields.forEach(({ field, message }, index) =>
    setError(field, { type: 'server', message }, { shouldFocus: index === 0 }),
  );
  if (placement.formMessage) setError('root.server', { type: 'server', message: placement.formMessage });
}
