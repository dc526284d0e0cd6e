import { afterEach, describe, expect, it, vi } from 'vitest';
import { worldOptions } from '../app/payments-fake-app';
import { ProviderWorld } from './provider-world';

function newWorld(): ProviderWorld {
  return new ProviderWorld(worldOptions({ webhookUrl: null, webhookSecret: 'whsec_test' }));
}

afterEach(() => {
  vi.useRealTimers();
});

describe('ProviderWorld funds release', () => {
  it('releases funds that came in later on their own date, not only the earliest', () => {
    vi.useFakeTimers();
    const world = newWorld();
    const start = world.clock.nowMs();
    world.ledger.creditPending(world.platformAccountId, 'usd', 300, start + 1_000);
    world.scheduleFundsRelease();
    world.ledger.creditPending(world.platformAccountId, 'usd', 700, start + 5_000);
    world.scheduleFundsRelease();

    vi.advanceTimersByTime(1_000);
    expect(world.ledger.availableAmount(world.platformAccountId, 'usd')).toBe(300);
    vi.advanceTimersByTime(4_000);
    expect(world.ledger.availableAmount(world.platformAccountId, 'usd')).toBe(1_000);
    expect(world.ledger.nextReleaseMs()).toBeUndefined();
    // One timer at a time: none is left once nothing is pending.
    expect(world.timers.pending).toBe(0);
    world.close();
  });

  it('tries again when its timer fires before the clock reaches the due time', () => {
    vi.useFakeTimers();
    const world = newWorld();
    const start = world.clock.nowMs();
    world.ledger.creditPending(world.platformAccountId, 'usd', 500, start + 1_000);
    world.scheduleFundsRelease();
    // The wall clock falls behind the timer (as Node's cached loop time can by a millisecond): when the timer
    // fires, the funds are not yet due.
    vi.setSystemTime(start - 40);

    vi.advanceTimersByTime(1_000);
    expect(world.ledger.availableAmount(world.platformAccountId, 'usd')).toBe(0);
    expect(world.timers.pending).toBe(1);
    vi.advanceTimersByTime(40);
    expect(world.ledger.availableAmount(world.platformAccountId, 'usd')).toBe(500);
    world.close();
  });
});
