/**
 * Matched pairs for a pretested cohort imported in one batch.
 *
 * Sort by pretest ascending (stable; equal scores ordered by participant id in code-unit order), pair
 * neighbours 1–2, 3–4, …, and flip a fair coin per pair from the stream labelled `matched-pairs`, pairs in
 * sorted order: integerBelow(2) = 0 gives the lower-scoring member the first listed condition and the other
 * member the second; 1 swaps them. With an odd cohort the highest scorer (last after sorting) is the odd one
 * out: after all pairs, one more integerBelow(2) picks the first (0) or second (1) condition for them.
 */
import { FieldError, RandomizationError, RandomizationErrorCode } from '../randomization-error';
import { MatchedPairsParameters, parseParametersOf } from '../scheme-parameters';
import { createSeededStream, streamLabel } from '../seeded-stream';
import { compareCodeUnits } from '../strata';

export interface PretestedParticipant {
  participantId: string;
  pretest: number;
}

export interface MatchedAllocation {
  participantId: string;
  pretest: number;
  conditionId: string;
}

export interface MatchedPair {
  /** 1-based, in sorted order from the lowest pretest. */
  pairIndex: number;
  /** Lower (or equal) pretest first. */
  members: [MatchedAllocation, MatchedAllocation];
}

export interface MatchedPairsResult {
  pairs: MatchedPair[];
  /** The odd one out, assigned by its own coin, or null for an even cohort. */
  leftover: MatchedAllocation | null;
  /** Every participant's condition, in the order the participants were given. */
  allocations: MatchedAllocation[];
}

function checkCohort(participants: readonly PretestedParticipant[]): void {
  const errors: FieldError[] = [];
  if (!Array.isArray(participants) || participants.length === 0) {
    errors.push({ field: 'participants', message: 'must list at least one pretested participant' });
  } else {
    const seen = new Set<string>();
    participants.forEach((p, i) => {
      if (typeof p?.participantId !== 'string' || p.participantId === '') {
        errors.push({ field: `participants[${i}].participantId`, message: 'must be a non-empty id' });
      } else if (seen.has(p.participantId)) {
        errors.push({ field: `participants[${i}].participantId`, message: `"${p.participantId}" is listed twice` });
      } else {
        seen.add(p.participantId);
      }
      if (typeof p?.pretest !== 'number' || !Number.isFinite(p.pretest)) {
        errors.push({ field: `participants[${i}].pretest`, message: 'must be a finite number (the pretest score)' });
      }
    });
  }
  if (errors.length > 0) throw new RandomizationError(RandomizationErrorCode.InvalidInput, errors);
}

export function assignMatchedPairs(
  seed: string,
  parameters: MatchedPairsParameters,
  participants: readonly PretestedParticipant[],
): MatchedPairsResult {
  const checked = parseParametersOf(parameters, ['matched-pairs']);
  checkCohort(participants);
  const [first, second] = checked.conditions.map((c) => c.conditionId);
  const sorted = participants
    .slice()
    .sort((a, b) => a.pretest - b.pretest || compareCodeUnits(a.participantId, b.participantId));
  const stream = createSeededStream(seed, streamLabel.matchedPairs());

  const pairs: MatchedPair[] = [];
  for (let i = 0; i + 1 < sorted.length; i += 2) {
    const [lowCondition, highCondition] = stream.integerBelow(2) === 0 ? [first, second] : [second, first];
    pairs.push({
      pairIndex: pairs.length + 1,
      members: [
        { ...pick(sorted[i]), conditionId: lowCondition },
        { ...pick(sorted[i + 1]), conditionId: highCondition },
      ],
    });
  }
  const odd = sorted.length % 2 === 1 ? sorted[sorted.length - 1] : null;
  const leftover = odd ? { ...pick(odd), conditionId: stream.integerBelow(2) === 0 ? first : second } : null;

  const byId = new Map<string, MatchedAllocation>();
  for (const pair of pairs) for (const member of pair.members) byId.set(member.participantId, member);
  if (leftover) byId.set(leftover.participantId, leftover);
  return { pairs, leftover, allocations: participants.map((p) => byId.get(p.participantId) as MatchedAllocation) };
}

function pick(p: PretestedParticipant): PretestedParticipant {
  return { participantId: p.participantId, pretest: p.pretest };
}
