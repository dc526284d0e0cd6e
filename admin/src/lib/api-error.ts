/** One field problem as the api reports it in `errors[]`. */
export interface ApiFieldError {
  field: string;
  message: string;
}

/** The api's single error shape, `{statusCode, code, message, errors?}`. */
export interface ApiProblem {
  statusCode: number;
  code: string;
  message: string;
  errors?: ApiFieldError[];
}

export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly fieldErrors: ApiFieldError[];

  constructor(problem: ApiProblem) {
    super(problem.message);
    this.name = 'ApiError';
    this.status = problem.statusCode;
    this.code = problem.code;
    this.fieldErrors = problem.errors ?? [];
  }
}

const fallbackMessages: Record<number, string> = {
  401: 'Your session has ended. Please sign in again.',
  403: 'You do not have access to this.',
  404: 'Not found.',
  429: 'Too many attempts. Please wait a minute and try again.',
};

/** Reads whatever a failed response carried into the api's error shape, tolerating non-JSON bodies (e.g. a proxy's 502 page). */
export function toApiProblem(status: number, body: unknown): ApiProblem {
  if (typeof body === 'object' && body !== null) {
    const candidate = body as Record<string, unknown>;
    if (typeof candidate.code === 'string' && typeof candidate.message === 'string') {
      const errors = Array.isArray(candidate.errors)
        ? candidate.errors.filter(
            (item): item is ApiFieldError =>
              typeof item === 'object' &&
              item !== null &&
              typeof (item as ApiFieldError).field === 'string' &&
              typeof (item as ApiFieldError).message === 'string',
          )
        : undefined;
      return {
        statusCode: typeof candidate.statusCode === 'number' ? candidate.statusCode : status,
        code: candidate.code,
        message: candidate.message,
        ...(errors && errors.length > 0 ? { errors } : {}),
      };
    }
  }
  return {
    statusCode: status,
    code: status >= 500 ? 'INTERNAL' : 'UNKNOWN',
    message: fallbackMessages[status] ?? `The server could not complete the request (HTTP ${status}).`,
  };
}

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
