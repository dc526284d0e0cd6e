import { describe, expect, it } from 'vitest';
import { checkDryRunRequest, dryRunResultSchema, MAX_DRY_RUN_ARRIVALS } from './dry-run';

const seed = 'ab'.repeat(32);

describe('checkDryRunRequest', () => {
  it('accepts arrivals with a covariate mix, and another scheme with its settings', () => {
    const body = {
      arrivals: 200,
      seed,
      covariateMix: {
        site: { kind: 'categorical', proportions: { north: 2, south: 1 } },
        age: { kind: 'normal', mean: 40, sd: 12 },
        pretest: { kind: 'numeric-values', values: [{ value: 10, probability: 1 }] },
      },
    };
    expect(checkDryRunRequest(body)).toEqual({ ok: true, value: body });
    expect(
      checkDryRunRequest({
        arrivals: 50,
        covariateMix: {},
        method: 'minimization',
        settings: { coinProbability: 0.8 },
      }),
    ).toEqual({
      ok: true,
      value: { arrivals: 50, covariateMix: {}, method: 'minimization', settings: { coinProbability: 0.8 } },
    });
  });

  it('refuses arrivals out of range, a short seed and a covariate mix that is not an object, naming each', () => {
    const arrivals = `must be a whole number from 1 to ${MAX_DRY_RUN_ARRIVALS}`;
    expect(checkDryRunRequest({ arrivals: 0, covariateMix: {} })).toEqual({
      ok: false,
      errors: [{ field: 'arrivals', message: arrivals }],
    });
    expect(checkDryRunRequest({ arrivals: MAX_DRY_RUN_ARRIVALS + 1, covariateMix: {} })).toEqual({
      ok: false,
      errors: [{ field: 'arrivals', message: arrivals }],
    });
    expect(checkDryRunRequest({ arrivals: 10, seed: 'abc', covariateMix: {} })).toEqual({
      ok: false,
      errors: [{ field: 'seed', message: 'seed must be 64 hexadecimal characters' }],
    });
    expect(checkDryRunRequest({ arrivals: 10, covariateMix: 'even' })).toEqual({
      ok: false,
      errors: [{ field: 'covariateMix', message: 'must be an object keyed by covariate id' }],
    });
  });

  it('takes a request without a covariate mix: the dry run then starts from the study’s observed mix', () => {
    expect(checkDryRunRequest({ arrivals: 10 })).toEqual({ ok: true, value: { arrivals: 10 } });
  });

  it('refuses a distribution it does not know, a negative share and an unknown field', () => {
    expect(checkDryRunRequest({ arrivals: 10, covariateMix: { age: { kind: 'uniform' } } })).toEqual({
      ok: false,
      errors: [
        { field: 'covariateMix.age.kind', message: 'must be a distribution: categorical, numeric-values or normal' },
      ],
    });
    expect(
      checkDryRunRequest({
        arrivals: 10,
        covariateMix: { site: { kind: 'categorical', proportions: { north: -1 } } },
      }),
    ).toEqual({
      ok: false,
      errors: [{ field: 'covariateMix.site.proportions.north', message: 'must be a number of 0 or more' }],
    });
    expect(checkDryRunRequest({ arrivals: 10, covariateMix: {}, speed: 'fast' })).toEqual({
      ok: false,
      errors: [{ field: 'speed', message: 'is not a dry-run setting' }],
    });
  });

  it('checks the settings against the method they are for', () => {
    expect(
      checkDryRunRequest({ arrivals: 10, covariateMix: {}, method: 'simple', settings: { blockSizes: [2] } }),
    ).toEqual({
      ok: false,
      errors: [{ field: 'settings.blockSizes', message: 'is not a setting of the simple scheme' }],
    });
    expect(
      checkDryRunRequest({ arrivals: 10, covariateMix: {}, method: 'minimization', settings: { coinProbability: 3 } }),
    ).toMatchObject({ ok: false, errors: [{ field: 'settings.coinProbability' }] });
  });
});

describe('dryRunResultSchema', () => {
  const result = {
    arrivals: 4,
    arms: [{ armId: 'map', label: 'map', count: 2, share: 0.5, targetShare: 0.5 }],
    strata: [{ stratumKey: 'all', total: 4, counts: { map: 2, compass: 2 }, imbalance: 0 }],
    factorLevels: [],
    imbalanceOverTime: [{ arrivals: 4, overall: 0, largestInStratum: 0, largestInFactorLevel: 0 }],
    largestImbalance: { overall: 1, inStratum: 1, inFactorLevel: 0 },
    finalImbalance: { overall: 0, inStratum: 0, inFactorLevel: 0 },
    matchedPairs: null,
    seed,
  };

  it('accepts a report and refuses one that lacks a part, naming it', () => {
    expect(dryRunResultSchema.safeParse(result).success).toBe(true);
    const { finalImbalance: _dropped, ...partial } = result;
    void _dropped;
    const parsed = dryRunResultSchema.safeParse(partial);
    expect(parsed.success).toBe(false);
    expect(parsed.error?.issues.map((issue) => issue.path.join('.'))).toEqual(['finalImbalance']);
  });
});
