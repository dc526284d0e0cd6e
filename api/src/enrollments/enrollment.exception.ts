import { CommonRefusal, DomainException } from '../common/errors/domain.exception';

/** Why the enrollments domain refuses a request; each code's HTTP status is in the contract (problem.ts). */
export type EnrollmentRefusal =
  | 'PARTICIPATION_STATE'
  | 'NO_CONSENT_TO_SIGN'
  | 'STUDY_CLOSED'
  | 'PAIRING_NOT_APPLICABLE'
  | 'STEP_NOT_AVAILABLE'
  | 'STEP_HAS_NO_TASK'
  | 'STUDY_NOT_RECRUITING'
  | 'CONSENT_VERSION_STALE'
  | CommonRefusal;

/** A refusal of the enrollments domain, answered by the problem filter with its own code. */
export class EnrollmentException extends DomainException<EnrollmentRefusal> {}
