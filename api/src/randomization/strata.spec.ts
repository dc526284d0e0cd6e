import { describe, expect, it } from 'vitest';
import { RandomizationError } from './randomization-error';
import { StratificationFactor } from './scheme-parameters';
import {
  allStratumKeys,
  factorLevels,
  levelOf,
  participantLevels,
  PRETEST_CUTOFF_EXPLANATION,
  stratumKeyFor,
} from './strata';

const pretest: StratificationFactor = { id: 'pretest', kind: 'numeric', cutPoints: [65] };
const bands: StratificationFactor = { id: 'sense', kind: 'numeric', cutPoints: [3, 5.5] };
const site: StratificationFactor = { id: 'site', kind: 'categorical', categories: ['north', 'south'] };

describe('strata', () => {
  it('splits a numeric factor below / at or above each cut point', () => {
    expect(factorLevels(pretest)).toEqual(['<65', '≥65']);
    expect(levelOf(pretest, 64.999)).toBe('<65');
    expect(levelOf(pretest, 65)).toBe('≥65');
    expect(levelOf(pretest, 80)).toBe('≥65');
    expect(factorLevels(bands)).toEqual(['<3', '≥3 <5.5', '≥5.5']);
    expect([1, 3, 5, 5.5, 7].map((v) => levelOf(bands, v))).toEqual(['<3', '≥3 <5.5', '≥3 <5.5', '≥5.5', '≥5.5']);
  });

  it('builds the same stratum key whatever order the factors are listed in', () => {
    const covariates = { site: 'north', pretest: 70, unrelated: 'x' };
    expect(stratumKeyFor([pretest, site], covariates)).toBe('pretest=≥65|site=north');
    expect(stratumKeyFor([site, pretest], covariates)).toBe('pretest=≥65|site=north');
    expect(stratumKeyFor([], covariates)).toBe('all');
  });

  it('lists every stratum once', () => {
    const keys = allStratumKeys([site, bands]);
    expect(keys).toHaveLength(6);
    expect(new Set(keys).size).toBe(6);
    expect(keys).toContain('sense=≥3 <5.5|site=south');
    expect(allStratumKeys([])).toEqual(['all']);
  });

  it('reports every missing or unknown covariate with its field', () => {
    try {
      participantLevels([pretest, site, bands], { site: 'east', sense: '4' });
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(RandomizationError);
      expect((error as RandomizationError).fieldErrors).toEqual([
        { field: 'covariates.pretest', message: expect.stringContaining('is missing') },
        {
          field: 'covariates.site',
          message: expect.stringContaining('"east" is not one of the categories of "site": north, south'),
        },
        { field: 'covariates.sense', message: expect.stringContaining('must be a number') },
      ]);
    }
    expect(() => levelOf(pretest, Number.POSITIVE_INFINITY)).toThrow(RandomizationError);
  });

  it('explains in two sentences why a pretest stratifies instead of assigning by cut-off', () => {
    const sentences = PRETEST_CUTOFF_EXPLANATION.split(/(?<=\.)\s+/);
    expect(sentences).toHaveLength(2);
    expect(PRETEST_CUTOFF_EXPLANATION).toMatch(/cut-off/);
    expect(PRETEST_CUTOFF_EXPLANATION).toMatch(/stratify/);
  });
});
