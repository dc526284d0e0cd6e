import { describe, expect, it } from 'vitest';
import { cutPointProblem, numericLevels, stratumCount } from './factor-levels';

describe('numericLevels', () => {
  // Level names as the api reports them: strata.ts doc comment, and the demo study's sense-of-direction
  // factor answers levels ["<50", "≥50"] for cut point 50 (GET …/stratification-factors).
  it('splits at one cut into below / at or above', () => {
    expect(numericLevels([50])).toEqual(['<50', '≥50']);
  });

  it('gives a middle band between two cuts', () => {
    expect(numericLevels([40, 65])).toEqual(['<40', '≥40 <65', '≥65']);
  });

  it('has no levels without a cut', () => {
    expect(numericLevels([])).toEqual([]);
  });
});

describe('cutPointProblem', () => {
  it('accepts strictly rising cuts and names repeats or a wrong order', () => {
    expect(cutPointProblem([40, 65])).toBeNull();
    expect(cutPointProblem([50, 50])).toBe('50 is listed twice; each cut point must be different.');
    expect(cutPointProblem([65, 40])).toBe('40 comes after 65; list cut points from low to high.');
  });
});

describe('stratumCount', () => {
  it('multiplies the level counts (2 pretest bands × 3 sites = 6 strata)', () => {
    expect(stratumCount([2, 3])).toBe(6);
    expect(stratumCount([])).toBe(1);
  });
});
