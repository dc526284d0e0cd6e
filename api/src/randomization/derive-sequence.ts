/**
 * Re-deriving every allocation from the seed, the parameters and the recorded arrivals, so a verifier can
 * compare allocation by allocation. Arrivals must be in allocation order (the order slots were taken, i.e.
 * the order of successful allocations); participants excluded before assignment are not arrivals.
 *
 * How each scheme is replayed:
 * - slot schemes (simple, permuted-blocks, stratified-blocks, within-subjects orders): the n-th arrival of
 *   a stratum takes slot n of that stratum's generated sequence;
 * - minimization: arrival n (1-based over the whole study) is decided from the tally of arrivals 1 … n−1
 *   and the stream `minimization:n`;
 * - matched pairs: the whole cohort is paired again; arrival order does not matter.
 */
import { FieldError, RandomizationError, RandomizationErrorCode } from './randomization-error';
import { isWithinDesign, parseSchemeParameters, SchemeParameters, StratificationFactor } from './scheme-parameters';
import { AllocationSlot, checkSlotCount } from './schemes/allocation-slot';
import { assignMatchedPairs } from './schemes/matched-pairs';
import { decideByMinimization, emptyTallyOf, recordInTally } from './schemes/minimization';
import { blockSlots } from './schemes/permuted-blocks';
import { generateSimpleSequence } from './schemes/simple';
import {
  allStratumKeys,
  Covariates,
  FactorLevels,
  participantLevels,
  stratumKeyFromLevels,
  UNSTRATIFIED_STRATUM_KEY,
} from './strata';
import { OrderSlot, orderSlots } from './within/order-sequence';

export interface RecordedArrival {
  participantId: string;
  covariates: Covariates;
}

export interface DerivedAllocation {
  /** 1-based position among all arrivals given. */
  arrivalPosition: number;
  participantId: string;
  stratumKey: string;
  /** Position in the stratum's slot sequence, for slot schemes; else null. */
  slotPosition: number | null;
  /** Pair number for matched pairs (null for the odd one out and for other schemes). */
  pairIndex: number | null;
  conditionId: string | null;
  order: string[] | null;
  orderIndex: number | null;
  /** The participant's level on each of the scheme's factors. */
  levels: FactorLevels;
}

/** True for schemes whose allocations are pre-generated slots the allocator takes one by one. */
export function usesSlots(parameters: SchemeParameters): boolean {
  return ['simple', 'permuted-blocks', 'stratified-blocks'].includes(parameters.method) || isWithinDesign(parameters);
}

/** The factors that define strata (or, for minimization, the factors it balances). */
export function schemeFactors(parameters: SchemeParameters): StratificationFactor[] {
  if (parameters.method === 'stratified-blocks' || parameters.method === 'minimization' || isWithinDesign(parameters)) {
    return parameters.factors;
  }
  return [];
}

/** The key of the sequence an arrival takes its slot from: "all" for unstratified schemes. */
export function slotStratumKey(parameters: SchemeParameters, covariates: Covariates): string {
  const checked = parseSchemeParameters(parameters);
  if (!usesSlots(checked)) return UNSTRATIFIED_STRATUM_KEY;
  const factors = schemeFactors(checked);
  return stratumKeyFromLevels(factors, participantLevels(factors, covariates));
}

/** The first `count` slots of one stratum's sequence, for any slot scheme. */
export function generateSlots(
  seed: string,
  parameters: SchemeParameters,
  stratumKey: string,
  count: number,
): AllocationSlot[] | OrderSlot[] {
  const checked = parseSchemeParameters(parameters);
  const slotCount = checkSlotCount(count);
  if (!usesSlots(checked)) {
    throw new RandomizationError(RandomizationErrorCode.InvalidParameters, [
      {
        field: 'method',
        message: `${checked.method} decides each arrival when it comes; it has no pre-generated slots`,
      },
    ]);
  }
  const strata = allStratumKeys(schemeFactors(checked));
  if (!strata.includes(stratumKey)) {
    throw new RandomizationError(RandomizationErrorCode.InvalidInput, [
      {
        field: 'stratumKey',
        message: `"${stratumKey}" is not a stratum of this scheme (strata: ${strata.join(', ')})`,
      },
    ]);
  }
  return slotsOf(seed, checked, stratumKey, slotCount);
}

function slotsOf(
  seed: string,
  parameters: SchemeParameters,
  stratumKey: string,
  count: number,
): AllocationSlot[] | OrderSlot[] {
  if (isWithinDesign(parameters)) return orderSlots(seed, parameters, stratumKey, count);
  switch (parameters.method) {
    case 'simple':
      return generateSimpleSequence(seed, parameters, count);
    case 'permuted-blocks':
    case 'stratified-blocks':
      return blockSlots(seed, parameters.conditions, parameters.blockSizes, stratumKey, count);
    default:
      return [];
  }
}

const MAX_REPORTED_ERRORS = 50;

