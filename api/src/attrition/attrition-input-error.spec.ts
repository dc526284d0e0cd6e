import { describe, expect, it } from 'vitest';
import { toProblem } from '../common/errors/problem.filter';
import { requireCount } from './attrition-input-error';

describe('AttritionInputError in the problem filter', () => {
  it('answers impossible figures with 400 VALIDATION_FAILED naming the field, not a 500', () => {
    let thrown: unknown;
    try {
      requireCount(-1, 'conditions[0].randomized');
    } catch (error) {
      thrown = error;
    }
    expect(toProblem(thrown)).toEqual({
      statusCode: 400,
      code: 'VALIDATION_FAILED',
      message: 'The figures for the dropout statistics are not possible.',
      errors: [{ field: 'conditions[0].randomized', message: 'must be a whole number of participants ≥ 0, got -1' }],
    });
  });
});
