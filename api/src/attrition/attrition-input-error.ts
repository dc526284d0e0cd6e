import { InvalidInputError } from '../common/errors/invalid-input.error';
import type { FieldError } from '../common/errors/error-codes';

/** Thrown when the figures handed to the attrition statistics are impossible; `field` names the offending input. */
export class AttritionInputError extends InvalidInputError {
  readonly summary = 'The figures for the dropout statistics are not possible.';
  readonly fieldErrors: FieldError[];

  constructor(
    readonly field: string,
    problem: string,
  ) {
    super(`${field}: ${problem}`);
    this.name = 'AttritionInputError';
    this.fieldErrors = [{ field, message: problem }];
  }
}

export function requireCount(value: number, field: string): number {
  if (!Number.isSafeInteger(value) || value < 0) {
    throw new AttritionInputError(field, `must be a whole number of participants ≥ 0, got ${String(value)}`);
  }
  return value;
}

export function requireFinite(value: number, field: string): number {
  if (!Number.isFinite(value)) {
    throw new AttritionInputError(field, `must be a finite number, got ${String(value)}`);
  }
  return value;
}

export function requireNonNegative(value: number, field: string): number {
  requireFinite(value, field);
  if (value < 0) throw new AttritionInputError(field, `must be ≥ 0, got ${String(value)}`);
  return value;
}

export function requireAtMost(value: number, limit: number, field: string, limitName: string): void {
  if (value > limit) {
    throw new AttritionInputError(field, `must not exceed ${limitName} (${limit}), got ${value}`);
  }
}

/** A share that is null rather than NaN when nobody is in the denominator. */
export function proportion(numerator: number, denominator: number): number | null {
  return denominator === 0 ? null : numerator / denominator;
}
