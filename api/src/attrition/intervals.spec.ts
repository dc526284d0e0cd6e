import { jStat } from 'jstat';
import { describe, expect, it } from 'vitest';
import { newcombeDifferenceInterval, riskRatio, wilsonInterval } from './intervals';

describe('Wilson interval', () => {
  it('matches the worked example of Newcombe (1998, Statistics in Medicine 17:857), method 3 — values from memory', () => {
    // 81 / 263: 0.2553 to 0.3662.
    const interval = wilsonInterval(81, 263)!;
    expect(interval.lower).toBeCloseTo(0.2553, 4);
    expect(interval.upper).toBeCloseTo(0.3662, 4);
  });

  it('is the set of p whose score test (jStat normal) does not reject: the bounds solve (p̂ − p)² = z²·p(1 − p)/n', () => {
    const z = jStat.normal.inv(0.975, 0, 1);
    const { lower, upper } = wilsonInterval(7, 30)!;
    for (const bound of [lower, upper])
      expect((7 / 30 - bound) ** 2).toBeCloseTo((z * z * bound * (1 - bound)) / 30, 12);
    expect(wilsonInterval(0, 0)).toBeNull();
    expect(wilsonInterval(0, 10)!.lower).toBe(0);
  });
});

describe('Newcombe interval for a difference of proportions', () => {
  it('matches the worked examples of Newcombe (1998, Statistics in Medicine 17:873), method 10 — values from memory', () => {
    // 56/70 − 48/80: 0.0524 to 0.3339; 9/10 − 3/10: 0.1705 to 0.8090.
    const a = newcombeDifferenceInterval(56, 70, 48, 80)!;
    expect(a.lower).toBeCloseTo(0.0524, 4);
    expect(a.upper).toBeCloseTo(0.3339, 4);
    const b = newcombeDifferenceInterval(9, 10, 3, 10)!;
    expect(b.lower).toBeCloseTo(0.1705, 4);
    expect(b.upper).toBeCloseTo(0.809, 3);
  });
});

describe('risk ratio', () => {
  it('gives the Katz log interval, by hand with jStat normal', () => {
    // 20/100 vs 10/100: RR 2; SE = √(1/20 − 1/100 + 1/10 − 1/100) = √0.13.
    const result = riskRatio(20, 100, 10, 100)!;
    const z = jStat.normal.inv(0.975, 0, 1);
    expect(result.estimate).toBeCloseTo(2, 12);
    expect(result.lower).toBeCloseTo(2 * Math.exp(-z * Math.sqrt(0.13)), 12);
    expect(result.upper).toBeCloseTo(2 * Math.exp(z * Math.sqrt(0.13)), 12);
    expect(riskRatio(0, 10, 3, 10)).toBeNull();
  });
});
