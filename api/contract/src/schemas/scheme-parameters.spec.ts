import { describe, expect, it } from 'vitest';
import { checkWith } from './field-errors';
import {
  blockSizeMultipleProblem,
  conditionCountProblem,
  DEFAULT_COIN_PROBABILITY,
  isCoinProbability,
  isWithinMethod,
  schemeParametersSchema,
  totalWeight,
} from './scheme-parameters';

const check = (input: unknown) => checkWith(schemeParametersSchema, input, 'parameters');
const two = [
  { conditionId: 'map', weight: 1 },
  { conditionId: 'compass', weight: 1 },
];
const ageFactor = { id: 'age', kind: 'numeric', cutPoints: [65] };
const siteFactor = { id: 'site', kind: 'categorical', categories: ['north', 'south'] };

/** The errors of a refused input; fails the test when the input was accepted. */
function refused(input: unknown) {
  const result = check(input);
  expect(result.ok, 'the input should be refused').toBe(false);
  return result.ok ? [] : result.errors;
}

describe('the rules the admin screens share', () => {
  it('adds the weights and names a block size that cannot hold the ratio', () => {
    expect(totalWeight([2, 1])).toBe(3);
    expect(blockSizeMultipleProblem(6, [2, 1])).toBeNull();
    expect(blockSizeMultipleProblem(5, [2, 1])).toMatch(/^5 is not a multiple of the total weight 3 \(2 \+ 1\);/);
    expect(blockSizeMultipleProblem(5, [2, 1])).toMatch(/allowed sizes are 3, 6, 9, …$/);
  });

  it('keeps the biased coin from 0.5 to 1', () => {
    expect(isCoinProbability(DEFAULT_COIN_PROBABILITY)).toBe(true);
    expect(isCoinProbability(0.5)).toBe(true);
    expect(isCoinProbability(1)).toBe(true);
    expect(isCoinProbability(0.49)).toBe(false);
    expect(isCoinProbability(Number.NaN)).toBe(false);
  });

  it('knows how many conditions each design takes', () => {
    expect(conditionCountProblem('simple', 2)).toBeNull();
    expect(conditionCountProblem('simple', 1)).toBe('at least two conditions are needed');
    expect(conditionCountProblem('matched-pairs', 3)).toMatch(/exactly two conditions \(got 3\)/);
    expect(conditionCountProblem('counterbalanced', 3)).toMatch(/exactly two conditions/);
    expect(conditionCountProblem('williams', 2)).toMatch(/^a Williams design needs at least three/);
    expect(conditionCountProblem('latin-square', 3)).toBeNull();
    expect(isWithinMethod('latin-square')).toBe(true);
    expect(isWithinMethod('minimization')).toBe(false);
  });
});

describe('schemeParametersSchema accepts', () => {
  it('each between-subjects method with its settings', () => {
    expect(check({ method: 'simple', conditions: two }).ok).toBe(true);
    expect(
      check({
        method: 'permuted-blocks',
        conditions: [
          { conditionId: 'map', weight: 2 },
          { conditionId: 'compass', weight: 1 },
        ],
        blockSizes: [3, 6],
      }).ok,
    ).toBe(true);
    expect(
      check({ method: 'stratified-blocks', conditions: two, blockSizes: [2, 4], factors: [ageFactor, siteFactor] }).ok,
    ).toBe(true);
    expect(check({ method: 'matched-pairs', conditions: two, pretestId: 'pretest' }).ok).toBe(true);
  });

  it('minimization, filling in the default measure and coin', () => {
    expect(check({ method: 'minimization', conditions: two, factors: [{ ...ageFactor, weight: 2 }] })).toEqual({
      ok: true,
      value: {
        method: 'minimization',
        conditions: two,
        factors: [{ ...ageFactor, weight: 2 }],
        measure: 'range',
        coinProbability: DEFAULT_COIN_PROBABILITY,
      },
    });
  });

  it('within-subjects designs, with one copy per block and no strata unless given', () => {
    expect(check({ method: 'williams', conditionIds: ['a', 'b', 'c'] })).toEqual({
      ok: true,
      value: { method: 'williams', conditionIds: ['a', 'b', 'c'], squaresPerBlock: [1], factors: [] },
    });
    expect(check({ method: 'counterbalanced', conditionIds: ['a', 'b'], squaresPerBlock: [1, 2] }).ok).toBe(true);
  });
});

