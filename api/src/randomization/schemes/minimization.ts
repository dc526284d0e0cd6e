/**
 * Minimization (Pocock & Simon 1975, Biometrics 31:103-115).
 *
 * For a new participant, and for each candidate condition j: pretend the participant is assigned to j;
 * on every factor take the counts of earlier participants who share the new participant's level, divided
 * by each condition's allocation weight (so a 2:1 ratio counts as balanced); measure their spread (range =
 * max − min, or variance with divisor k − 1 — the divisor does not change which condition wins); and sum the
 * spreads times the factor weights. That sum is G_j. The condition with the smallest G_j is preferred and
 * assigned with probability p (the biased coin); otherwise one of the other conditions, each equally likely.
 *
 * Draws from the stream labelled `minimization:<arrivalPosition>` (1-based: the n-th participant allocated
 * in the study), in this order, each always drawn: (1) tie-break integerBelow(number of conditions tied
 * at the smallest G) among them in listed order; (2) the coin, uniform() < p; (3) only when the coin says
 * "not preferred", integerBelow(k − 1) among the remaining conditions in listed order.
 */
import { fail, RandomizationError, RandomizationErrorCode } from '../randomization-error';
import { ImbalanceMeasure, MinimizationParameters, parseParametersOf } from '../scheme-parameters';
import { createSeededStream, streamLabel } from '../seeded-stream';
import { Covariates, FactorLevels, factorLevels, participantLevels } from '../strata';

/** Counts so far, per factor level and condition; plain JSON so the service can rebuild or cache it. */
export interface MinimizationTally {
  conditionIds: string[];
  /** counts[factorId][level][i]: participants at that level already assigned to conditionIds[i]. */
  counts: Record<string, Record<string, number[]>>;
  /** Participants allocated so far; the next arrival position is allocated + 1. */
  allocated: number;
}

export interface ConditionImbalance {
  conditionId: string;
  /** G: the weighted total imbalance if the participant were assigned to this condition. */
  imbalance: number;
}

export interface MinimizationDecision {
  arrivalPosition: number;
  conditionId: string;
  levels: FactorLevels;
  imbalanceByCondition: ConditionImbalance[];
  tiedConditionIds: string[];
  preferredConditionId: string;
  /** False when the biased coin sent the participant to a condition other than the preferred one. */
  followedPreference: boolean;
}

// Counts divided by weights are fractions: totals equal on paper can differ in the last bit.
const TIE_TOLERANCE = 1e-9;

export function emptyTally(parameters: MinimizationParameters): MinimizationTally {
  const checked = parseParametersOf(parameters, ['minimization']);
  return emptyTallyOf(checked);
}

export function emptyTallyOf(parameters: MinimizationParameters): MinimizationTally {
  const k = parameters.conditions.length;
  return {
    conditionIds: parameters.conditions.map((c) => c.conditionId),
    counts: Object.fromEntries(
      parameters.factors.map((f) => [
        f.id,
        Object.fromEntries(factorLevels(f).map((level) => [level, new Array<number>(k).fill(0)])),
      ]),
    ),
    allocated: 0,
  };
}

/** Adds one allocation to the tally, in place. */
export function recordInTally(tally: MinimizationTally, levels: FactorLevels, conditionId: string): void {
  const index = tally.conditionIds.indexOf(conditionId);
  if (index < 0)
    fail(RandomizationErrorCode.InvalidInput, 'conditionId', `"${conditionId}" is not a condition of this scheme`);
  for (const [factorId, level] of Object.entries(levels)) {
    const row = tally.counts[factorId]?.[level];
    if (row === undefined)
      fail(RandomizationErrorCode.InvalidInput, `levels.${factorId}`, `"${level}" is not a level of this factor`);
    row[index] += 1;
  }
  tally.allocated += 1;
}

/** The tally after these earlier allocations, in any order. */
export function tallyFromAllocations(
  parameters: MinimizationParameters,
  allocations: readonly { covariates: Covariates; conditionId: string }[],
): MinimizationTally {
  const checked = parseParametersOf(parameters, ['minimization']);
  const tally = emptyTallyOf(checked);
  for (const allocation of allocations) {
    recordInTally(tally, participantLevels(checked.factors, allocation.covariates), allocation.conditionId);
  }
  return tally;
}

