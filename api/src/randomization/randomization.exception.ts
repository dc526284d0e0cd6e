import { CommonRefusal, DomainException } from '../common/errors/domain.exception';

/** Why the randomization domain refuses a request; each code's HTTP status and meaning are in the contract (problem.ts). */
export type RandomizationRefusal =
  | 'STUDY_SEALED'
  | 'STUDY_DETAIL_FIXED'
  | 'SCHEME_MISSING'
  | 'SEQUENCE_NOT_SEALED'
  | 'SEED_STILL_SEALED'
  | 'ALREADY_UNBLINDED'
  | 'NOT_OPEN_FOR_ASSIGNMENT'
  | 'PAIRING_NOT_APPLICABLE'
  | 'COHORT_ALREADY_PAIRED'
  | 'COHORT_TOO_SMALL'
  | 'NOT_IN_PAIRED_COHORT'
  | CommonRefusal;

/** A refusal of the randomization domain, answered by the problem filter with its own code. */
export class RandomizationException extends DomainException<RandomizationRefusal> {}
