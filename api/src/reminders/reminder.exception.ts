import { CommonRefusal, DomainException } from '../common/errors/domain.exception';

/** Why the reminders domain refuses a request; each code's HTTP status and meaning are in the contract (problem.ts). */
export type ReminderRefusal = 'STUDY_SEALED' | 'PERSON_NOT_TAKING_PART' | CommonRefusal;

/** A refusal of the reminders domain, answered by the problem filter with its own code. */
export class ReminderException extends DomainException<ReminderRefusal> {}