describe('schemeParametersSchema refuses, naming the field', () => {
  it('too few conditions, a repeated condition and a weight that is not a whole number of 1 or more', () => {
    expect(refused({ method: 'simple', conditions: [two[0]] })).toContainEqual({
      field: 'conditions',
      message: 'at least two conditions are needed',
    });
    expect(refused({ method: 'simple', conditions: [two[0], two[0]] })).toContainEqual({
      field: 'conditions[1].conditionId',
      message: '"map" is listed twice (also at conditions[0].conditionId)',
    });
    expect(refused({ method: 'simple', conditions: [{ conditionId: 'map', weight: 0 }, two[1]] })).toContainEqual({
      field: 'conditions[0].weight',
      message: 'must be a whole number of 1 or more (got 0)',
    });
  });

  it('a block size that cannot hold the ratio, one too large and one listed twice', () => {
    const blocks = (blockSizes: number[]) =>
      refused({
        method: 'permuted-blocks',
        conditions: [
          { conditionId: 'map', weight: 2 },
          { conditionId: 'compass', weight: 1 },
        ],
        blockSizes,
      });
    expect(blocks([3, 4])).toContainEqual({
      field: 'blockSizes[1]',
      message: expect.stringMatching(/^4 is not a multiple of the total weight 3/),
    });
    expect(blocks([1002])).toContainEqual({ field: 'blockSizes[0]', message: 'must be at most 1000 (got 1002)' });
    expect(blocks([3, 3])).toContainEqual({
      field: 'blockSizes[1]',
      message: '3 is listed twice; list each allowed size once',
    });
  });

  it('cut points out of order and categories that would break a stratum key', () => {
    const stratified = (factor: unknown) =>
      refused({ method: 'stratified-blocks', conditions: two, blockSizes: [2], factors: [factor] });
    expect(stratified({ ...ageFactor, cutPoints: [70, 65] })).toContainEqual({
      field: 'factors[0].cutPoints[1]',
      message: '65 comes after 70; list cut points in increasing order',
    });
    expect(stratified({ ...siteFactor, categories: ['north|east', 'south'] })).toContainEqual({
      field: 'factors[0].categories[0]',
      message: 'must not contain "|" (it separates factors in a stratum key)',
    });
    expect(stratified({ id: 'age', kind: 'ordinal' })).toContainEqual({
      field: 'factors[0].kind',
      message: 'must be numeric or categorical (got "ordinal")',
    });
  });

  it('a coin outside 0.5 to 1 and an unknown measure', () => {
    const minimization = { method: 'minimization', conditions: two, factors: [{ ...ageFactor, weight: 1 }] };
    expect(refused({ ...minimization, coinProbability: 0.4 })).toContainEqual({
      field: 'coinProbability',
      message: expect.stringMatching(/^must be a number from 0\.5 .* \(got 0\.4\)$/),
    });
    expect(refused({ ...minimization, measure: 'max' })).toContainEqual({
      field: 'measure',
      message: 'must be range or variance (got "max")',
    });
  });

  it('matched pairs with unequal weights, and a design with the wrong number of conditions', () => {
    expect(
      refused({
        method: 'matched-pairs',
        conditions: [two[0], { conditionId: 'compass', weight: 2 }],
        pretestId: 'pretest',
      }),
    ).toContainEqual({
      field: 'conditions[1].weight',
      message: 'matched pairs allocate 1:1, so both conditions must have the same weight',
    });
    expect(refused({ method: 'latin-square', conditionIds: ['a', 'b'] })).toContainEqual({
      field: 'conditionIds',
      message: expect.stringMatching(/^a Latin square needs at least three conditions/),
    });
    expect(refused({ method: 'williams', conditionIds: ['a', 'b', 'c'], squaresPerBlock: [101] })).toContainEqual({
      field: 'squaresPerBlock[0]',
      message: 'must be a whole number from 1 to 100 (got 101)',
    });
  });

  it('a setting the method does not have', () => {
    expect(refused({ method: 'simple', conditions: two, blockSizes: [2] })).toEqual([
      { field: 'blockSizes', message: 'is not a setting of the simple scheme' },
    ]);
  });
});
