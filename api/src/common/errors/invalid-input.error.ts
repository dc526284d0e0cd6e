import type { FieldError } from './error-codes';

/**
 * Base of the plain (Nest-free) errors a domain's computation throws on bad input, with the fields at fault.
 * The problem filter answers every one with 400 VALIDATION_FAILED, `summary` as the message and the field errors.
 */
export abstract class InvalidInputError extends Error {
  abstract readonly fieldErrors: FieldError[];
  /** One sentence for the problem's message; `message` keeps the field details for logs. */
  abstract readonly summary: string;
}
