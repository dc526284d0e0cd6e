/** Every error code the api answers with, and its HTTP status: the one place codes meet statuses. */
export const HTTP_STATUS_BY_CODE = {
  /** Some fields are missing or invalid; `errors[]` names each field and what is wrong with it. */
  VALIDATION_FAILED: 400,
  /** The sign-in or password link is unknown, used already, expired or for another account. */
  LINK_INVALID: 400,
  /** A malformed request the api could not read further (the fallback for a bare 400). */
  BAD_REQUEST: 400,
  /** Staff cannot deactivate their own account or change their own role; another admin has to. */
  OWN_ACCOUNT_PROTECTED: 400,
  /** The e-mail and password do not match an active staff account. */
  INVALID_CREDENTIALS: 401,
  /** No session, or it ended: sign in again. */
  UNAUTHENTICATED: 401,
  /** The password was right and the account has two-factor sign-in on: send it again with `code` or `recoveryCode`. */
  TWO_FACTOR_REQUIRED: 401,
  /** The two-factor code or recovery code was wrong, or used already. */
  TWO_FACTOR_INVALID: 401,
  /** The person is signed in but their role (or kind of account) does not allow this. */
  FORBIDDEN: 403,
  /** The lab requires two-factor sign-in of admins and this admin has not set it up yet: only their account page works. */
  TWO_FACTOR_SETUP_REQUIRED: 403,
  /** Nothing by that id here, or not visible to this person (a study they are not a member of reads as absent). */
  NOT_FOUND: 404,
  /** Another account already has this e-mail address; `errors[]` names `email`. */
  EMAIL_TAKEN: 409,
  /** Only the fallback for a bare 409 from the framework; every domain refuses with a code of its own. */
  CONFLICT: 409,
  /** The consent form changed since it was opened (or since the person last signed); `currentVersion` names the one to read and sign. */
  CONSENT_VERSION_STALE: 409,
  /** The study is not recruiting (draft, paused or closed): no one may join, sign a first consent or be invited. */
  STUDY_NOT_RECRUITING: 409,
  /** Only a failed payout can be sent again; this one is owed, approved, on its way or paid. */
  PAYOUT_NOT_RETRYABLE: 409,
  /**
   * A study detail or part of its design that may no longer change after the first assignment; `errors[]` names each
   * field and why when the change named fields.
   */
  STUDY_DETAIL_FIXED: 409,
  // Enrollments, payouts and reporting refusals (one block, see api/src/enrollments and api/src/payouts).
  /** The participant's status does not allow this (screening after signing, signing while closed, withdrawing a completed participation…). */
  PARTICIPATION_STATE: 409,
  /** The study has no active consent form, so there is nothing to sign yet. */
  NO_CONSENT_TO_SIGN: 409,
  /** The study is closed: it takes no new participants and no more funding. */
  STUDY_CLOSED: 409,
  /** Pairing a cohort applies only to an open study whose assignment scheme is matched pairs. */
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
  // Studies refusals (api/src/studies/study.exception.ts); STUDY_SEALED is shared by every domain that edits a study.
  /** A closed study is sealed and cannot change: not its details, design, steps, consent or reminders. */
  STUDY_SEALED: 409,
  /** An archived study is kept as it was; take it out of the archive to look at it (it stays closed). */
  STUDY_ARCHIVED: 409,
  /** Another study already uses this link name; `errors[]` names `slug`. */
  SLUG_TAKEN: 409,
  /** Another condition of the study already has this internal name; `errors[]` names `internalName`. */
  CONDITION_NAME_TAKEN: 409,
  /** The study's status does not allow this change (opening a closed study, pausing a draft…). */
  STUDY_TRANSITION_NOT_ALLOWED: 409,
  /** The study cannot open yet; `errors[]` names each missing item of the opening checklist by its key. */
  STUDY_NOT_READY_TO_OPEN: 409,
  /** Only a closed study can be archived. */
  STUDY_NOT_CLOSED: 409,
  // Randomization refusals (api/src/randomization/randomization.exception.ts).
  /** No assignment scheme is chosen, so the study cannot open; `errors[]` names `assignmentScheme`. */
  SCHEME_MISSING: 409,
  /** The study has not been opened, so there is no sealed sequence to read, unblind or verify yet. */
  SEQUENCE_NOT_SEALED: 409,
  /** The seed is still sealed: the sequence can be verified after closure or an audited unblinding. */
  SEED_STILL_SEALED: 409,
  /** The study has been unblinded already; unblinding happens once. */
  ALREADY_UNBLINDED: 409,
  /** The study is not open for assignment (not opened yet, or its sequence changed meanwhile). */
  NOT_OPEN_FOR_ASSIGNMENT: 409,
  /** The cohort of a matched-pairs study has been paired already; matched pairs pair one batch. */
  COHORT_ALREADY_PAIRED: 409,
  /** Pairing needs at least two pretested people on the roster. */
  COHORT_TOO_SMALL: 409,
  /** The person is not part of the paired cohort, so matched-pairs assignment cannot place them. */
  NOT_IN_PAIRED_COHORT: 409,
  // Consent refusals (api/src/consent/consent.exception.ts).
  /** The consent version is approved, active or retired, so its text and letter are fixed: create a new draft. */
  CONSENT_VERSION_NOT_DRAFT: 409,
  /** The draft cannot be activated yet; `errors[]` names each missing approval detail or required element. */
  CONSENT_VERSION_NOT_READY: 409,
  // Steps and reminders refusals (api/src/steps/step.exception.ts, api/src/reminders/reminder.exception.ts).
  /** The step takes no completion code: it is finished in its task, or the research team checks it off. */
  STEP_TAKES_NO_CODE: 409,
  /** The person is no longer taking part, so the study does not contact them. */
  PERSON_NOT_TAKING_PART: 409,
  // Two-factor refusals (api/src/auth/auth.exception.ts, api/src/users/user.exception.ts).
  /** Two-factor sign-in is on already; turn it off first to set up a new authenticator app. */
  TWO_FACTOR_ALREADY_ON: 409,
  /** The set-up was not started, so there is no pending secret to confirm. */
  TWO_FACTOR_SETUP_NOT_STARTED: 409,
  /** Two-factor sign-in is off for this account; turn it on first. */
  TWO_FACTOR_OFF: 409,
  /** The lab requires two-factor sign-in of admins, so an admin cannot turn it off. */
  TWO_FACTOR_REQUIRED_BY_LAB: 409,
  /** The body or file is larger than the route takes. */
  PAYLOAD_TOO_LARGE: 413,
  /** The body or file is not of a type the route takes (e.g. a roster that is not CSV text). */
  UNSUPPORTED_MEDIA_TYPE: 415,
  /** Too many attempts in a short time; wait and try again. */
  RATE_LIMITED: 429,
  /** Something failed on the api's side; the details are in its log, not in the answer. */
  INTERNAL: 500,
  /** The api or a service it needs is not ready (the fallback for a bare 503); try again shortly. */
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
