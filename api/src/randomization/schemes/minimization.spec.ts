import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { RandomizationError } from '../randomization-error';
import { MinimizationParameters, SimpleParameters } from '../scheme-parameters';
import { createSeededStream } from '../seeded-stream';
import { FactorLevels, factorLevels } from '../strata';
import {
  assignByMinimization,
  decideByMinimization,
  emptyTally,
  imbalanceIfAssigned,
  MinimizationTally,
  recordInTally,
  tallyFromAllocations,
} from './minimization';
import { generateSimpleSequence } from './simple';

const seedArb = fc.uint8Array({ minLength: 32, maxLength: 32 }).map((bytes) => Buffer.from(bytes).toString('hex'));
const SEED = '3c'.repeat(32);

const handedness = { id: 'hand', kind: 'categorical' as const, categories: ['left', 'right'] };
const pretest = { id: 'pretest', kind: 'numeric' as const, cutPoints: [65] };

function twoArm(extra: Partial<MinimizationParameters> = {}): MinimizationParameters {
  return {
    method: 'minimization',
    conditions: [
      { conditionId: 'A', weight: 1 },
      { conditionId: 'B', weight: 1 },
    ],
    factors: [
      { ...handedness, weight: 1 },
      { ...pretest, weight: 1 },
    ],
    measure: 'range',
    coinProbability: 1,
    ...extra,
  };
}

