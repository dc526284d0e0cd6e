import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { ApiError } from './api-error';

/** `blockSizes[0]` and `factors.0.key` both become dot paths: `blockSizes.0`, `factors.0.key`. */
export function normalizeApiField(field: string): string {
  return field.replace(/\[(\d+)\]/g, '.$1');
}

/**
 * Shows a failed save on a form whose fields do not match the api's names one to one (lists, nested rows):
 * `resolve` maps each api field path to a form path, or null when the form has no such input.
 * Field problems go on their inputs (the first is focused); everything else is shown above the form.
 */
export function applyApiFieldErrors<Values extends FieldValues>(
  error: unknown,
  setError: UseFormSetError<Values>,
  resolve: (apiField: string) => Path<Values> | null,
): void {
  if (!(error instanceof ApiError)) {
    setError('root.server', { type: 'server', message: 'Something went wrong. Check your connection and try again.' });
    return;
  }
  const placed = new Set<string>();
  const leftOver: string[] = [];
  for (const problem of error.fieldErrors) {
    const path = resolve(normalizeApiField(problem.field));
    if (path && !placed.has(path)) {
      setError(path, { type: 'server', message: problem.message }, { shouldFocus: placed.size === 0 });
      placed.add(path);
    } else if (!path) {
      leftOver.push(`${problem.field}: ${problem.message}`);
    }
  }
  if (placed.size === 0 || leftOver.length > 0) {
    setError('root.server', {
      type: 'server',
      message: leftOver.length > 0 ? `${error.message} ${leftOver.join('; ')}` : error.message,
    });
  }
}
