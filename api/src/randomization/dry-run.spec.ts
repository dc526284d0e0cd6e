import { describe, expect, it } from 'vitest';
import { runDryRun, DryRunInput, MAX_SERIES_POINTS, validateDryRunInput } from './dry-run';
import { RandomizationError } from './randomization-error';
import { SchemeParameters } from './scheme-parameters';

const SEED = 'd7'.repeat(32);
const conditions = [
  { conditionId: 'audio', weight: 1 },
  { conditionId: 'map', weight: 1 },
  { conditionId: 'none', weight: 1 },
];
const sense = { id: 'sense', kind: 'numeric' as const, cutPoints: [4] };
const site = { id: 'site', kind: 'categorical' as const, categories: ['lab', 'online'] };
const mix: DryRunInput['covariateMix'] = {
  sense: { kind: 'numeric-values', values: [1, 2, 3, 4, 5, 6, 7].map((value) => ({ value, probability: 1 })) },
  site: { kind: 'categorical', proportions: { lab: 1, online: 3 } },
};
const stratified: SchemeParameters = {
  method: 'stratified-blocks',
  conditions,
  blockSizes: [3, 6],
  factors: [sense, site],
};

describe('dry run', () => {
  // Speed is measured in the benchmark (npm run bench -w api), not asserted here.
  it('simulates 10,000 arrivals of stratified blocks and keeps the output small', () => {
    const result = runDryRun({ parameters: stratified, arrivals: 10_000, seed: SEED, covariateMix: mix });
    expect(result.arms.map((a) => a.count).reduce((a, b) => a + b, 0)).toBe(10_000);
    expect(result.strata).toHaveLength(4);
    expect(result.strata.reduce((sum, s) => sum + s.total, 0)).toBe(10_000);
    expect(result.imbalanceOverTime.length).toBeLessThanOrEqual(MAX_SERIES_POINTS);
    expect(result.imbalanceOverTime[result.imbalanceOverTime.length - 1].arrivals).toBe(10_000);
    // Blocks of 3 or 6 over 3 conditions: earlier blocks are complete and a block of 6 holds each condition
    // twice, so inside a stratum two conditions are never more than 2 apart.
    expect(result.largestImbalance.inStratum).toBeLessThanOrEqual(2);
    // Site proportions 1:3 and sense uniform over 1..7 (3 of 7 below 4).
    const siteOnline = result.factorLevels.find((l) => l.factorId === 'site' && l.level === 'online');
    expect(Math.abs((siteOnline?.total ?? 0) / 10_000 - 0.75)).toBeLessThan(4 * Math.sqrt(0.1875 / 10_000));
    const senseLow = result.factorLevels.find((l) => l.factorId === 'sense' && l.level === '<4');
    expect(Math.abs((senseLow?.total ?? 0) / 10_000 - 3 / 7)).toBeLessThan(4 * Math.sqrt(12 / 49 / 10_000));
  });

  it('runs minimization on 10,000 arrivals', () => {
    const parameters: SchemeParameters = {
      method: 'minimization',
      conditions,
      factors: [
        { ...sense, weight: 1 },
        { ...site, weight: 1 },
      ],
      measure: 'range',
      coinProbability: 0.8,
    };
    const result = runDryRun({ parameters, arrivals: 10_000, seed: SEED, covariateMix: mix });
    expect(result.factorLevels).toHaveLength(4);
    expect(result.finalImbalance.inFactorLevel).toBeLessThanOrEqual(result.largestImbalance.inFactorLevel);
  });

  it('reports the peak inside each sampled stretch, never less than the imbalance at its end', () => {
    const result = runDryRun({
      parameters: { method: 'simple', conditions },
      arrivals: 5000,
      seed: SEED,
      covariateMix: {},
    });
    expect(result.imbalanceOverTime).toHaveLength(200);
    const peaks = result.imbalanceOverTime.map((p) => p.overall);
    expect(result.largestImbalance.overall).toBe(Math.max(...peaks));
    expect(result.finalImbalance.overall).toBeLessThanOrEqual(peaks[peaks.length - 1]);
    const counts = result.arms.map((a) => a.count);
    expect(result.finalImbalance.overall).toBe(Math.max(...counts) - Math.min(...counts));
  });

  it('carries untouched strata and levels into each sampled stretch', () => {
    const result = runDryRun({ parameters: stratified, arrivals: 401, seed: SEED, covariateMix: mix });
    const last = result.imbalanceOverTime[result.imbalanceOverTime.length - 1];
    expect(last.largestInStratum).toBeGreaterThanOrEqual(Math.max(...result.strata.map((s) => s.imbalance)));
    expect(last.largestInFactorLevel).toBeGreaterThanOrEqual(Math.max(...result.factorLevels.map((l) => l.imbalance)));
    expect(result.finalImbalance.inStratum).toBe(Math.max(...result.strata.map((s) => s.imbalance)));
  });

  it('compares balance on reported factors the scheme does not use, and orders for within-subjects designs', () => {
    const simple = runDryRun({
      parameters: { method: 'simple', conditions },
      arrivals: 600,
      seed: SEED,
      covariateMix: { sense: { kind: 'normal', mean: 4, sd: 1.5 } },
      reportFactors: [sense],
    });
    expect(simple.factorLevels.map((l) => l.level)).toEqual(['<4', '≥4']);
    const within = runDryRun({
      parameters: {
        method: 'williams',
        conditionIds: ['express', 'guest', 'account'],
        squaresPerBlock: [1],
        factors: [],
      },
      arrivals: 60,
      seed: SEED,
      covariateMix: {},
    });
    expect(within.arms).toHaveLength(6);
    expect(within.arms.every((a) => a.count === 10)).toBe(true);
    expect(within.arms[0].label).toBe('express → guest → account');
  });

  it('reports the odd one out of a matched-pairs cohort', () => {
    const result = runDryRun({
      parameters: { method: 'matched-pairs', conditions: conditions.slice(0, 2), pretestId: 'score' },
      arrivals: 101,
      seed: SEED,
      covariateMix: { score: { kind: 'normal', mean: 50, sd: 10 } },
    });
    expect(result.matchedPairs?.pairs).toBe(50);
    expect(result.matchedPairs?.leftoverParticipantId).toMatch(/^simulated-/);
    expect(result.finalImbalance.overall).toBe(1);
  });

  it('gives the same result for the same throwaway seed', () => {
    const input: DryRunInput = { parameters: stratified, arrivals: 500, seed: SEED, covariateMix: mix };
    expect(runDryRun(input)).toEqual(runDryRun(input));
  });

  it('names every problem in the request', () => {
    const errors = validateDryRunInput({
      parameters: stratified,
      arrivals: 0,
      seed: 'nope',
      covariateMix: { site: { kind: 'categorical', proportions: { lab: 1, mars: 1 } } },
    });
    expect(errors.map((e) => e.field)).toEqual(['arrivals', 'seed']);
    const mixErrors = validateDryRunInput({
      parameters: stratified,
      arrivals: 10,
      seed: SEED,
      covariateMix: {
        site: { kind: 'categorical', proportions: { lab: 1, mars: 1 } },
        sense: { kind: 'normal', mean: 1, sd: -1 },
      },
    });
    expect(mixErrors).toEqual([
      { field: 'covariateMix.sense.sd', message: 'must be a number of 0 or more' },
      { field: 'covariateMix.site.proportions.mars', message: expect.stringContaining('is not a category') },
    ]);
    expect(validateDryRunInput({ parameters: stratified, arrivals: 10, seed: SEED, covariateMix: {} })).toContainEqual({
      field: 'covariateMix.sense',
      message: 'needs a distribution because the scheme uses it',
    });
    expect(() => runDryRun({ parameters: stratified, arrivals: 10, seed: SEED, covariateMix: {} })).toThrow(
      RandomizationError,
    );
    expect(
      validateDryRunInput({
        parameters: stratified,
        arrivals: 10,
        seed: SEED,
        covariateMix: mix,
        reportFactors: [site],
      }),
    ).toEqual([{ field: 'reportFactors[0].id', message: expect.stringContaining('already a factor of the scheme') }]);
  });
});
