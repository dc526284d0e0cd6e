import { describe, expect, it } from 'vitest';
import {
  blockSizeProblem,
  checkSchemeSettings,
  parseProbability,
  schemeFormValuesFrom,
  toSchemeSettings,
  type SchemeContext,
  type SchemeFormValues,
} from './scheme-settings';

const threeEqual: SchemeContext = {
  design: 'between',
  conditionWeights: [1, 1, 1],
  factors: [{ key: 'sense_of_direction', kind: 'numeric' }],
};
const base: SchemeFormValues = {
  method: 'stratified-blocks',
  blockSizes: '3, 6',
  measure: 'range',
  coinProbability: '2/3',
  pretestKey: '',
  squaresPerBlock: '1',
  stratify: false,
};

describe('blockSizeProblem', () => {
  // The api's check values (api/src/randomization/scheme-parameters.ts readBlockSizes): total weight 3 allows 3, 6, 9 and refuses 4.
  it('accepts multiples of the total weight', () => {
    expect(blockSizeProblem([3, 6], [1, 1, 1])).toBeNull();
    expect(blockSizeProblem([4, 8], [2, 1, 1])).toBeNull();
  });

  it('refuses a size that cannot hold the ratio and says which sizes would', () => {
    expect(blockSizeProblem([3, 4], [1, 1, 1])).toBe(
      '4 is not a multiple of the total weight 3 (1 + 1 + 1). A block must hold every condition in its ratio, so use 3, 6, 9, …',
    );
    expect(blockSizeProblem([6], [2, 1, 1])).toMatch(/^6 is not a multiple of the total weight 4 \(2 \+ 1 \+ 1\)/);
  });

  it('refuses a repeated size', () => {
    expect(blockSizeProblem([3, 3], [1, 1, 1])).toBe('3 is listed twice; list each size once.');
  });
});

describe('parseProbability', () => {
  it('reads fractions and decimals', () => {
    expect(parseProbability('2/3')).toBeCloseTo(0.6667, 4);
    expect(parseProbability('0.75')).toBe(0.75);
    expect(parseProbability('1')).toBe(1);
    expect(parseProbability('two thirds')).toBeNull();
    expect(parseProbability('1/0')).toBeNull();
  });
});

describe('checkSchemeSettings', () => {
  it('finds nothing wrong with stratified blocks 3 and 6 for three equal conditions and a pretest', () => {
    expect(checkSchemeSettings(base, threeEqual)).toEqual([]);
  });

  it('puts a non-multiple block size on the block sizes field', () => {
    expect(checkSchemeSettings({ ...base, blockSizes: '4' }, threeEqual)).toEqual([
      { path: 'blockSizes', message: expect.stringMatching(/^4 is not a multiple of the total weight 3/) },
    ]);
  });

  it('needs a factor for stratified blocks and minimization', () => {
    const noFactors = { ...threeEqual, factors: [] };
    expect(checkSchemeSettings(base, noFactors).map((issue) => issue.path)).toEqual(['method']);
    expect(checkSchemeSettings({ ...base, method: 'minimization' }, noFactors).map((issue) => issue.path)).toEqual([
      'method',
    ]);
  });

  it('keeps the biased-coin probability between 0.5 and 1', () => {
    expect(
      checkSchemeSettings({ ...base, method: 'minimization', coinProbability: '0.4' }, threeEqual).map((i) => i.path),
    ).toEqual(['coinProbability']);
    expect(checkSchemeSettings({ ...base, method: 'minimization', coinProbability: '1' }, threeEqual)).toEqual([]);
  });

  it('asks matched pairs for two equal conditions and a numeric pretest', () => {
    const issues = checkSchemeSettings({ ...base, method: 'matched-pairs', pretestKey: '' }, threeEqual);
    expect(issues.map((issue) => issue.path)).toEqual(['method', 'pretestKey']);
    expect(
      checkSchemeSettings(
        { ...base, method: 'matched-pairs', pretestKey: 'sense_of_direction' },
        { ...threeEqual, conditionWeights: [1, 1] },
      ),
    ).toEqual([]);
  });

  it('matches within-subjects designs to the number of conditions', () => {
    const within: SchemeContext = { design: 'within', conditionWeights: [1, 1, 1], factors: [] };
    expect(checkSchemeSettings({ ...base, method: 'williams' }, within)).toEqual([]);
    expect(checkSchemeSettings({ ...base, method: 'counterbalanced' }, within).map((i) => i.path)).toEqual(['method']);
    expect(checkSchemeSettings({ ...base, method: 'simple' }, within).map((i) => i.path)).toEqual(['method']);
    expect(checkSchemeSettings({ ...base, method: 'williams', stratify: true }, within).map((i) => i.path)).toEqual([
      'stratify',
    ]);
  });
});

describe('toSchemeSettings and schemeFormValuesFrom', () => {
  it('sends only what the method uses, with the exact default 2/3', () => {
    expect(toSchemeSettings(base)).toEqual({ blockSizes: [3, 6] });
    expect(toSchemeSettings({ ...base, method: 'minimization' })).toEqual({ measure: 'range', coinProbability: 2 / 3 });
    expect(toSchemeSettings({ ...base, method: 'williams', squaresPerBlock: '1, 2' })).toEqual({
      squaresPerBlock: [1, 2],
      stratify: false,
    });
  });

  it('reads saved settings back into the form', () => {
    const values = schemeFormValuesFrom('stratified-blocks', { blockSizes: [3, 6] }, threeEqual);
    expect(values).toMatchObject({
      method: 'stratified-blocks',
      blockSizes: '3, 6',
      coinProbability: '2/3',
      pretestKey: 'sense_of_direction',
    });
    expect(schemeFormValuesFrom(null, {}, threeEqual)).toMatchObject({ method: undefined, blockSizes: '3, 6' });
    expect(schemeFormValuesFrom('minimization', { coinProbability: 0.8 }, threeEqual).coinProbability).toBe('0.8');
  });
});