describe('minimization (Pocock & Simon 1975)', () => {
  // Hand-worked example of the Pocock & Simon (1975) method, two factors, two conditions, range measure.
  // Earlier participants: 1 left/<65→A, 2 right/<65→B, 3 right/≥65→A, 4 left/≥65→A, 5 right/<65→B, 6 left/<65→B.
  // Counts at the newcomer's levels (left, pretest 70 so ≥65): left A2 B1 (participants 1, 4 | 6); ≥65 A2 B0 (3, 4).
  // If A: left A3 B1 → range 2; ≥65 A3 B0 → 3; G_A = 2 + 3 = 5.
  // If B: left A2 B2 → 0;       ≥65 A2 B1 → 1; G_B = 0 + 1 = 1.           → B preferred.
  // Variance (divisor k − 1 = 1, so (x − y)² / 2): G_A = 4/2 + 9/2 = 6.5; G_B = 0 + 1/2 = 0.5.
  // Factor weights 1 (hand) and 2 (pretest), range: G_A = 2 + 2·3 = 8; G_B = 0 + 2·1 = 2.
  const earlier = [
    { covariates: { hand: 'left', pretest: 50 }, conditionId: 'A' },
    { covariates: { hand: 'right', pretest: 40 }, conditionId: 'B' },
    { covariates: { hand: 'right', pretest: 65 }, conditionId: 'A' },
    { covariates: { hand: 'left', pretest: 90 }, conditionId: 'A' },
    { covariates: { hand: 'right', pretest: 64 }, conditionId: 'B' },
    { covariates: { hand: 'left', pretest: 30 }, conditionId: 'B' },
  ];
  const newcomer = { hand: 'left', pretest: 70 };

  it('matches the hand-worked example for two factors (range, variance, factor weights)', () => {
    const cases: [Partial<MinimizationParameters>, number, number][] = [
      [{}, 5, 1],
      [{ measure: 'variance' }, 6.5, 0.5],
      [
        {
          factors: [
            { ...handedness, weight: 1 },
            { ...pretest, weight: 2 },
          ],
        },
        8,
        2,
      ],
    ];
    for (const [extra, gA, gB] of cases) {
      const parameters = twoArm(extra);
      const tally = tallyFromAllocations(parameters, earlier);
      const decision = assignByMinimization({
        seed: SEED,
        parameters,
        arrivalPosition: 7,
        covariates: newcomer,
        tally,
      });
      expect(decision.imbalanceByCondition).toEqual([
        { conditionId: 'A', imbalance: gA },
        { conditionId: 'B', imbalance: gB },
      ]);
      expect(decision.tiedConditionIds).toEqual(['B']);
      expect(decision.conditionId).toBe('B');
      expect(decision.levels).toEqual({ hand: 'left', pretest: '≥65' });
    }
  });

  // Hand-worked, three conditions with allocation weights A 2 : B 1 : C 1, factors site and pretest (cut 50).
  // Earlier at the newcomer's levels: north A4 B1 C2; ≥50 A2 B1 C1. Divided by weight: north 2,1,2; ≥50 1,1,1.
  // If A: north 2.5,1,2 → range 1.5; ≥50 1.5,1,1 → 0.5; G_A = 2.
  // If B: north 2,2,2 → 0;          ≥50 1,2,1 → 1;      G_B = 1.
  // If C: north 2,1,3 → 2;          ≥50 1,1,2 → 1;      G_C = 3.        → B preferred.
  it('divides counts by the allocation weight (hand-worked, 2:1:1)', () => {
    const parameters: MinimizationParameters = {
      method: 'minimization',
      conditions: [
        { conditionId: 'A', weight: 2 },
        { conditionId: 'B', weight: 1 },
        { conditionId: 'C', weight: 1 },
      ],
      factors: [
        { id: 'site', kind: 'categorical', categories: ['north', 'south'], weight: 1 },
        { id: 'pretest', kind: 'numeric', cutPoints: [50], weight: 1 },
      ],
      measure: 'range',
      coinProbability: 1,
    };
    const at = (site: string, score: number, conditionId: string) => ({
      covariates: { site, pretest: score },
      conditionId,
    });
    const tally = tallyFromAllocations(parameters, [
      at('north', 60, 'A'),
      at('north', 55, 'A'),
      at('north', 20, 'A'),
      at('north', 10, 'A'),
      at('north', 50, 'B'),
      at('north', 70, 'C'),
      at('north', 30, 'C'),
      at('south', 20, 'A'),
      at('south', 40, 'B'),
    ]);
    const decision = assignByMinimization({
      seed: SEED,
      parameters,
      arrivalPosition: 10,
      covariates: { site: 'north', pretest: 80 },
      tally,
    });
    expect(decision.imbalanceByCondition.map((c) => c.imbalance)).toEqual([2, 1, 3]);
    expect(decision.conditionId).toBe('B');
  });

  it('breaks ties at random among the tied conditions', () => {
    const parameters = twoArm();
    const picks = { A: 0, B: 0 };
    const tally = emptyTally(parameters);
    for (let position = 1; position <= 2000; position++) {
      const decision = decideByMinimization(SEED, parameters, position, { hand: 'left', pretest: '<65' }, tally);
      expect(decision.tiedConditionIds).toEqual(['A', 'B']);
      picks[decision.conditionId as 'A' | 'B'] += 1;
    }
    // Binomial(2000, 1/2): sd ≈ 22.4, 4 sd tolerance (common practice).
    expect(Math.abs(picks.A - 1000)).toBeLessThan(90);
  });

  it('follows the preferred condition with probability p and spreads 1 − p over the others', () => {
    const parameters: MinimizationParameters = {
      ...twoArm({ coinProbability: 0.7 }),
      conditions: [
        { conditionId: 'A', weight: 1 },
        { conditionId: 'B', weight: 1 },
        { conditionId: 'C', weight: 1 },
      ],
    };
    const levels: FactorLevels = { hand: 'left', pretest: '<65' };
    const tally = emptyTally(parameters);
    recordInTally(tally, levels, 'A');
    recordInTally(tally, levels, 'B');
    const n = 6000;
    const counts: Record<string, number> = { A: 0, B: 0, C: 0 };
    for (let position = 1; position <= n; position++) {
      const decision = decideByMinimization(SEED, parameters, position, levels, tally);
      expect(decision.preferredConditionId).toBe('C');
      counts[decision.conditionId] += 1;
    }
    // Binomial shares, 4 sd tolerance (common practice): C 0.7, A and B 0.15 each.
    expect(Math.abs(counts.C / n - 0.7)).toBeLessThan(4 * Math.sqrt(0.21 / n));
    expect(Math.abs(counts.A / n - 0.15)).toBeLessThan(4 * Math.sqrt(0.1275 / n));
    expect(Math.abs(counts.B / n - 0.15)).toBeLessThan(4 * Math.sqrt(0.1275 / n));
  });

  it('with one factor, two equal conditions and p = 1 never lets a level drift more than 1 apart', () => {
    fc.assert(
      fc.property(
        seedArb,
        fc.integer({ min: 2, max: 5 }),
        fc.array(fc.nat(), { minLength: 1, maxLength: 200 }),
        (seed, levelCount, arrivals) => {
          const categories = Array.from({ length: levelCount }, (_, i) => `level-${i}`);
          const parameters: MinimizationParameters = {
            ...twoArm(),
            factors: [{ id: 'group', kind: 'categorical', categories, weight: 1 }],
          };
          const tally = emptyTally(parameters);
          arrivals.forEach((raw, i) => {
            const covariates = { group: categories[raw % levelCount] };
            const decision = assignByMinimization({ seed, parameters, arrivalPosition: i + 1, covariates, tally });
            recordInTally(tally, decision.levels, decision.conditionId);
            for (const [a, b] of Object.values(tally.counts.group)) expect(Math.abs(a - b)).toBeLessThanOrEqual(1);
          });
        },
      ),
      { numRuns: 100 },
    );
  });

  it('keeps the marginal imbalance over 1,000 simulated studies clearly below simple randomization', () => {
    // Each run: 1,000 studies of 30 participants, 2-3 factors of 2-3 equally likely levels, default p (2/3).
    // Sum over factor levels of |n_A − n_B|; when written the ratio to simple randomization was 0.53-0.64.
    fc.assert(
      fc.property(
        seedArb,
        fc.array(fc.integer({ min: 2, max: 3 }), { minLength: 2, maxLength: 3 }),
        (master, levelCounts) => {
          const factors = levelCounts.map((count, f) => ({
            id: `f${f}`,
            kind: 'categorical' as const,
            categories: Array.from({ length: count }, (_, i) => `l${i}`),
            weight: 1,
          }));
          const parameters: MinimizationParameters = {
            method: 'minimization',
            conditions: twoArm().conditions,
            factors,
            measure: 'range',
            coinProbability: 2 / 3,
          };
          const simple: SimpleParameters = { method: 'simple', conditions: parameters.conditions };
          const studies = 1000;
          const size = 30;
          const studySeeds = createSeededStream(master, 'study-seeds');
          const covariateStream = createSeededStream(master, 'covariates');
          let minimizationTotal = 0;
          let simpleTotal = 0;
          for (let s = 0; s < studies; s++) {
            const seed = Array.from({ length: 8 }, () =>
              studySeeds
                .integerBelow(2 ** 32)
                .toString(16)
                .padStart(8, '0'),
            ).join('');
            const people: FactorLevels[] = Array.from({ length: size }, () =>
              Object.fromEntries(
                factors.map((f) => [f.id, f.categories[covariateStream.integerBelow(f.categories.length)]]),
              ),
            );
            const byMinimization = emptyTally(parameters);
            const bySimple = emptyTally(parameters);
            const simpleSlots = generateSimpleSequence(seed, simple, size);
            people.forEach((levels, i) => {
              recordInTally(
                byMinimization,
                levels,
                decideByMinimization(seed, parameters, i + 1, levels, byMinimization).conditionId,
              );
              recordInTally(bySimple, levels, simpleSlots[i].conditionId);
            });
            minimizationTotal += marginalImbalance(byMinimization);
            simpleTotal += marginalImbalance(bySimple);
          }
          expect(minimizationTotal).toBeLessThan(0.75 * simpleTotal);
        },
      ),
      { numRuns: 3, endOnFailure: true },
    );
  });

  it('refuses a tally and arrival position that do not fit together', () => {
    const parameters = twoArm();
    const tally = tallyFromAllocations(parameters, earlier);
    expect(() =>
      assignByMinimization({ seed: SEED, parameters, arrivalPosition: 3, covariates: newcomer, tally }),
    ).toThrow(/arrivalPosition: must be 7/);
    const foreign: MinimizationTally = { ...tally, conditionIds: ['X', 'Y'] };
    expect(() =>
      assignByMinimization({ seed: SEED, parameters, arrivalPosition: 7, covariates: newcomer, tally: foreign }),
    ).toThrow(/tally/);
    try {
      assignByMinimization({
        seed: SEED,
        parameters,
        arrivalPosition: 7,
        covariates: { hand: 'both', pretest: 1 },
        tally,
      });
      expect.unreachable();
    } catch (error) {
      expect((error as RandomizationError).fieldErrors[0].field).toBe('covariates.hand');
    }
  });

  it('exposes G for every condition on the first arrival as a tie', () => {
    const parameters = twoArm();
    const levels = { hand: 'right', pretest: factorLevels(pretest)[0] };
    expect(imbalanceIfAssigned(parameters, emptyTally(parameters), levels).map((c) => c.imbalance)).toEqual([2, 2]);
  });
});

function marginalImbalance(tally: MinimizationTally): number {
  let total = 0;
  for (const levels of Object.values(tally.counts))
    for (const [a, b] of Object.values(levels)) total += Math.abs(a - b);
  return total;
}
