/** Every error code the api answers with, and its HTTP status: the one place codes meet statuses. */
export const HTTP_STATUS_BY_CODE = {
  VALIDATION_FAILED: 400,
  LINK_INVALID: 400,
  BAD_REQUEST: 400,
  INVALID_CREDENTIALS: 401,
  UNAUTHENTICATED: 401,
  FORBIDDEN: 403,
  NOT_FOUND: 404,
  EMAIL_TAKEN: 409,
  CONFLICT: 409,
  /** A study detail that may no longer change (after the first assignment); `errors[]` names each field and why. */
  STUDY_DETAIL_FIXED: 409,
  PAYLOAD_TOO_LARGE: 413,
  UNSUPPORTED_MEDIA_TYPE: 415,
  RATE_LIMITED: 429,
  INTERNAL: 500,
  UNAVAILABLE: 503,
  /** The payment provider does not answer or fails; nothing was changed, try again shortly. */
  PROVIDER_UNAVAILABLE: 503,
} as const;

export type ErrorCode = keyof typeof HTTP_STATUS_BY_CODE;

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