export function spread(values: readonly number[], measure: ImbalanceMeasure): number {
  if (measure === 'range') {
    let max = -Infinity;
    let min = Infinity;
    for (const v of values) {
      if (v > max) max = v;
      if (v < min) min = v;
    }
    return max - min;
  }
  let mean = 0;
  for (const v of values) mean += v;
  mean /= values.length;
  let squares = 0;
  for (const v of values) squares += (v - mean) ** 2;
  return squares / (values.length - 1);
}

/** G_j for every condition j, in listed order. */
export function imbalanceIfAssigned(
  parameters: MinimizationParameters,
  tally: MinimizationTally,
  levels: FactorLevels,
): ConditionImbalance[] {
  const k = parameters.conditions.length;
  const rows = parameters.factors.map((factor) => tally.counts[factor.id][levels[factor.id]]);
  const normalized = new Array<number>(k);
  return parameters.conditions.map((candidate, j) => {
    let total = 0;
    parameters.factors.forEach((factor, f) => {
      for (let c = 0; c < k; c++) normalized[c] = (rows[f][c] + (c === j ? 1 : 0)) / parameters.conditions[c].weight;
      total += factor.weight * spread(normalized, parameters.measure);
    });
    return { conditionId: candidate.conditionId, imbalance: total };
  });
}

function checkTally(parameters: MinimizationParameters, tally: MinimizationTally): void {
  const ids = parameters.conditions.map((c) => c.conditionId);
  const problem = (message: string) => {
    throw new RandomizationError(RandomizationErrorCode.InvalidInput, [{ field: 'tally', message }]);
  };
  if (tally.conditionIds.length !== ids.length || tally.conditionIds.some((id, i) => id !== ids[i])) {
    problem('was built for other conditions than these parameters');
  }
  for (const factor of parameters.factors) {
    for (const level of factorLevels(factor)) {
      const row = tally.counts[factor.id]?.[level];
      if (!Array.isArray(row) || row.length !== ids.length || row.some((n) => !Number.isSafeInteger(n) || n < 0)) {
        problem(`has no valid counts for ${factor.id} = ${level}`);
      }
    }
  }
}

/** Decides one arrival; the caller then records it with recordInTally. Validation is the caller's. */
export function decideByMinimization(
  seed: string,
  parameters: MinimizationParameters,
  arrivalPosition: number,
  levels: FactorLevels,
  tally: MinimizationTally,
): MinimizationDecision {
  const imbalanceByCondition = imbalanceIfAssigned(parameters, tally, levels);
  let smallest = Infinity;
  for (const c of imbalanceByCondition) if (c.imbalance < smallest) smallest = c.imbalance;
  const tolerance = TIE_TOLERANCE * Math.max(1, Math.abs(smallest));
  const tiedConditionIds: string[] = [];
  for (const c of imbalanceByCondition) if (c.imbalance - smallest <= tolerance) tiedConditionIds.push(c.conditionId);

  const stream = createSeededStream(seed, streamLabel.minimization(arrivalPosition));
  const preferredConditionId = tiedConditionIds[stream.integerBelow(tiedConditionIds.length)];
  const followedPreference = stream.uniform() < parameters.coinProbability;
  let conditionId = preferredConditionId;
  if (!followedPreference) {
    const others = parameters.conditions.map((c) => c.conditionId).filter((id) => id !== preferredConditionId);
    conditionId = others[stream.integerBelow(others.length)];
  }
  return {
    arrivalPosition,
    conditionId,
    levels,
    imbalanceByCondition,
    tiedConditionIds,
    preferredConditionId,
    followedPreference,
  };
}

export interface MinimizationInput {
  seed: string;
  parameters: MinimizationParameters;
  /** 1-based position of this participant among everyone allocated in the study; must be tally.allocated + 1. */
  arrivalPosition: number;
  covariates: Covariates;
  tally: MinimizationTally;
}

/** Assigns one participant by minimization. Does not change the tally. */
export function assignByMinimization(input: MinimizationInput): MinimizationDecision {
  const parameters = parseParametersOf(input.parameters, ['minimization']);
  checkTally(parameters, input.tally);
  if (input.arrivalPosition !== input.tally.allocated + 1) {
    fail(
      RandomizationErrorCode.InvalidInput,
      'arrivalPosition',
      `must be ${input.tally.allocated + 1}: the tally holds ${input.tally.allocated} earlier allocations (got ${input.arrivalPosition})`,
    );
  }
  const levels = participantLevels(parameters.factors, input.covariates);
  return decideByMinimization(input.seed, parameters, input.arrivalPosition, levels, input.tally);
}
