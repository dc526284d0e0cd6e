import { CommonRefusal, DomainException } from '../common/errors/domain.exception';

/** Why the studies domain refuses a request; each code's HTTP status and meaning are in the contract (problem.ts). */
export type StudyRefusal =
  | 'STUDY_SEALED'
  | 'STUDY_ARCHIVED'
  | 'SLUG_TAKEN'
  | 'CONDITION_NAME_TAKEN'
  | 'STUDY_DETAIL_FIXED'
  | 'STUDY_TRANSITION_NOT_ALLOWED'
  | 'STUDY_NOT_READY_TO_OPEN'
  | 'STUDY_NOT_CLOSED'
  | CommonRefusal;

/** A refusal of the studies domain, answered by the problem filter with its own code. */
export class StudyException extends DomainException<StudyRefusal> {}
