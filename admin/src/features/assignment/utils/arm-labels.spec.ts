import { describe, expect, it } from 'vitest';
import { armLabel, orderOfArm, stratumLabel, stratumParts } from './arm-labels';

const conditions = [
  { id: 'c-a', code: 'A', internalName: 'audio cues', allocationWeight: 1 },
  { id: 'c-b', code: 'B', internalName: null, allocationWeight: 1 },
  { id: 'c-c', code: 'C', internalName: 'no cues', allocationWeight: 1 },
];

describe('orderOfArm', () => {
  // Shapes as the api sends them: GET …/assignment of the demo "Checkout flows" study names arms by
  // condition_order::text, e.g. ["7bc7…", "8220…"]; a dry run labels order-1 as "7bc7… → 8220…".
  it('reads the JSON list the assignment overview uses', () => {
    expect(orderOfArm('["c-a", "c-c", "c-b"]')).toEqual(['c-a', 'c-c', 'c-b']);
  });

  it('reads a dry run’s arrow label', () => {
    expect(orderOfArm('order-2', 'c-b → c-a → c-c')).toEqual(['c-b', 'c-a', 'c-c']);
  });

  it('is null for a single condition', () => {
    expect(orderOfArm('c-a', 'c-a')).toBeNull();
  });
});

describe('armLabel', () => {
  it('names orders by codes and conditions by code and name', () => {
    expect(armLabel(conditions, '["c-a", "c-c", "c-b"]')).toEqual({ code: 'A → C → B', name: null });
    expect(armLabel(conditions, 'c-a')).toEqual({ code: 'A', name: 'audio cues' });
    expect(armLabel(conditions, 'c-b')).toEqual({ code: 'B', name: null });
  });
});

describe('stratum labels', () => {
  // Stratum keys as api/src/randomization/strata.ts builds them: factor=level joined by "|", "all" without factors.
  it('splits a stratum key into its factor levels', () => {
    expect(stratumParts('pretest=≥65|site=north')).toEqual([
      { factorKey: 'pretest', level: '≥65' },
      { factorKey: 'site', level: 'north' },
    ]);
    expect(stratumParts('all')).toEqual([]);
  });

  it('reads as plain words', () => {
    expect(stratumLabel('sense_of_direction=<50')).toBe('sense of direction <50');
    expect(stratumLabel('all')).toBe('Everyone (not stratified)');
  });
});
