import fc from 'fast-check';
import { jStat } from 'jstat';
import { describe, expect, it } from 'vitest';
import { formatTable, median, reportRow } from './bench-report';

// Reference: jstat 1.9.6's jStat.median (a general-purpose statistics library from npm); the attrition folder's
// declarations do not list it, hence the cast.
const referenceMedian = (jStat as unknown as { median(values: number[]): number }).median;

describe('median', () => {
  it('agrees with jStat.median on any list of rates', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: 0, max: 1e6, noNaN: true }), { minLength: 1, maxLength: 40 }), (values) => {
        expect(median(values)).toBeCloseTo(referenceMedian([...values]), 9);
      }),
    );
  });

  it('takes the middle of an odd count and the mean of the two middles of an even count', () => {
    // Common practice (the textbook definition).
    expect(median([5, 1, 3])).toBe(3);
    expect(median([4, 1, 3, 2])).toBe(2.5);
  });

  it('does not reorder the caller’s samples', () => {
    const samples = [3, 1, 2];
    median(samples);
    expect(samples).toEqual([3, 1, 2]);
  });

  it('refuses an empty list', () => {
    expect(() => median([])).toThrow('median needs at least one value');
  });
});

describe('reportRow and formatTable', () => {
  it('divides a row’s median by its baseline’s median', () => {
    const row = reportRow('allocate', [100, 300, 200], [4000, 1000, 2000, 3000]);
    expect(row.value).toBe(200);
    expect(row.ratio).toBeCloseTo(200 / 2500, 12);
    expect(reportRow('baseline', [1, 2]).ratio).toBeNull();
  });

  it('prints one line per row under a header, baseline ratio as a dash', () => {
    const text = formatTable({
      title: 'Allocations',
      unit: 'per s',
      ratioHeading: '÷ baseline',
      rows: [reportRow('baseline', [4000, 5000]), reportRow('allocate', [200, 250], [4000, 5000])],
    });
    const lines = text.split('\n');
    expect(lines[0]).toBe('Allocations');
    expect(lines[1]).toMatch(/^measurement\s+median per s\s+÷ baseline\s+rounds$/);
    expect(lines[3]).toMatch(/^baseline\s+4500\s+–\s+4000 {2}5000$/);
    expect(lines[4]).toMatch(/^allocate\s+225\s+0\.050\s+200 {2}250$/);
  });
});
