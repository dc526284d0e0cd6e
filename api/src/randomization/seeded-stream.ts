/**
 * Deterministic random streams derived from a study's sealed seed.
 *
 * A stream is seedrandom's xor4096 generator seeded with the text `<seed>/<label>`, where `<seed>` is the
 * 64 lowercase hex characters of the 256-bit secret and `<label>` names what the stream is for
 * (see streamLabel). Why xor4096 (Brent's xorgens): its 4096-bit state and period 2^4096 − 2^32 are far
 * larger than the 256-bit seed, so distinct seeds do not collapse onto a smaller state as they could with
 * alea or xor128 (periods near 2^116 and 2^128); it mixes every character of a string seed into that state;
 * and its author reports it passes the standard statistical test batteries. Allocation never needs
 * unpredictability from the generator itself: that comes from the seed staying sealed.
 *
 * Draws, so an auditor can replay them with seedrandom alone:
 * - uniform(): prng.double(), 53 bits in (0, 1).
 * - integerBelow(n): u = prng.int32() >>> 0; redraw while u >= 2^32 − (2^32 mod n); return u mod n.
 * - shuffle: Fisher–Yates from the last index down: for i = len−1 … 1, j = integerBelow(i + 1), swap i and j.
 * - weightedPick: whole-number weights → integerBelow(sum) walked through the cumulative weights in list
 *   order; other weights → uniform() × sum walked the same way.
 */
import { randomBytes } from 'node:crypto';
import seedrandom from 'seedrandom';
import { fail, RandomizationErrorCode } from './randomization-error';

const SEED_PATTERN = /^[0-9a-fA-F]{64}$/;
const TWO_POW_32 = 0x1_0000_0000;

export interface SeededStream {
  readonly label: string;
  /** A float in (0, 1) with 53 random bits. */
  uniform(): number;
  /** An integer in [0, n), without modulo bias; n from 1 to 2^32. */
  integerBelow(n: number): number;
  /** An integer in [min, max], both ends included. */
  integerInRange(min: number, max: number): number;
  /** A shuffled copy (Fisher–Yates). */
  shuffle<T>(items: readonly T[]): T[];
  /** The index picked with probability weight / sum of weights. */
  weightedPick(weights: readonly number[]): number;
}

/** Labels of the streams the schemes draw from, one per sequence or per arrival. */
export const streamLabel = {
  simple: (stratumKey: string) => `simple:${stratumKey}`,
  blocks: (stratumKey: string) => `blocks:${stratumKey}`,
  orders: (stratumKey: string) => `orders:${stratumKey}`,
  minimization: (arrivalPosition: number) => `minimization:${arrivalPosition}`,
  matchedPairs: () => 'matched-pairs',
  dryRunCovariates: () => 'dry-run:covariates',
} as const;

/** A fresh 256-bit seed from the operating system's cryptographic source, as 64 lowercase hex characters. */
export function generateSeed(): string {
  return randomBytes(32).toString('hex');
}

/** Checks a seed and returns it in lowercase (the form every stream and commitment uses). */
export function normalizeSeed(seed: unknown, field = 'seed'): string {
  if (typeof seed !== 'string' || !SEED_PATTERN.test(seed)) {
    fail(RandomizationErrorCode.InvalidSeed, field, 'must be 64 hexadecimal characters (a 256-bit seed)');
  }
  return seed.toLowerCase();
}

/** The exact text seedrandom.xor4096 is seeded with for this stream. */
export function streamSeedText(seed: string, label: string): string {
  return `${normalizeSeed(seed)}/${label}`;
}

export function createSeededStream(seed: string, label: string): SeededStream {
  return new Xor4096Stream(seedrandom.xor4096(streamSeedText(seed, label)), label);
}

class Xor4096Stream implements SeededStream {
  constructor(
    private readonly prng: seedrandom.PRNG,
    readonly label: string,
  ) {}

  uniform(): number {
    return this.prng.double();
  }

  integerBelow(n: number): number {
    if (!Number.isSafeInteger(n) || n < 1 || n > TWO_POW_32) {
      fail(RandomizationErrorCode.InvalidInput, 'n', `must be a whole number from 1 to 2^32 (got ${n})`);
    }
    const limit = TWO_POW_32 - (TWO_POW_32 % n);
    let u = this.prng.int32() >>> 0;
    while (u >= limit) u = this.prng.int32() >>> 0;
    return u % n;
  }

  integerInRange(min: number, max: number): number {
    if (!Number.isSafeInteger(min) || !Number.isSafeInteger(max) || max < min) {
      fail(RandomizationErrorCode.InvalidInput, 'max', `must be a whole number at least min (got ${min}..${max})`);
    }
    return min + this.integerBelow(max - min + 1);
  }

  shuffle<T>(items: readonly T[]): T[] {
    const result = items.slice();
    for (let i = result.length - 1; i > 0; i--) {
      const j = this.integerBelow(i + 1);
      const held = result[i];
      result[i] = result[j];
      result[j] = held;
    }
    return result;
  }

  weightedPick(weights: readonly number[]): number {
    let sum = 0;
    let whole = true;
    for (const w of weights) {
      if (!Number.isFinite(w) || w < 0) {
        fail(RandomizationErrorCode.InvalidInput, 'weights', 'must be a non-empty list of finite numbers of 0 or more');
      }
      sum += w;
      if (!Number.isSafeInteger(w)) whole = false;
    }
    if (!(sum > 0)) fail(RandomizationErrorCode.InvalidInput, 'weights', 'must be a non-empty list, not all 0');
    const target = whole && sum <= TWO_POW_32 ? this.integerBelow(sum) : this.prng.double() * sum;
    let cumulative = 0;
    for (let i = 0; i < weights.length; i++) {
      cumulative += weights[i];
      if (target < cumulative) return i;
    }
    // Float rounding can leave target at the very top: give it to the last positive weight.
    for (let i = weights.length - 1; i >= 0; i--) if (weights[i] > 0) return i;
    return weights.length - 1;
  }
}