function levelsOfArrivals(factors: StratificationFactor[], arrivals: readonly RecordedArrival[]): FactorLevels[] {
  const errors: FieldError[] = [];
  const levels = arrivals.map((arrival, i) => {
    try {
      return participantLevels(factors, arrival.covariates ?? {});
    } catch (error) {
      if (!(error instanceof RandomizationError)) throw error;
      errors.push(...error.fieldErrors.map((e) => ({ field: `arrivals[${i}].${e.field}`, message: e.message })));
      return {};
    }
  });
  if (errors.length > MAX_REPORTED_ERRORS) {
    const more = errors.length - MAX_REPORTED_ERRORS;
    errors.splice(MAX_REPORTED_ERRORS, more, {
      field: 'arrivals',
      message: `${more} more covariate problems not listed`,
    });
  }
  if (errors.length > 0) throw new RandomizationError(RandomizationErrorCode.InvalidCovariates, errors);
  return levels;
}

/** Every allocation the seed and parameters imply for these arrivals, in arrival order. */
export function deriveSequence(
  seed: string,
  parameters: SchemeParameters,
  arrivals: readonly RecordedArrival[],
): DerivedAllocation[] {
  const checked = parseSchemeParameters(parameters);
  if (!Array.isArray(arrivals)) {
    throw new RandomizationError(RandomizationErrorCode.InvalidInput, [
      { field: 'arrivals', message: 'must be a list' },
    ]);
  }
  const factors = schemeFactors(checked);
  const levels = levelsOfArrivals(factors, arrivals);
  const keys = levels.map((l) => stratumKeyFromLevels(factors, l));
  const base = (i: number): DerivedAllocation => ({
    arrivalPosition: i + 1,
    participantId: arrivals[i].participantId,
    stratumKey: keys[i],
    slotPosition: null,
    pairIndex: null,
    conditionId: null,
    order: null,
    orderIndex: null,
    levels: levels[i],
  });

  if (checked.method === 'minimization') {
    const tally = emptyTallyOf(checked);
    return arrivals.map((_, i) => {
      const decision = decideByMinimization(seed, checked, i + 1, levels[i], tally);
      recordInTally(tally, levels[i], decision.conditionId);
      return { ...base(i), conditionId: decision.conditionId };
    });
  }

  if (checked.method === 'matched-pairs') {
    const participants = arrivals.map((arrival, i) => {
      const pretest = arrival.covariates?.[checked.pretestId];
      if (typeof pretest !== 'number' || !Number.isFinite(pretest)) {
        throw new RandomizationError(RandomizationErrorCode.InvalidCovariates, [
          { field: `arrivals[${i}].covariates.${checked.pretestId}`, message: 'must be a number (the pretest score)' },
        ]);
      }
      return { participantId: arrival.participantId, pretest };
    });
    const result = assignMatchedPairs(seed, checked, participants);
    const pairOf = new Map<string, number>();
    for (const pair of result.pairs) for (const m of pair.members) pairOf.set(m.participantId, pair.pairIndex);
    return result.allocations.map((allocation, i) => ({
      ...base(i),
      conditionId: allocation.conditionId,
      pairIndex: pairOf.get(allocation.participantId) ?? null,
    }));
  }

  // Slot schemes: count arrivals per stratum, generate that many slots, hand them out in order.
  const needed = new Map<string, number>();
  for (const key of keys) needed.set(key, (needed.get(key) ?? 0) + 1);
  const sequences = new Map<string, AllocationSlot[] | OrderSlot[]>();
  for (const [key, count] of needed) sequences.set(key, slotsOf(seed, checked, key, count));
  const taken = new Map<string, number>();
  return keys.map((key, i) => {
    const index = taken.get(key) ?? 0;
    taken.set(key, index + 1);
    const slot = (sequences.get(key) as (AllocationSlot | OrderSlot)[])[index];
    if ('order' in slot) {
      return { ...base(i), slotPosition: slot.position, order: slot.order, orderIndex: slot.orderIndex };
    }
    return { ...base(i), slotPosition: slot.position, conditionId: slot.conditionId };
  });
}

export interface RecordedAllocation extends RecordedArrival {
  conditionId?: string | null;
  order?: readonly string[] | null;
  /** Slot schemes: the stratum and position of the slot the allocation took; when given, verify goes by slot. */
  stratumKey?: string;
  slotPosition?: number | null;
}

/** Per stratum, how the taken slots line up: once settled, positions 1…highest each taken exactly once. */
export interface StratumSlots {
  stratumKey: string;
  taken: number;
  highest: number;
  /** Positions below the highest taken that nobody holds (a claim rolled back after a later one was taken). */
  skipped: number[];
  /** Positions held by more than one allocation (never expected). */
  reused: number[];
}

