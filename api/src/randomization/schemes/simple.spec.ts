import { describe, expect, it } from 'vitest';
import { SimpleParameters } from '../scheme-parameters';
import { generateSimpleSequence } from './simple';

const SEED = '5e'.repeat(32);
const parameters: SimpleParameters = {
  method: 'simple',
  conditions: [
    { conditionId: 'audio', weight: 1 },
    { conditionId: 'map', weight: 2 },
    { conditionId: 'none', weight: 1 },
  ],
};

describe('simple randomization', () => {
  it('allocates in the weights on average, each slot independently', () => {
    const n = 40_000;
    const slots = generateSimpleSequence(SEED, parameters, n);
    const share = (id: string) => slots.filter((s) => s.conditionId === id).length / n;
    // Binomial shares, 4 sd tolerance (common practice): sd = sqrt(p(1-p)/n).
    expect(Math.abs(share('map') - 0.5)).toBeLessThan(4 * Math.sqrt(0.25 / n));
    expect(Math.abs(share('audio') - 0.25)).toBeLessThan(4 * Math.sqrt(0.1875 / n));
    expect(slots.every((s) => s.stratumKey === 'all' && s.blockIndex === null)).toBe(true);
  });

  it('is reproducible from the seed and differs for another seed', () => {
    const ids = (seed: string) => generateSimpleSequence(seed, parameters, 100).map((s) => s.conditionId);
    expect(ids(SEED)).toEqual(ids(SEED));
    expect(ids(SEED)).not.toEqual(ids('5f'.repeat(32)));
  });

  it('refuses bad parameters with the field named', () => {
    expect(() => generateSimpleSequence(SEED, { method: 'simple', conditions: [] }, 1)).toThrow(/conditions: is empty/);
  });
});
