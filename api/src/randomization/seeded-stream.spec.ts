import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { createRequire } from 'node:module';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { RandomizationError } from './randomization-error';
import { createSeededStream, generateSeed, normalizeSeed, streamSeedText } from './seeded-stream';

// seedrandom's own per-algorithm module file, loaded apart from our wrapper and its typed import.
const xor4096 = createRequire(__filename)('seedrandom/lib/xor4096') as (seed: string) => { double(): number };

const seedArb = fc.uint8Array({ minLength: 32, maxLength: 32 }).map((bytes) => Buffer.from(bytes).toString('hex'));
const SEED = '00112233445566778899aabbccddeeff00112233445566778899aabbccddeeff';

describe('seeded stream', () => {
  it('gives the same draws for the same seed and label, every time', () => {
    fc.assert(
      fc.property(seedArb, fc.string({ maxLength: 40 }), (seed, label) => {
        const a = createSeededStream(seed, label);
        const b = createSeededStream(seed.toUpperCase(), label);
        const drawsA = Array.from({ length: 20 }, () => a.integerBelow(1000));
        const drawsB = Array.from({ length: 20 }, () => b.integerBelow(1000));
        expect(drawsA).toEqual(drawsB);
      }),
      { numRuns: 100 },
    );
  });

  it('gives different draws for a different seed or a different label', () => {
    fc.assert(
      fc.property(seedArb, seedArb, (seed, other) => {
        fc.pre(seed !== other);
        const draws = (s: string, label: string) => {
          const stream = createSeededStream(s, label);
          return Array.from({ length: 8 }, () => stream.integerBelow(2 ** 32));
        };
        expect(draws(seed, 'blocks:all')).not.toEqual(draws(other, 'blocks:all'));
        expect(draws(seed, 'blocks:all')).not.toEqual(draws(seed, 'blocks:site=north'));
      }),
      { numRuns: 100 },
    );
  });

  it('is exactly seedrandom xor4096 seeded with "<seed>/<label>", loaded through its own module file', () => {
    // Outside check: the generator module as published in seedrandom (lib/xor4096.js), not our wrapper.
    const reference = xor4096(`${SEED}/minimization:7`);
    const stream = createSeededStream(SEED.toUpperCase(), 'minimization:7');
    expect(streamSeedText(SEED, 'minimization:7')).toBe(`${SEED}/minimization:7`);
    for (let i = 0; i < 50; i++) expect(stream.uniform()).toBe(reference.double());
  });

  it('draws integers below n without bias and inside the range', () => {
    const stream = createSeededStream(SEED, 'uniformity');
    const counts = new Array<number>(6).fill(0);
    const draws = 60_000;
    for (let i = 0; i < draws; i++) counts[stream.integerBelow(6)] += 1;
    // Each count is Binomial(60000, 1/6): sd ≈ 91; 4 sd is a tolerance a correct generator meets (common practice).
    for (const count of counts) expect(Math.abs(count - draws / 6)).toBeLessThan(4 * Math.sqrt((draws * 5) / 36));
    for (let i = 0; i < 1000; i++) {
      const x = stream.integerInRange(-3, 3);
      expect(x).toBeGreaterThanOrEqual(-3);
      expect(x).toBeLessThanOrEqual(3);
    }
    const u = stream.uniform();
    expect(u > 0 && u < 1).toBe(true);
  });

  it('shuffles into a permutation of the input', () => {
    fc.assert(
      fc.property(seedArb, fc.array(fc.integer(), { maxLength: 50 }), (seed, items) => {
        const shuffled = createSeededStream(seed, 'shuffle').shuffle(items);
        expect(shuffled.slice().sort((a, b) => a - b)).toEqual(items.slice().sort((a, b) => a - b));
      }),
    );
  });

  it('picks by weight, never an index of weight 0', () => {
    const stream = createSeededStream(SEED, 'weights');
    const counts = [0, 0, 0];
    for (let i = 0; i < 30_000; i++) counts[stream.weightedPick([1, 0, 2])] += 1;
    expect(counts[1]).toBe(0);
    // Binomial(30000, 1/3): sd ≈ 82 (common practice tolerance of 4 sd).
    expect(Math.abs(counts[0] - 10_000)).toBeLessThan(330);
    const floats = [0, 0];
    for (let i = 0; i < 30_000; i++) floats[stream.weightedPick([0.25, 0.75])] += 1;
    expect(Math.abs(floats[0] - 7_500)).toBeLessThan(4 * Math.sqrt(30_000 * 0.25 * 0.75));
  });

  it('refuses a seed that is not 64 hex characters, naming the field', () => {
    for (const bad of ['', 'abc', `${SEED}0`, 'g'.repeat(64), 42]) {
      try {
        normalizeSeed(bad);
        expect.unreachable();
      } catch (error) {
        expect(error).toBeInstanceOf(RandomizationError);
        expect((error as RandomizationError).fieldErrors[0].field).toBe('seed');
      }
    }
  });

  it('draws fresh 256-bit seeds as 64 lowercase hex characters', () => {
    const a = generateSeed();
    expect(a).toMatch(/^[0-9a-f]{64}$/);
    expect(generateSeed()).not.toBe(a);
  });

  it('never uses Math.random in the randomization code', () => {
    const sources: string[] = [];
    const walk = (dir: string) => {
      for (const name of readdirSync(dir)) {
        const path = join(dir, name);
        if (statSync(path).isDirectory()) walk(path);
        else if (name.endsWith('.ts') && !name.endsWith('.spec.ts')) sources.push(path);
      }
    };
    walk(__dirname);
    expect(sources.length).toBeGreaterThan(10);
    for (const path of sources) expect(readFileSync(path, 'utf8'), path).not.toMatch(/Math\.random/);
  });
});