export interface AllocationCheck {
  arrivalPosition: number;
  participantId: string;
  stratumKey: string;
  expected: { conditionId: string | null; order: string[] | null };
  recorded: { conditionId: string | null; order: string[] | null };
  matches: boolean;
}

export interface VerificationReport {
  allMatch: boolean;
  matched: number;
  mismatched: number;
  checks: AllocationCheck[];
  /** Slot schemes verified by slot: the taken positions of each stratum. */
  slots?: StratumSlots[];
}

function sameOrder(a: readonly string[] | null, b: readonly string[] | null): boolean {
  if (a === null || b === null) return a === b;
  return a.length === b.length && a.every((c, i) => c === b[i]);
}

/**
 * Re-derives the sequence and compares it with what was recorded, allocation by allocation. Slot allocations that
 * name their slot are checked by slot (see verifyBySlot); others by replaying arrivals in the order given.
 */
export function verifyAllocations(
  seed: string,
  parameters: SchemeParameters,
  recorded: readonly RecordedAllocation[],
): VerificationReport {
  const checked = parseSchemeParameters(parameters);
  if (usesSlots(checked) && recorded.length > 0 && recorded.every((r) => typeof r.slotPosition === 'number'))
    return verifyBySlot(seed, checked, recorded);
  const derived = deriveSequence(seed, parameters, recorded);
  const checks = derived.map((expected, i): AllocationCheck => {
    const recordedOrder = recorded[i].order;
    const actual = {
      conditionId: recorded[i].conditionId ?? null,
      order: recordedOrder ? recordedOrder.slice() : null,
    };
    const matches =
      expected.order !== null ? sameOrder(expected.order, actual.order) : expected.conditionId === actual.conditionId;
    return {
      arrivalPosition: expected.arrivalPosition,
      participantId: expected.participantId,
      stratumKey: expected.stratumKey,
      expected: { conditionId: expected.conditionId, order: expected.order },
      recorded: actual,
      matches,
    };
  });
  const matched = checks.filter((c) => c.matches).length;
  return { allMatch: matched === checks.length, matched, mismatched: checks.length - matched, checks };
}

/**
 * Concurrent signings claim slots out of arrival order, so an allocation is checked against the slot it took:
 * its stratum must be the one its covariates give, its condition (or order) the one the seed puts at that
 * position; and each stratum's taken positions must be 1…highest, each once. Together these give back everything
 * strict arrival order gave: every slot used once, no gaps once signings settle, and blocks balanced (every
 * complete block of positions holds exactly the seed's block).
 */
function verifyBySlot(
  seed: string,
  parameters: SchemeParameters,
  recorded: readonly RecordedAllocation[],
): VerificationReport {
  const keys = recorded.map((r) => slotStratumKey(parameters, r.covariates ?? {}));
  const highest = new Map<string, number>();
  recorded.forEach((r, i) => {
    const key = r.stratumKey ?? keys[i];
    highest.set(key, Math.max(highest.get(key) ?? 0, r.slotPosition!));
  });
  const sequences = new Map<string, AllocationSlot[] | OrderSlot[]>();
  for (const [key, count] of highest) sequences.set(key, slotsOf(seed, parameters, key, count));
  const checks = recorded.map((r, i): AllocationCheck => {
    const key = r.stratumKey ?? keys[i];
    const slot = (sequences.get(key) as (AllocationSlot | OrderSlot)[])[r.slotPosition! - 1];
    const expected =
      slot && 'order' in slot
        ? { conditionId: null, order: slot.order.slice() }
        : { conditionId: slot?.conditionId ?? null, order: null };
    const actual = { conditionId: r.conditionId ?? null, order: r.order ? r.order.slice() : null };
    const sameSlot =
      expected.order !== null ? sameOrder(expected.order, actual.order) : expected.conditionId === actual.conditionId;
    return {
      arrivalPosition: i + 1,
      participantId: r.participantId,
      stratumKey: keys[i],
      expected,
      recorded: actual,
      matches: Boolean(slot) && key === keys[i] && sameSlot,
    };
  });
  const slots: StratumSlots[] = [...highest.entries()]
    .sort(([a], [b]) => a.localeCompare(b))
    .map(([stratumKey, top]) => {
      const holders = new Array<number>(top + 1).fill(0);
      recorded.forEach((r, i) => {
        if ((r.stratumKey ?? keys[i]) === stratumKey) holders[r.slotPosition!] += 1;
      });
      const positions = holders.map((_, position) => position).slice(1);
      return {
        stratumKey,
        taken: positions.filter((p) => holders[p] > 0).length,
        highest: top,
        skipped: positions.filter((p) => holders[p] === 0),
        reused: positions.filter((p) => holders[p] > 1),
      };
    });
  const matched = checks.filter((c) => c.matches).length;
  const settled = slots.every((s) => s.skipped.length === 0 && s.reused.length === 0);
  return {
    allMatch: matched === checks.length && settled,
    matched,
    mismatched: checks.length - matched,
    checks,
    slots,
  };
}
