import { describe, expect, it } from 'vitest';
import { RandomizationError, RandomizationErrorCode } from './randomization-error';
import { DEFAULT_COIN_PROBABILITY, parseSchemeParameters, validateSchemeParameters } from './scheme-parameters';

const two = [
  { conditionId: 'audio', weight: 1 },
  { conditionId: 'map', weight: 1 },
];
const pretest = { id: 'pretest', kind: 'numeric', cutPoints: [65] };

function errorsOf(input: unknown) {
  const result = validateSchemeParameters(input);
  if (result.ok) throw new Error('expected validation errors');
  return result.errors;
}

function expectError(input: unknown, field: string, messagePart: string) {
  const errors = errorsOf(input);
  expect(errors, JSON.stringify(errors)).toContainEqual({ field, message: expect.stringContaining(messagePart) });
}

describe('scheme parameters', () => {
  it('accepts every scheme and fills in the documented defaults', () => {
    const minimization = parseSchemeParameters({
      method: 'minimization',
      conditions: two,
      factors: [{ ...pretest, weight: 1 }],
    });
    expect(minimization).toMatchObject({ measure: 'range', coinProbability: DEFAULT_COIN_PROBABILITY });
    expect(parseSchemeParameters({ method: 'williams', conditionIds: ['a', 'b', 'c'] })).toEqual({
      method: 'williams',
      conditionIds: ['a', 'b', 'c'],
      squaresPerBlock: [1],
      factors: [],
    });
    expect(validateSchemeParameters({ method: 'simple', conditions: two }).ok).toBe(true);
    expect(validateSchemeParameters({ method: 'permuted-blocks', conditions: two, blockSizes: [2, 4, 6] }).ok).toBe(
      true,
    );
    expect(
      validateSchemeParameters({ method: 'stratified-blocks', conditions: two, blockSizes: [4], factors: [pretest] })
        .ok,
    ).toBe(true);
    expect(validateSchemeParameters({ method: 'matched-pairs', conditions: two, pretestId: 'pretest' }).ok).toBe(true);
    expect(validateSchemeParameters({ method: 'counterbalanced', conditionIds: ['a', 'b'] }).ok).toBe(true);
    expect(
      validateSchemeParameters({ method: 'latin-square', conditionIds: ['a', 'b', 'c'], squaresPerBlock: [1, 2] }).ok,
    ).toBe(true);
  });

  it('refuses block sizes that are not a multiple of the total weight', () => {
    const conditions = [
      { conditionId: 'audio', weight: 1 },
      { conditionId: 'map', weight: 2 },
    ];
    expectError(
      { method: 'permuted-blocks', conditions, blockSizes: [3, 5] },
      'blockSizes[1]',
      '5 is not a multiple of the total weight 3 (1 + 2)',
    );
    expectError(
      { method: 'permuted-blocks', conditions, blockSizes: [3, 5] },
      'blockSizes[1]',
      'allowed sizes are 3, 6, 9',
    );
    expectError({ method: 'permuted-blocks', conditions: two, blockSizes: [] }, 'blockSizes', 'at least one');
    expectError({ method: 'permuted-blocks', conditions: two, blockSizes: [4, 4] }, 'blockSizes[1]', 'listed twice');
    expectError({ method: 'permuted-blocks', conditions: two, blockSizes: [2.5] }, 'blockSizes[0]', 'whole number');
  });

  it('refuses empty or duplicated conditions and non-positive weights', () => {
    expectError({ method: 'simple', conditions: [] }, 'conditions', 'is empty');
    expectError({ method: 'simple', conditions: [two[0]] }, 'conditions', 'at least two');
    expectError({ method: 'simple', conditions: [two[0], two[0]] }, 'conditions[1].conditionId', 'listed twice');
    expectError(
      { method: 'simple', conditions: [two[0], { conditionId: 'map', weight: 0 }] },
      'conditions[1].weight',
      'whole number of 1 or more',
    );
    expectError(
      { method: 'simple', conditions: [two[0], { conditionId: 'map', weight: -2 }] },
      'conditions[1].weight',
      'got -2',
    );
    expectError(
      { method: 'simple', conditions: [two[0], { conditionId: '', weight: 1 }] },
      'conditions[1].conditionId',
      'non-empty',
    );
  });

  it('refuses a coin probability outside [0.5, 1] and an unknown measure', () => {
    const base = { method: 'minimization', conditions: two, factors: [{ ...pretest, weight: 1 }] };
    expectError({ ...base, coinProbability: 0.4 }, 'coinProbability', 'from 0.5');
    expectError({ ...base, coinProbability: 1.01 }, 'coinProbability', 'to 1');
    expectError({ ...base, measure: 'entropy' }, 'measure', 'range or variance');
    expectError({ ...base, factors: [{ ...pretest, weight: 0 }] }, 'factors[0].weight', 'greater than 0');
    expectError({ ...base, factors: [] }, 'factors', 'at least one factor');
    for (const p of [0.5, 1]) expect(validateSchemeParameters({ ...base, coinProbability: p }).ok).toBe(true);
  });

  it('refuses unsorted or duplicate cut points and thin categorical factors', () => {
    const withFactor = (factor: unknown) => ({
      method: 'stratified-blocks',
      conditions: two,
      blockSizes: [2],
      factors: [factor],
    });
    expectError(
      withFactor({ id: 'pretest', kind: 'numeric', cutPoints: [70, 65] }),
      'factors[0].cutPoints[1]',
      'increasing order',
    );
    expectError(
      withFactor({ id: 'pretest', kind: 'numeric', cutPoints: [65, 65] }),
      'factors[0].cutPoints[1]',
      'listed twice',
    );
    expectError(
      withFactor({ id: 'pretest', kind: 'numeric', cutPoints: [] }),
      'factors[0].cutPoints',
      'at least one cut point',
    );
    expectError(
      withFactor({ id: 'pretest', kind: 'numeric', cutPoints: [Number.NaN] }),
      'factors[0].cutPoints[0]',
      'finite',
    );
    expectError(
      withFactor({ id: 'site', kind: 'categorical', categories: ['north'] }),
      'factors[0].categories',
      'at least two',
    );
    expectError(
      withFactor({ id: 'site', kind: 'categorical', categories: ['north', 'north'] }),
      'factors[0].categories[1]',
      'listed twice',
    );
    expectError(
      withFactor({ id: 'site', kind: 'categorical', categories: ['a|b', 'c'] }),
      'factors[0].categories[0]',
      '"|"',
    );
    expectError(
      withFactor({ id: 'site=x', kind: 'categorical', categories: ['a', 'b'] }),
      'factors[0].id',
      'letters, digits',
    );
    expectError(
      withFactor({ id: 'site', kind: 'ordinal', categories: ['a', 'b'] }),
      'factors[0].kind',
      'numeric or categorical',
    );
    expectError(
      { method: 'stratified-blocks', conditions: two, blockSizes: [2], factors: [pretest, pretest] },
      'factors[1].id',
      'listed twice',
    );
  });

  it('refuses Williams and Latin squares below three conditions and AB/BA with other than two', () => {
    expectError(
      { method: 'williams', conditionIds: ['a', 'b'] },
      'conditionIds',
      'a Williams design needs at least three conditions',
    );
    expectError(
      { method: 'latin-square', conditionIds: ['a', 'b'] },
      'conditionIds',
      'a Latin square needs at least three',
    );
    expectError({ method: 'counterbalanced', conditionIds: ['a', 'b', 'c'] }, 'conditionIds', 'exactly two conditions');
    expectError({ method: 'williams', conditionIds: ['a', 'b', 'a'] }, 'conditionIds[2]', 'listed twice');
    expectError(
      { method: 'williams', conditionIds: ['a', 'b', 'c'], squaresPerBlock: [0] },
      'squaresPerBlock[0]',
      'whole number',
    );
  });

  it('refuses matched pairs with other than two equally weighted conditions', () => {
    expectError(
      { method: 'matched-pairs', conditions: [...two, { conditionId: 'none', weight: 1 }], pretestId: 'pretest' },
      'conditions',
      'exactly two conditions',
    );
    expectError(
      { method: 'matched-pairs', conditions: [two[0], { conditionId: 'map', weight: 2 }], pretestId: 'pretest' },
      'conditions[1].weight',
      '1:1',
    );
    expectError({ method: 'matched-pairs', conditions: two }, 'pretestId', 'numeric pretest');
  });

  it('refuses an unknown method and fields that are not settings of the scheme', () => {
    expectError({ method: 'cut-off', conditions: two }, 'method', 'must be one of');
    expectError({ method: 'simple', conditions: two, cutOff: 65 }, 'cutOff', 'not a setting of the simple scheme');
    expectError(null, 'parameters', 'must be an object');
  });

  it('throws one RandomizationError carrying every field error', () => {
    try {
      parseSchemeParameters({ method: 'permuted-blocks', conditions: [], blockSizes: [0] });
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(RandomizationError);
      const e = error as RandomizationError;
      expect(e.code).toBe(RandomizationErrorCode.InvalidParameters);
      expect(e.fieldErrors.map((f) => f.field)).toEqual(['conditions', 'blockSizes[0]']);
      expect(e.message).toContain('conditions: is empty');
    }
  });
});
