import { CommonRefusal, DomainException } from '../common/errors/domain.exception';

/** Why the steps domain refuses a request; each code's HTTP status and meaning are in the contract (problem.ts). */
export type StepRefusal = 'STUDY_SEALED' | 'STEP_TAKES_NO_CODE' | 'STEP_HAS_NO_TASK' | CommonRefusal;

/** A refusal of the steps domain, answered by the problem filter with its own code. */
export class StepException extends DomainException<StepRefusal> {}
