import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { RandomizationError } from '../randomization-error';
import { MatchedPairsParameters } from '../scheme-parameters';
import { assignMatchedPairs, PretestedParticipant } from './matched-pairs';

const seedArb = fc.uint8Array({ minLength: 32, maxLength: 32 }).map((bytes) => Buffer.from(bytes).toString('hex'));
const SEED = '9d'.repeat(32);
const parameters: MatchedPairsParameters = {
  method: 'matched-pairs',
  conditions: [
    { conditionId: 'audio', weight: 1 },
    { conditionId: 'map', weight: 1 },
  ],
  pretestId: 'pretest',
};

describe('matched pairs', () => {
  it('pairs neighbours by pretest, ties ordered by id, one of each condition per pair', () => {
    const cohort: PretestedParticipant[] = [
      { participantId: 'p05', pretest: 71 },
      { participantId: 'p02', pretest: 40 },
      { participantId: 'p04', pretest: 55 },
      { participantId: 'p01', pretest: 55 },
      { participantId: 'p03', pretest: 90 },
      { participantId: 'p06', pretest: 12 },
    ];
    const result = assignMatchedPairs(SEED, parameters, cohort);
    expect(result.pairs.map((p) => p.members.map((m) => m.participantId))).toEqual([
      ['p06', 'p02'],
      ['p01', 'p04'],
      ['p05', 'p03'],
    ]);
    for (const pair of result.pairs) expect(pair.members.map((m) => m.conditionId).sort()).toEqual(['audio', 'map']);
    expect(result.leftover).toBeNull();
    expect(result.allocations.map((a) => a.participantId)).toEqual(cohort.map((p) => p.participantId));
  });

  it('reports the highest scorer of an odd cohort as the odd one out and assigns them by a coin', () => {
    fc.assert(
      fc.property(
        seedArb,
        fc.uniqueArray(fc.integer({ min: 0, max: 100 }), { minLength: 1, maxLength: 41 }),
        (seed, scores) => {
          fc.pre(scores.length % 2 === 1);
          const cohort = scores.map((pretest, i) => ({ participantId: `p${i}`, pretest }));
          const result = assignMatchedPairs(seed, parameters, cohort);
          expect(result.pairs).toHaveLength((scores.length - 1) / 2);
          expect(result.leftover?.pretest).toBe(Math.max(...scores));
          expect(['audio', 'map']).toContain(result.leftover?.conditionId);
          const paired = result.pairs.flatMap((p) => p.members.map((m) => m.pretest));
          expect(paired).toEqual(
            scores
              .slice()
              .sort((a, b) => a - b)
              .slice(0, -1),
          );
        },
      ),
    );
  });

  it('flips a fair coin inside each pair', () => {
    const cohort = Array.from({ length: 4000 }, (_, i) => ({
      participantId: `p${String(i).padStart(4, '0')}`,
      pretest: i,
    }));
    const result = assignMatchedPairs(SEED, parameters, cohort);
    const lowGetsAudio = result.pairs.filter((p) => p.members[0].conditionId === 'audio').length;
    // Binomial(2000, 1/2): sd ≈ 22.4, 4 sd tolerance (common practice).
    expect(Math.abs(lowGetsAudio - 1000)).toBeLessThan(90);
    expect(assignMatchedPairs(SEED, parameters, cohort)).toEqual(result);
  });

  it('refuses an empty cohort, repeated ids and missing scores', () => {
    expect(() => assignMatchedPairs(SEED, parameters, [])).toThrow(/participants: must list at least one/);
    try {
      assignMatchedPairs(SEED, parameters, [
        { participantId: 'a', pretest: 1 },
        { participantId: 'a', pretest: Number.NaN },
      ]);
      expect.unreachable();
    } catch (error) {
      expect((error as RandomizationError).fieldErrors.map((e) => e.field)).toEqual([
        'participants[1].participantId',
        'participants[1].pretest',
      ]);
    }
  });
});
