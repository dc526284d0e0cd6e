import { CommonRefusal, DomainException } from '../common/errors/domain.exception';

/** Why the consent domain refuses a request; each code's HTTP status and meaning are in the contract (problem.ts). */
export type ConsentRefusal = 'CONSENT_VERSION_NOT_DRAFT' | 'CONSENT_VERSION_NOT_READY' | CommonRefusal;

/** A refusal of the consent domain, answered by the problem filter with its own code. */
export class ConsentException extends DomainException<ConsentRefusal> {}
