import { describe, expect, it } from 'vitest';
import {
  deriveSequence,
  generateSlots,
  RecordedAllocation,
  slotStratumKey,
  usesSlots,
  verifyAllocations,
} from './derive-sequence';
import { RandomizationError } from './randomization-error';
import { SchemeParameters } from './scheme-parameters';
import { AllocationSlot } from './schemes/allocation-slot';
import { assignMatchedPairs } from './schemes/matched-pairs';
import { assignByMinimization, emptyTally, recordInTally } from './schemes/minimization';
import { createSeededStream } from './seeded-stream';
import { Covariates } from './strata';
import { OrderSlot } from './within/order-sequence';

const SEED = 'e1'.repeat(32);
const conditions = [
  { conditionId: 'audio', weight: 1 },
  { conditionId: 'map', weight: 1 },
  { conditionId: 'none', weight: 1 },
];
const sense = { id: 'sense', kind: 'numeric' as const, cutPoints: [4] };
const site = { id: 'site', kind: 'categorical' as const, categories: ['lab', 'online'] };

function arrivals(n: number): { participantId: string; covariates: Covariates }[] {
  const stream = createSeededStream(SEED, 'test-arrivals');
  return Array.from({ length: n }, (_, i) => ({
    participantId: `p${String(i + 1).padStart(3, '0')}`,
    covariates: { sense: stream.integerInRange(1, 7), site: stream.integerBelow(2) === 0 ? 'lab' : 'online' },
  }));
}

/** What the allocator will do: per stratum, take the next pre-generated slot. */
function allocateFromSlots(parameters: SchemeParameters, people: ReturnType<typeof arrivals>): RecordedAllocation[] {
  const slots = new Map<string, (AllocationSlot | OrderSlot)[]>();
  const next = new Map<string, number>();
  return people.map((person) => {
    const key = slotStratumKey(parameters, person.covariates);
    if (!slots.has(key)) slots.set(key, generateSlots(SEED, parameters, key, 200));
    const index = next.get(key) ?? 0;
    next.set(key, index + 1);
    const slot = (slots.get(key) as (AllocationSlot | OrderSlot)[])[index];
    return 'order' in slot ? { ...person, order: slot.order } : { ...person, conditionId: slot.conditionId };
  });
}

const slotSchemes: SchemeParameters[] = [
  { method: 'simple', conditions },
  { method: 'permuted-blocks', conditions, blockSizes: [3, 6] },
  { method: 'stratified-blocks', conditions, blockSizes: [3, 6], factors: [sense, site] },
  { method: 'williams', conditionIds: ['express', 'guest', 'account'], squaresPerBlock: [1], factors: [site] },
];

describe('deriving and verifying the sequence', () => {
  it.each(slotSchemes.map((p) => [p.method, p] as const))(
    're-derives every %s allocation the allocator made',
    (_, parameters) => {
      expect(usesSlots(parameters)).toBe(true);
      const recorded = allocateFromSlots(parameters, arrivals(120));
      const report = verifyAllocations(SEED, parameters, recorded);
      expect(report.allMatch).toBe(true);
      expect(report.matched).toBe(120);
    },
  );

  it('reports exactly the allocation that was altered, and a wrong seed as mismatches', () => {
    const parameters = slotSchemes[2];
    const recorded = allocateFromSlots(parameters, arrivals(60));
    const altered = recorded.map((r, i) =>
      i === 17 ? { ...r, conditionId: r.conditionId === 'map' ? 'none' : 'map' } : r,
    );
    const report = verifyAllocations(SEED, parameters, altered);
    expect(report.allMatch).toBe(false);
    expect(report.mismatched).toBe(1);
    expect(report.checks.filter((c) => !c.matches).map((c) => c.arrivalPosition)).toEqual([18]);
    expect(report.checks[17].expected.conditionId).toBe(recorded[17].conditionId);
    expect(verifyAllocations('e2'.repeat(32), parameters, recorded).mismatched).toBeGreaterThan(10);
  });

  it('notices a changed order in a within-subjects design', () => {
    const parameters = slotSchemes[3];
    const recorded = allocateFromSlots(parameters, arrivals(30));
    const altered = recorded.map((r, i) => (i === 4 ? { ...r, order: (r.order as string[]).slice().reverse() } : r));
    expect(
      verifyAllocations(SEED, parameters, altered)
        .checks.filter((c) => !c.matches)
        .map((c) => c.arrivalPosition),
    ).toEqual([5]);
  });

  it('replays minimization arrival by arrival', () => {
    const parameters: SchemeParameters = {
      method: 'minimization',
      conditions,
      factors: [
        { ...sense, weight: 1 },
        { ...site, weight: 2 },
      ],
      measure: 'variance',
      coinProbability: 0.8,
    };
    const tally = emptyTally(parameters);
    const recorded = arrivals(80).map((person, i) => {
      const decision = assignByMinimization({
        seed: SEED,
        parameters,
        arrivalPosition: i + 1,
        covariates: person.covariates,
        tally,
      });
      recordInTally(tally, decision.levels, decision.conditionId);
      return { ...person, conditionId: decision.conditionId };
    });
    expect(verifyAllocations(SEED, parameters, recorded).allMatch).toBe(true);
    expect(() => generateSlots(SEED, parameters, 'all', 1)).toThrow(/no pre-generated slots/);
  });

  it('replays matched pairs from the pretest covariate, in any arrival order', () => {
    const parameters: SchemeParameters = {
      method: 'matched-pairs',
      conditions: conditions.slice(0, 2),
      pretestId: 'sense',
    };
    const people = arrivals(21);
    const batch = assignMatchedPairs(
      SEED,
      parameters,
      people.map((p) => ({ participantId: p.participantId, pretest: p.covariates.sense as number })),
    );
    const recorded = batch.allocations.map((a, i) => ({ ...people[i], conditionId: a.conditionId }));
    expect(verifyAllocations(SEED, parameters, recorded.slice().reverse()).allMatch).toBe(true);
    const derived = deriveSequence(SEED, parameters, people);
    expect(derived.filter((d) => d.pairIndex === null).map((d) => d.participantId)).toEqual([
      batch.leftover?.participantId,
    ]);
  });

  it('lists at most 50 covariate problems, then says how many more there are', () => {
    const people = Array.from({ length: 40 }, (_, i) => ({ participantId: `p${i}`, covariates: {} }));
    try {
      deriveSequence(SEED, slotSchemes[2], people);
      expect.unreachable();
    } catch (error) {
      const fieldErrors = (error as RandomizationError).fieldErrors;
      expect(fieldErrors).toHaveLength(51);
      expect(fieldErrors[50]).toEqual({ field: 'arrivals', message: '30 more covariate problems not listed' });
    }
  });

  it('names the arrival whose covariates are missing', () => {
    try {
      deriveSequence(SEED, slotSchemes[2], [
        { participantId: 'p1', covariates: { sense: 3, site: 'lab' } },
        { participantId: 'p2', covariates: { sense: 3 } },
      ]);
      expect.unreachable();
    } catch (error) {
      expect((error as RandomizationError).fieldErrors).toEqual([
        { field: 'arrivals[1].covariates.site', message: expect.stringContaining('missing') },
      ]);
    }
  });
});

