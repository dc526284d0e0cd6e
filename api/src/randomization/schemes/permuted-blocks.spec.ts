import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { PermutedBlocksParameters } from '../scheme-parameters';
import { AllocationSlot } from './allocation-slot';
import { expectedBlockCounts, generatePermutedBlockSequence } from './permuted-blocks';

const seedArb = fc.uint8Array({ minLength: 32, maxLength: 32 }).map((bytes) => Buffer.from(bytes).toString('hex'));
const SEED = 'ab'.repeat(32);

function blocksOf(slots: AllocationSlot[]): AllocationSlot[][] {
  const blocks = new Map<number, AllocationSlot[]>();
  for (const slot of slots) {
    const block = blocks.get(slot.blockIndex as number) ?? [];
    block.push(slot);
    blocks.set(slot.blockIndex as number, block);
  }
  return [...blocks.values()];
}

const schemeArb = fc
  .record({
    weights: fc.array(fc.integer({ min: 1, max: 3 }), { minLength: 2, maxLength: 4 }),
    multiples: fc.uniqueArray(fc.integer({ min: 1, max: 4 }), { minLength: 1, maxLength: 3 }),
  })
  .map(({ weights, multiples }): PermutedBlocksParameters => {
    const total = weights.reduce((a, b) => a + b, 0);
    return {
      method: 'permuted-blocks',
      conditions: weights.map((weight, i) => ({ conditionId: `c${i}`, weight })),
      blockSizes: multiples.map((m) => m * total),
    };
  });

describe('permuted blocks', () => {
  it('fills every complete block exactly in the weights, with an allowed size', () => {
    fc.assert(
      fc.property(seedArb, schemeArb, fc.integer({ min: 0, max: 300 }), (seed, parameters, count) => {
        const slots = generatePermutedBlockSequence(seed, parameters, count);
        expect(slots).toHaveLength(count);
        expect(slots.map((s) => s.position)).toEqual(Array.from({ length: count }, (_, i) => i + 1));
        const blocks = blocksOf(slots);
        blocks.forEach((block, b) => {
          const size = block[0].blockSize as number;
          expect(parameters.blockSizes).toContain(size);
          expect(block.map((s) => s.positionInBlock)).toEqual(block.map((_, i) => i + 1));
          if (block.length < size) {
            expect(b).toBe(blocks.length - 1); // only the last block may be cut short
            return;
          }
          expect(block).toHaveLength(size);
          const counts: Record<string, number> = {};
          for (const slot of block) counts[slot.conditionId] = (counts[slot.conditionId] ?? 0) + 1;
          expect(counts).toEqual(expectedBlockCounts(parameters.conditions, size));
        });
      }),
      { numRuns: 100 },
    );
  });

  it('yields the same sequence for the same seed, and a longer request extends it without changing it', () => {
    fc.assert(
      fc.property(seedArb, schemeArb, (seed, parameters) => {
        const first = generatePermutedBlockSequence(seed, parameters, 60);
        expect(generatePermutedBlockSequence(seed, parameters, 60)).toEqual(first);
        expect(generatePermutedBlockSequence(seed, parameters, 150).slice(0, 60)).toEqual(first);
      }),
      { numRuns: 50 },
    );
  });

  it('yields a different sequence for a different seed', () => {
    const parameters: PermutedBlocksParameters = {
      method: 'permuted-blocks',
      conditions: [
        { conditionId: 'A', weight: 1 },
        { conditionId: 'B', weight: 1 },
      ],
      blockSizes: [2, 4],
    };
    fc.assert(
      fc.property(seedArb, seedArb, (a, b) => {
        fc.pre(a !== b);
        const ids = (seed: string) =>
          generatePermutedBlockSequence(seed, parameters, 64)
            .map((s) => s.conditionId)
            .join('');
        expect(ids(a)).not.toBe(ids(b));
      }),
      { numRuns: 100 },
    );
  });

  it('produces all 6 arrangements of a block of 4 for two conditions, and only those', () => {
    // Outside check: the C(4,2) = 6 arrangements AABB, ABAB, ABBA, BAAB, BABA, BBAA (counted by hand).
    const parameters: PermutedBlocksParameters = {
      method: 'permuted-blocks',
      conditions: [
        { conditionId: 'A', weight: 1 },
        { conditionId: 'B', weight: 1 },
      ],
      blockSizes: [4],
    };
    const blocks = 1500;
    const counts = new Map<string, number>();
    for (const block of blocksOf(generatePermutedBlockSequence(SEED, parameters, blocks * 4))) {
      const pattern = block.map((s) => s.conditionId).join('');
      counts.set(pattern, (counts.get(pattern) ?? 0) + 1);
    }
    expect([...counts.keys()].sort()).toEqual(['AABB', 'ABAB', 'ABBA', 'BAAB', 'BABA', 'BBAA']);
    // Each arrangement equally likely: Binomial(1500, 1/6), sd ≈ 14.4, 4 sd tolerance (common practice).
    for (const count of counts.values())
      expect(Math.abs(count - blocks / 6)).toBeLessThan(4 * Math.sqrt((blocks * 5) / 36));
  });

  it('draws block sizes from the allowed list, each about equally often', () => {
    const parameters: PermutedBlocksParameters = {
      method: 'permuted-blocks',
      conditions: [
        { conditionId: 'A', weight: 1 },
        { conditionId: 'B', weight: 2 },
      ],
      blockSizes: [3, 6, 9],
    };
    const sizes = blocksOf(generatePermutedBlockSequence(SEED, parameters, 18_000)).map(
      (b) => b[0].blockSize as number,
    );
    for (const size of [3, 6, 9]) {
      const share = sizes.filter((s) => s === size).length / sizes.length;
      expect(Math.abs(share - 1 / 3)).toBeLessThan(4 * Math.sqrt(2 / 9 / sizes.length));
    }
  });

  it('refuses block sizes off the weights and a negative slot count', () => {
    const parameters: PermutedBlocksParameters = {
      method: 'permuted-blocks',
      conditions: [
        { conditionId: 'A', weight: 1 },
        { conditionId: 'B', weight: 1 },
      ],
      blockSizes: [3],
    };
    expect(() => generatePermutedBlockSequence(SEED, parameters, 10)).toThrow(
      /blockSizes\[0\]: 3 is not a multiple of the total weight 2/,
    );
    expect(() => generatePermutedBlockSequence(SEED, { ...parameters, blockSizes: [2] }, -1)).toThrow(/count/);
  });
});
