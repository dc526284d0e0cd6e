import { describe, expect, it } from 'vitest';
import { RandomizationError } from '../randomization-error';
import { StratifiedBlocksParameters } from '../scheme-parameters';
import {
  generateStratifiedSequences,
  generateStratumSequence,
  PRETEST_CUTOFF_EXPLANATION,
  stratumOfParticipant,
} from './stratified-blocks';

const SEED = '7a'.repeat(32);
const parameters: StratifiedBlocksParameters = {
  method: 'stratified-blocks',
  conditions: [
    { conditionId: 'audio', weight: 1 },
    { conditionId: 'map', weight: 1 },
    { conditionId: 'none', weight: 1 },
  ],
  blockSizes: [3, 6],
  factors: [
    { id: 'sense', kind: 'numeric', cutPoints: [4] },
    { id: 'site', kind: 'categorical', categories: ['lab', 'online'] },
  ],
};

describe('stratified permuted blocks', () => {
  it('keeps one independent sequence per stratum', () => {
    const sequences = generateStratifiedSequences(SEED, parameters, 30);
    expect(Object.keys(sequences).sort()).toEqual([
      'sense=<4|site=lab',
      'sense=<4|site=online',
      'sense=≥4|site=lab',
      'sense=≥4|site=online',
    ]);
    const patterns = Object.values(sequences).map((slots) => slots.map((s) => s.conditionId).join(','));
    expect(new Set(patterns).size).toBe(4);
    for (const [key, slots] of Object.entries(sequences)) {
      expect(slots.every((s) => s.stratumKey === key)).toBe(true);
      expect(generateStratumSequence(SEED, parameters, key, 30)).toEqual(slots);
      // Balanced at every block end: after each complete block the three counts are equal.
      const counts: Record<string, number> = { audio: 0, map: 0, none: 0 };
      for (const slot of slots) {
        counts[slot.conditionId] += 1;
        if (slot.positionInBlock === slot.blockSize) expect(new Set(Object.values(counts)).size).toBe(1);
      }
    }
  });

  it('puts a participant in the stratum of their covariates', () => {
    expect(stratumOfParticipant(parameters, { sense: 4, site: 'online' })).toBe('sense=≥4|site=online');
    expect(stratumOfParticipant(parameters, { sense: 3.9, site: 'lab' })).toBe('sense=<4|site=lab');
    try {
      stratumOfParticipant(parameters, { sense: 5 });
      expect.unreachable();
    } catch (error) {
      expect((error as RandomizationError).fieldErrors).toEqual([
        { field: 'covariates.site', message: expect.stringContaining('missing') },
      ]);
    }
  });

  it('refuses a stratum key the factors cannot produce', () => {
    expect(() => generateStratumSequence(SEED, parameters, 'sense=≥65', 5)).toThrow(
      /stratumKey: "sense=≥65" is not a stratum/,
    );
  });

  it('re-exports the reason pretests stratify instead of assigning by cut-off', () => {
    expect(PRETEST_CUTOFF_EXPLANATION).toMatch(/regression|average/);
  });
});
