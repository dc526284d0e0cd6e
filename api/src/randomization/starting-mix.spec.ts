import { describe, expect, it } from 'vitest';
import { startingCovariateMix, type MixFactor } from './starting-mix';

const pretest: MixFactor = { key: 'pretest', kind: 'numeric', cutPoints: [40, 60], categories: null };
const device: MixFactor = { key: 'device', kind: 'categorical', cutPoints: null, categories: ['phone', 'laptop'] };

describe('startingCovariateMix', () => {
  it('starts even before anyone is screened: equal shares, scores centred on the cut points', () => {
    expect(startingCovariateMix([pretest, device], [])).toEqual({
      basis: 'even',
      people: 0,
      mix: {
        pretest: { kind: 'normal', mean: 50, sd: 20 },
        device: { kind: 'categorical', proportions: { phone: 1, laptop: 1 } },
      },
    });
  });

  it('counts the categories screened people gave', () => {
    const screened = [{ device: 'phone' }, { device: 'phone' }, { device: 'laptop' }, { device: 'phone' }];
    expect(startingCovariateMix([device], screened)).toEqual({
      basis: 'observed',
      people: 4,
      mix: { device: { kind: 'categorical', proportions: { phone: 3, laptop: 1 } } },
    });
  });

  it('takes the mean and the sample standard deviation of numeric answers', () => {
    // Check values from the standard-deviation example in Wikipedia's "Standard deviation" article: the eight values
    // 2, 4, 4, 4, 5, 5, 7, 9 have mean 5, population SD 2, and sample SD √(32/7) ≈ 2.138.
    const screened = [2, 4, 4, 4, 5, 5, 7, 9].map((pretestScore) => ({ pretest: pretestScore }));
    expect(startingCovariateMix([pretest], screened).mix.pretest).toEqual({ kind: 'normal', mean: 5, sd: 2.14 });
  });

  it('leaves out unanswered and unknown answers, and starts a factor nobody answered even', () => {
    const screened = [{ device: 'tablet', pretest: 70 }, { device: null, pretest: '50' }, {}, { device: 'laptop' }];
    expect(startingCovariateMix([pretest, device], screened)).toEqual({
      basis: 'observed',
      people: 3,
      mix: {
        pretest: { kind: 'normal', mean: 60, sd: 14.14 },
        device: { kind: 'categorical', proportions: { phone: 0, laptop: 1 } },
      },
    });
    expect(startingCovariateMix([device], [{ device: 'tablet' }]).mix.device).toEqual({
      kind: 'categorical',
      proportions: { phone: 1, laptop: 1 },
    });
  });

  it('gives one person a spread of 0, which the dry run accepts', () => {
    expect(startingCovariateMix([pretest], [{ pretest: 42 }]).mix.pretest).toEqual({ kind: 'normal', mean: 42, sd: 0 });
  });
});
