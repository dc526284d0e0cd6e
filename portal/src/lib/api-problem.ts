/** The api's one error shape for every failure. */
export interface ApiProblem {
  statusCode: number;
  code: string;
  message: string;
  errors?: { field: string; message: string }[];
  /** Some failures carry more, e.g. a 409 on a signature names the consent version that is current now. */
  [detail: string]: unknown;
}

/** Thrown by every fetcher when the api answers with a failure. */
export class ApiError extends Error {
  readonly statusCode: number;
  readonly code: string;
  readonly fieldErrors: { field: string; message: string }[];
  readonly problem: ApiProblem;

  constructor(problem: ApiProblem) {
    super(problem.message);
    this.name = 'ApiError';
    this.statusCode = problem.statusCode;
    this.code = problem.code;
    this.fieldErrors = problem.errors ?? [];
    this.problem = problem;
  }
}

function isApiProblem(body: unknown): body is ApiProblem {
  if (typeof body !== 'object' || body === null) return false;
  const candidate = body as Record<string, unknown>;
  return typeof candidate.code === 'string' && typeof candidate.message === 'string';
}

/** Turns whatever came back with a failed response into an ApiError, even when the body is not the usual shape. */
export function toApiError(body: unknown, response: Response): ApiError {
  if (isApiProblem(body)) {
    return new ApiError({ ...body, statusCode: typeof body.statusCode === 'number' ? body.statusCode : response.status });
  }
  return new ApiError({
    statusCode: response.status,
    code: response.status >= 500 ? 'INTERNAL' : 'UNEXPECTED_RESPONSE',
    message: `The server answered ${response.status} ${response.statusText}`.trim(),
  });
}

export function isApiError(error: unknown, code?: string): error is ApiError {
  return error instanceof ApiError && (code === undefined || error.code === code);
}
