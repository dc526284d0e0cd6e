import { CommonRefusal, DomainException } from '../common/errors/domain.exception';

/** Why the users domain refuses a request; each code's HTTP status and meaning are in the contract (problem.ts). */
export type UserRefusal = 'EMAIL_TAKEN' | 'OWN_ACCOUNT_PROTECTED' | 'TWO_FACTOR_OFF' | CommonRefusal;

/** A refusal of the users domain, answered by the problem filter with its own code. */
export class UserException extends DomainException<UserRefusal> {}
