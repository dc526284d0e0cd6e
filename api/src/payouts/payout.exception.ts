import { CommonRefusal, DomainException } from '../common/errors/domain.exception';

/** Why the payouts domain refuses a request; each code's HTTP status is in the contract (problem.ts). */
export type PayoutRefusal =
  | 'PAYOUT_ALREADY_APPROVED'
  | 'PAYOUT_NOT_OWED'
  | 'PAYOUT_NOT_RETRYABLE'
  | 'BALANCE_TOO_LOW'
  | 'STUDY_CLOSED'
  | CommonRefusal;

/** A refusal of the payouts domain, answered by the problem filter with its own code. */
export class PayoutException extends DomainException<PayoutRefusal> {}
