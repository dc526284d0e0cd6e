import { describe, expect, it } from 'vitest';
import { exitCodeFor, formatVerdicts, judge } from './bench-targets';

describe('benchmark targets', () => {
  it('meets an at-least target at or above it and misses it below', () => {
    expect(judge({ label: 'sign', ratio: 0.5, bound: 'at-least', value: 0.5 }).met).toBe(true);
    expect(judge({ label: 'sign', ratio: 0.49, bound: 'at-least', value: 0.5 }).met).toBe(false);
  });

  it('meets an at-most target at or below it and misses it above', () => {
    expect(judge({ label: 'report', ratio: 3, bound: 'at-most', value: 3 }).met).toBe(true);
    expect(judge({ label: 'report', ratio: 3.01, bound: 'at-most', value: 3 }).met).toBe(false);
  });

  it('never meets a target with a ratio that is not a number', () => {
    expect(judge({ label: 'sign', ratio: Number.NaN, bound: 'at-least', value: 0.5 }).met).toBe(false);
    expect(judge({ label: 'sign', ratio: Number.NaN, bound: null, value: null }).met).toBe(false);
  });

  it('prints each ratio with its target and verdict, and fails the run when one is missed', () => {
    const verdicts = [
      judge({ label: 'sign ÷ bare INSERT', ratio: 0.512, bound: 'at-least', value: 0.5 }),
      judge({ label: 'report ÷ count(*)', ratio: 4.2, bound: 'at-most', value: 3 }),
      judge({ label: 'allocate ÷ bare INSERT', ratio: 0.3, bound: null, value: null }),
    ];
    expect(formatVerdicts(verdicts).split('\n')).toEqual([
      'sign ÷ bare INSERT         0.512  target ≥ 0.5  met',
      'report ÷ count(*)          4.200  target ≤ 3  MISSED',
      'allocate ÷ bare INSERT     0.300  no target (for information)',
    ]);
    expect(exitCodeFor(verdicts)).toBe(2);
    expect(exitCodeFor(verdicts.filter((v) => v.met))).toBe(0);
  });
});
