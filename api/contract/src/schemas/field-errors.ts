import type { z } from 'zod';
import type { FieldError } from '../problem';

/** `conditions[1].weight` from zod's `['conditions', 1, 'weight']`: the field names the api's errors use. */
export function fieldPath(path: readonly PropertyKey[], prefix = ''): string {
  return path.reduce<string>((field, key) => {
    if (typeof key === 'number') return `${field}[${key}]`;
    return field === '' ? String(key) : `${field}.${String(key)}`;
  }, prefix);
}

/**
 * Every problem zod found, one per field and message in the order found: an unknown key becomes an error on that key,
 * and a problem with the whole value is named `whole` (e.g. "parameters"). `{field}` in a message becomes the field's name.
 */
export function fieldErrorsOf(error: z.ZodError, whole: string): FieldError[] {
  const errors: FieldError[] = [];
  const seen = new Set<string>();
  const add = (field: string, template: string) => {
    const message = template.replaceAll('{field}', field);
    const key = `${field}\u0000${message}`;
    if (seen.has(key)) return;
    seen.add(key);
    errors.push({ field, message });
  };
  for (const issue of error.issues) {
    const base = fieldPath(issue.path);
    if (issue.code === 'unrecognized_keys') {
      for (const key of issue.keys) add(base === '' ? key : `${base}.${key}`, issue.message);
    } else {
      add(base === '' ? whole : base, issue.message);
    }
  }
  return errors;
}

/** A value and the field errors that kept it from being valid. */
export type Checked<T> = { ok: true; value: T } | { ok: false; errors: FieldError[] };

/** Runs a schema and answers in the api's field-error shape. */
export function checkWith<S extends z.ZodType>(schema: S, input: unknown, whole: string): Checked<z.output<S>> {
  const result = schema.safeParse(input);
  return result.success ? { ok: true, value: result.data } : { ok: false, errors: fieldErrorsOf(result.error, whole) };
}

/** How a refused value is quoted back in a message: strings in quotes, a missing value as "nothing". */
export function describeValue(value: unknown): string {
  if (typeof value === 'string') return `"${value}"`;
  if (value === undefined) return 'nothing';
  return JSON.stringify(value) ?? String(value);
}
