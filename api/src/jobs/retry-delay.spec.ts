import { describe, expect, it } from 'vitest';
import { longestRetryWaitSeconds, retryDelaySeconds } from './retry-delay';

describe('retryDelaySeconds', () => {
  it('doubles from the base delay, between half and all of it', () => {
    expect([1, 2, 3, 4].map((retry) => retryDelaySeconds(retry, 5, 600, () => 1))).toEqual([5, 10, 20, 40]);
    expect([1, 2, 3, 4].map((retry) => retryDelaySeconds(retry, 5, 600, () => 0))).toEqual([2.5, 5, 10, 20]);
  });

  it('never waits longer than the cap, however many retries came before', () => {
    for (let retry = 1; retry <= 100; retry++) {
      for (const draw of [0, 0.5, 0.999]) {
        const delay = retryDelaySeconds(retry, 5, 120, () => draw);
        expect(delay).toBeLessThanOrEqual(120);
        expect(delay).toBeGreaterThan(0);
      }
    }
    expect(retryDelaySeconds(8, 5, 120, () => 1)).toBe(120);
  });

  it('keeps eight retries of the default settings within minutes, where uncapped doubling took over half an hour', () => {
    // pg-boss 10 uncapped: retryDelay * 2^(n+1)/2 * (1..2) for n = 0..7, i.e. 5 * (1 + 2 + ... + 128) * 2 at most.
    const uncappedWorst = 5 * 255 * 2;
    expect(uncappedWorst).toBeGreaterThan(40 * 60);
    expect(longestRetryWaitSeconds(8, 5, 120)).toBe(5 + 10 + 20 + 40 + 80 + 120 + 120 + 120);
  });
});
