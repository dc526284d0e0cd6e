/** Every error code the api answers with, and its HTTP status: the one place codes meet statuses. */
export const HTTP_STATUS_BY_CODE = {
  VALIDATION_FAILED: 400,
  LINK_INVALID: 400,
  BAD_REQUEST: 400,
  INVALID_CREDENTIALS: 401,
  UNAUTHENTICATED: 401,
  /** The password was right and the account has two-factor sign-in on: send it again with `code` or `recoveryCode`. */
  TWO_FACTOR_REQUIRED: 401,
  /** The two-factor code or recovery code was wrong, or used already. */
  TWO_FACTOR_INVALID: 401,
  FORBIDDEN: 403,
  /** The lab requires two-factor sign-in of admins and this admin has not set it up yet: only their account page works. */
  TWO_FACTOR_SETUP_REQUIRED: 403,
  NOT_FOUND: 404,
  EMAIL_TAKEN: 409,
  CONFLICT: 409,
  /** The consent form changed since it was opened (or since the person last signed); `currentVersion` names the one to read and sign. */
  CONSENT_VERSION_STALE: 409,
  /** The study is not recruiting (draft, paused or closed): no one may join, sign a first consent or be invited. */
  STUDY_NOT_RECRUITING: 409,
  /** Only a failed payout can be sent again; this one is owed, approved, on its way or paid. */
  PAYOUT_NOT_RETRYABLE: 409,
  /** A study detail that may no longer change (after the first assignment); `errors[]` names each field and why. */
  STUDY_DETAIL_FIXED: 409,
  // Enrollments, payouts and reporting refusals (one block, see api/src/enrollments and api/src/payouts).
  /** The participant's status does not allow this (screening after signing, signing while closed, withdrawing a completed participation…). */
  PARTICIPATION_STATE: 409,
  /** The study has no active consent form, so there is nothing to sign yet. */
  NO_CONSENT_TO_SIGN: 409,
  /** The study is closed: it takes no new participants and no more funding. */
  STUDY_CLOSED: 409,
  /** Pairing a cohort applies only to a study whose assignment scheme is matched pairs. */
  PAIRING_NOT_APPLICABLE: 409,
  /** The step cannot be completed now (not taking part, not open yet, or already all done); `errors[]` names why. */
  STEP_NOT_AVAILABLE: 409,
  /** The step is not done in an external task, so there is no task to open. */
  STEP_HAS_NO_TASK: 409,
  /** A completion whose payout was already approved cannot be undone. */
  PAYOUT_ALREADY_APPROVED: 409,
  /** Only owed payouts can be approved; `errors[]` names each payout that is not. */
  PAYOUT_NOT_OWED: 409,
  /** The study's funded balance does not cover the payouts; `neededMinor` and `remainingMinor` say by how much when approving. */
  BALANCE_TOO_LOW: 409,
  PAYLOAD_TOO_LARGE: 413,
  UNSUPPORTED_MEDIA_TYPE: 415,
  RATE_LIMITED: 429,
  INTERNAL: 500,
  UNAVAILABLE: 503,
  /** The payment provider does not answer or fails; nothing was changed, try again shortly. */
  PROVIDER_UNAVAILABLE: 503,
} as const;

/** A code the api itself sends. */
export type ErrorCode = keyof typeof HTTP_STATUS_BY_CODE;

/**
 * Codes a client may also see: the server could not be reached, something other than the api answered, or a file
 * the person chose could not be read before sending.
 */
export type ClientErrorCode = ErrorCode | 'NETWORK' | 'UNEXPECTED_RESPONSE' | 'FILE_UNREADABLE';

export interface FieldError {
  field: string;
  message: string;
}

/** The one JSON shape of every failure the api returns. */
export interface Problem {
  statusCode: number;
  code: ErrorCode;
  message: string;
  errors?: FieldError[];
}

/**
 * A failure as a client holds it. Some failures carry more than the four fields, e.g. a 409 on a signature
 * names the consent version that is current now.
 */
export interface ApiProblem {
  statusCode: number;
  code: ClientErrorCode;
  message: string;
  errors?: FieldError[];
  [detail: string]: unknown;
}

const knownCodes = new Set<string>(Object.keys(HTTP_STATUS_BY_CODE));

export function isErrorCode(code: unknown): code is ErrorCode {
  return typeof code === 'string' && knownCodes.has(code);
}

/** Thrown by every client call the api answers with a failure (or that never reached the api). */
export class ApiError extends Error {
  readonly statusCode: number;
  readonly code: ClientErrorCode;
  readonly fieldErrors: FieldError[];
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

export function isApiError(error: unknown, code?: ClientErrorCode): error is ApiError {
  return error instanceof ApiError && (code === undefined || error.code === code);
}

const fallbackMessages: Partial<Record<number, string>> = {
  401: 'Your session has ended. Please sign in again.',
  403: 'You do not have access to this.',
  404: 'Not found.',
  429: 'Too many attempts. Please wait a minute and try again.',
};

function isFieldError(item: unknown): item is FieldError {
  return (
    typeof item === 'object' &&
    item !== null &&
    typeof (item as FieldError).field === 'string' &&
    typeof (item as FieldError).message === 'string'
  );
}

/**
 * Reads whatever a failed response carried into the problem shape, tolerating bodies that are not the api's
 * (a proxy's 502 page, an empty body): those keep the HTTP status and get a plain message.
 */
export function toApiProblem(status: number, body: unknown): ApiProblem {
  if (typeof body === 'object' && body !== null) {
    const candidate = body as Record<string, unknown>;
    if (isErrorCode(candidate.code) && typeof candidate.message === 'string') {
      const errors = Array.isArray(candidate.errors) ? candidate.errors.filter(isFieldError) : [];
      const { errors: _ignored, ...rest } = candidate;
      void _ignored;
      return {
        ...rest,
        statusCode: typeof candidate.statusCode === 'number' ? candidate.statusCode : status,
        code: candidate.code,
        message: candidate.message,
        ...(errors.length > 0 ? { errors } : {}),
      };
    }
  }
  return {
    statusCode: status,
    code: status >= 500 && status !== 502 && status !== 504 ? 'INTERNAL' : 'UNEXPECTED_RESPONSE',
    message: fallbackMessages[status] ?? `The server could not complete the request (HTTP ${status}).`,
  };
}
