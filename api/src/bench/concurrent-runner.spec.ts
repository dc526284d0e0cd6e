import { setTimeout as sleep } from 'node:timers/promises';
import { describe, expect, it } from 'vitest';
import { runConcurrently } from './concurrent-runner';

function tracker() {
  let inFlight = 0;
  let most = 0;
  const seen: number[] = [];
  return {
    seen,
    get most() {
      return most;
    },
    operation: async (index: number) => {
      inFlight += 1;
      most = Math.max(most, inFlight);
      await sleep(index % 3);
      seen.push(index);
      inFlight -= 1;
    },
  };
}

describe('runConcurrently', () => {
  it('runs every index exactly once with exactly the given number of operations in flight', async () => {
    const run = tracker();
    const sample = await runConcurrently(200, 32, run.operation);
    expect([...run.seen].sort((a, b) => a - b)).toEqual(Array.from({ length: 200 }, (_, i) => i));
    expect(run.most).toBe(32);
    expect(sample.operations).toBe(200);
    expect(sample.perSecond).toBeCloseTo(200 / sample.seconds, 6);
  });

  it('never starts more loops than there are operations', async () => {
    const run = tracker();
    await runConcurrently(5, 32, run.operation);
    expect(run.most).toBe(5);
    expect(run.seen).toHaveLength(5);
  });

  it('stops handing out work after the first failure and rethrows it', async () => {
    let started = 0;
    const failing = runConcurrently(1000, 4, async (index) => {
      started += 1;
      await sleep(1);
      if (index === 10) throw new Error('slot taken twice');
    });
    await expect(failing).rejects.toThrow('slot taken twice');
    // Index 10 starts within the first few waves; once it fails no loop takes more work.
    expect(started).toBeLessThan(30);
  });

  it('rejects as interrupted when aborted midway', async () => {
    const stop = new AbortController();
    let done = 0;
    const run = runConcurrently(
      1000,
      8,
      async () => {
        await sleep(1);
        done += 1;
        if (done === 50) stop.abort();
      },
      stop.signal,
    );
    await expect(run).rejects.toThrow('interrupted');
    expect(done).toBeLessThan(100);
  });

  it('refuses counts that are not whole numbers of 1 or more, naming the argument', async () => {
    await expect(runConcurrently(0, 4, async () => {})).rejects.toThrow(
      'total must be a whole number of 1 or more (got 0)',
    );
    await expect(runConcurrently(10, 1.5, async () => {})).rejects.toThrow(
      'workers must be a whole number of 1 or more (got 1.5)',
    );
  });
});
