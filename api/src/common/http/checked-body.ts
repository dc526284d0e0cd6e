import { PipeTransform } from '@nestjs/common';
import type { Checked } from '@evenhand/contract';
import { ValidationException } from '../errors/domain.exception';

/**
 * Checks a body with one of the contract's schemas (bodies whose shape depends on a field, e.g. a scheme's method):
 * a refusal is the usual 400 VALIDATION_FAILED naming each field.
 */
export class CheckedBody<T> implements PipeTransform<unknown, T> {
  constructor(private readonly check: (input: unknown) => Checked<T>) {}

  transform(value: unknown): T {
    const checked = this.check(value);
    if (!checked.ok) throw new ValidationException(checked.errors);
    return checked.value;
  }
}
