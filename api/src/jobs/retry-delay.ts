/**
 * Delay before retry number `retry` (1 for the first) of a failed job: exponential back-off from `baseSeconds`,
 * capped at `maxSeconds`, with "equal jitter" (half fixed, half random) so a batch that failed together does not
 * come back together. The cap is what lets work recover within minutes of a dependency coming back; pg-boss 10
 * has no maximum of its own (its back-off doubles without bound). Back-off and jitter after AWS Architecture Blog,
 * "Exponential Backoff And Jitter" (Brooker, 2015).
 */
export function retryDelaySeconds(
  retry: number,
  baseSeconds: number,
  maxSeconds: number,
  random: () => number = Math.random,
): number {
  const ceiling = Math.min(maxSeconds, baseSeconds * 2 ** Math.min(30, Math.max(0, retry - 1)));
  return ceiling / 2 + (ceiling / 2) * random();
}

/** Upper bound of the time all `retries` of a job can wait between tries, for sizing sweeps and documentation. */
export function longestRetryWaitSeconds(retries: number, baseSeconds: number, maxSeconds: number): number {
  let total = 0;
  for (let retry = 1; retry <= retries; retry++) total += retryDelaySeconds(retry, baseSeconds, maxSeconds, () => 1);
  return total;
}
