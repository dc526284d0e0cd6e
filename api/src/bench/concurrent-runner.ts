import { performance } from 'node:perf_hooks';
import { BenchSetupError } from './bench-database';

/** One timed batch of operations. */
export interface ThroughputSample {
  operations: number;
  seconds: number;
  perSecond: number;
}

/**
 * Runs `operation(0 … total−1)` with exactly `workers` loops pulling the next index, so at most `workers`
 * operations are in flight at once (like that many clients each waiting for its answer), and times the batch.
 * The first failure stops every loop and is rethrown; so does an abort (Ctrl-C).
 */
export async function runConcurrently(
  total: number,
  workers: number,
  operation: (index: number) => Promise<unknown>,
  signal?: AbortSignal,
): Promise<ThroughputSample> {
  if (!Number.isSafeInteger(total) || total < 1)
    throw new RangeError(`total must be a whole number of 1 or more (got ${total})`);
  if (!Number.isSafeInteger(workers) || workers < 1)
    throw new RangeError(`workers must be a whole number of 1 or more (got ${workers})`);
  let next = 0;
  let failure: unknown = null;
  const loop = async () => {
    while (failure === null && next < total) {
      if (signal?.aborted) {
        failure ??= new Error('interrupted');
        return;
      }
      const index = next++;
      try {
        await operation(index);
      } catch (error) {
        failure ??= error;
      }
    }
  };
  const started = performance.now();
  await Promise.all(Array.from({ length: Math.min(workers, total) }, loop));
  const seconds = (performance.now() - started) / 1000;
  if (failure !== null) throw failure;
  return { operations: total, seconds, perSecond: total / seconds };
}

/** Times a synchronous piece of work. */
export function timeSync(work: () => unknown): number {
  const started = performance.now();
  work();
  return (performance.now() - started) / 1000;
}

/** An abort signal that Ctrl-C raises, so a benchmark stops its workers and still cleans up. */
export function abortOnInterrupt(log: (line: string) => void): AbortSignal {
  const stop = new AbortController();
  process.once('SIGINT', () => {
    log('interrupted: cleaning up');
    stop.abort();
  });
  return stop.signal;
}

/**
 * Runs a benchmark's main and exits with its code: 130 after Ctrl-C, 1 with just the message for a set-up
 * problem (a missing setting, an unreachable database), 1 with the stack for anything else.
 */
export function runBenchmark(name: string, main: () => Promise<number>): void {
  main().then(
    (code) => process.exit(code),
    (error: unknown) => {
      if (error instanceof Error && error.message === 'interrupted') {
        console.error(`[${name}] interrupted; nothing was measured to the end`);
        process.exit(130);
      }
      if (error instanceof BenchSetupError) {
        console.error(`[${name}] ${error.message}`);
        process.exit(1);
      }
      console.error(error instanceof Error ? (error.stack ?? error.message) : error);
      process.exit(1);
    },
  );
}
