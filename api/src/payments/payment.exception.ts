import { CommonRefusal, DomainException } from '../common/errors/domain.exception';

/** Why the payments domain refuses a request; each code's HTTP status and meaning are in the contract (problem.ts). */
export type PaymentRefusal = 'PROVIDER_UNAVAILABLE' | CommonRefusal;

/** A refusal of the payments domain, answered by the problem filter with its own code. */
export class PaymentException extends DomainException<PaymentRefusal> {}