describe('slots claimed out of arrival order (concurrent signings skip each other’s claims)', () => {
  /** The allocator under concurrency: each stratum's slots are still taken 1..k, but not in arrival order. */
  function claimedOutOfOrder(parameters: SchemeParameters, people: ReturnType<typeof arrivals>): RecordedAllocation[] {
    const inOrder = allocateFromSlots(parameters, people);
    const positions = new Map<string, number>();
    const withPositions = inOrder.map((allocation) => {
      const key = slotStratumKey(parameters, allocation.covariates);
      const position = (positions.get(key) ?? 0) + 1;
      positions.set(key, position);
      return { ...allocation, stratumKey: key, slotPosition: position };
    });
    // Swap neighbours' arrival order: the later arrival committed its claim first.
    const shuffled = withPositions.slice();
    for (let i = 0; i + 1 < shuffled.length; i += 2) [shuffled[i], shuffled[i + 1]] = [shuffled[i + 1], shuffled[i]];
    return shuffled;
  }

  it.each(slotSchemes.map((p) => [p.method, p] as const))(
    '%s: verify re-derives each allocation by its slot',
    (_, parameters) => {
      const report = verifyAllocations(SEED, parameters, claimedOutOfOrder(parameters, arrivals(120)));
      expect(report.mismatched).toBe(0);
      expect(report.allMatch).toBe(true);
      expect(report.slots?.every((s) => s.skipped.length === 0 && s.reused.length === 0)).toBe(true);
    },
  );

  it('reports a slot taken twice, a slot skipped and a condition that is not its slot’s', () => {
    const parameters = slotSchemes[2];
    const recorded = claimedOutOfOrder(parameters, arrivals(60));
    const key = recorded[0].stratumKey!;
    const inStratum = recorded.filter((r) => r.stratumKey === key).sort((a, b) => a.slotPosition! - b.slotPosition!);
    const highest = inStratum[inStratum.length - 1].slotPosition!;
    const reusedRecord = { ...inStratum[1], participantId: 'p-twice' };
    const altered = recorded.filter((r) => r !== inStratum[2]).concat(reusedRecord);
    const report = verifyAllocations(SEED, parameters, altered);
    const stratum = report.slots!.find((s) => s.stratumKey === key)!;
    expect(stratum.reused).toEqual([2]);
    expect(stratum.skipped).toEqual([3]);
    expect(stratum.highest).toBe(highest);
    expect(report.allMatch).toBe(false);

    const other = recorded.map((r, i) =>
      i === 4 ? { ...r, conditionId: r.conditionId === 'audio' ? 'map' : 'audio' } : r,
    );
    const mismatch = verifyAllocations(SEED, parameters, other);
    expect(mismatch.checks.filter((c) => !c.matches).map((c) => c.participantId)).toEqual([recorded[4].participantId]);
  });
});
