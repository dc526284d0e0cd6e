import { CommonRefusal, DomainException } from '../common/errors/domain.exception';

/** Why the auth domain refuses a request; each code's HTTP status and meaning are in the contract (problem.ts). */
export type AuthRefusal =
  | 'INVALID_CREDENTIALS'
  | 'LINK_INVALID'
  | 'TWO_FACTOR_REQUIRED'
  | 'TWO_FACTOR_INVALID'
  | 'TWO_FACTOR_SETUP_REQUIRED'
  | 'TWO_FACTOR_ALREADY_ON'
  | 'TWO_FACTOR_SETUP_NOT_STARTED'
  | 'TWO_FACTOR_OFF'
  | 'TWO_FACTOR_REQUIRED_BY_LAB'
  | CommonRefusal;

/** A refusal of the auth domain, answered by the problem filter with its own code. */
export class AuthException extends DomainException<AuthRefusal> {}
