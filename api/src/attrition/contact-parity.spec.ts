import { jStat } from 'jstat';
import { describe, expect, it } from 'vitest';
import { contactParity } from './contact-parity';

function moments(values: number[]) {
  return {
    n: values.length,
    sum: values.reduce((a, b) => a + b, 0),
    sumOfSquares: values.reduce((a, b) => a + b * b, 0),
  };
}

describe('contactParity', () => {
  it('gives mean contacts per participant per arm and the Welch ANOVA of the same counts', () => {
    const a = [3, 4, 3, 5, 2, 4];
    const b = [6, 5, 7, 4, 6, 5, 6];
    const parity = contactParity([
      { conditionId: 'a', total: moments(a), reminders: 15, reconsentRequests: 4, staffMessages: 2 },
      { conditionId: 'b', total: moments(b), reminders: 30, reconsentRequests: 7, staffMessages: 2 },
    ]);
    expect(parity.conditions.map((c) => [c.conditionId, c.participants, c.contacts, c.meanPerParticipant])).toEqual([
      ['a', 6, 21, 3.5],
      ['b', 7, 39, 39 / 7],
    ]);
    expect(parity.largestMeanDifference).toBeCloseTo(39 / 7 - 3.5, 12);
    // With two groups Welch's ANOVA F equals the square of Welch's t (Welch 1951); t and its df computed here from
    // the textbook formula and its p-value from jStat's F distribution (outside reference library).
    const va = jStat.variance(a, true);
    const vb = jStat.variance(b, true);
    const se2 = va / a.length + vb / b.length;
    const t = (jStat.mean(b) - jStat.mean(a)) / Math.sqrt(se2);
    const df = se2 ** 2 / ((va / a.length) ** 2 / (a.length - 1) + (vb / b.length) ** 2 / (b.length - 1));
    expect(parity.test.statistic).toBeCloseTo(t * t, 8);
    expect(parity.test.df2).toBeCloseTo(df, 8);
    expect(parity.test.pValue).toBeCloseTo(1 - jStat.centralF.cdf(t * t, 1, df), 8);
  });

  it('says why no test is possible when every participant got the same number of contacts', () => {
    const parity = contactParity([
      { conditionId: 'a', total: moments([3, 3, 3]), reminders: 9, reconsentRequests: 0, staffMessages: 0 },
      { conditionId: 'b', total: moments([3, 3]), reminders: 6, reconsentRequests: 0, staffMessages: 0 },
    ]);
    expect(parity.test.notComputable).toBe('no-variation-within-a-condition');
    expect(parity.largestMeanDifference).toBe(0);
  });
});
