import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { worldOptions } from '../app/payments-fake-app';
import { ProviderWorld } from './provider-world';
import { readStateFile } from './state-file';
import { SAVE_DELAY_MS, StateSaver } from './state-saver';

// Temporary files stay under the repository's git-ignored .local folder.
const TEMP_ROOT = path.resolve(__dirname, '../../../.local/tmp');
let folder: string;
let file: string;

beforeEach(() => {
  mkdirSync(TEMP_ROOT, { recursive: true });
  folder = mkdtempSync(path.join(TEMP_ROOT, 'payments-fake-saver-'));
  file = path.join(folder, 'state.json');
});
afterEach(() => {
  vi.useRealTimers();
  rmSync(folder, { recursive: true, force: true });
});

function newWorld(): ProviderWorld {
  return new ProviderWorld(worldOptions({ webhookUrl: null, webhookSecret: 'whsec_test' }));
}

function savedAmount(world: ProviderWorld): number | undefined {
  const snapshot = readStateFile(file);
  return snapshot?.ledger.available.find((entry) => entry.accountId === world.platformAccountId)?.amount;
}

describe('StateSaver', () => {
  it('writes within the delay after the first unsaved change, not pushed back by later ones', async () => {
    vi.useFakeTimers();
    const world = newWorld();
    const saver = new StateSaver(world, file);
    world.ledger.setAvailable(world.platformAccountId, 'usd', 100);
    world.noteChange();
    vi.advanceTimersByTime(SAVE_DELAY_MS - 50);
    world.ledger.setAvailable(world.platformAccountId, 'usd', 200);
    world.noteChange();
    await saver.idle();
    expect(existsSync(file)).toBe(false);
    vi.advanceTimersByTime(50);
    await saver.idle();
    expect(savedAmount(world)).toBe(200);
    saver.close();
  });

  it('skips the write when nothing changed', async () => {
    vi.useFakeTimers();
    const world = newWorld();
    const saver = new StateSaver(world, file);
    world.noteChange();
    vi.advanceTimersByTime(SAVE_DELAY_MS);
    await saver.idle();
    expect(existsSync(file)).toBe(false);
    world.ledger.setAvailable(world.platformAccountId, 'usd', 300);
    world.noteChange();
    vi.advanceTimersByTime(SAVE_DELAY_MS);
    await saver.idle();
    const firstWrite = readFileSync(file, 'utf8');
    vi.advanceTimersByTime(1_000);
    world.noteChange();
    vi.advanceTimersByTime(SAVE_DELAY_MS);
    await saver.idle();
    expect(readFileSync(file, 'utf8')).toBe(firstWrite);
    saver.close();
  });

  it('writes a reset at once and writes a last time on close, then stops', async () => {
    vi.useFakeTimers();
    const world = newWorld();
    const saver = new StateSaver(world, file);
    world.ledger.setAvailable(world.platformAccountId, 'usd', 400);
    world.reset();
    expect(readStateFile(file)?.ledger.available).toEqual([]);
    world.ledger.setAvailable(world.platformAccountId, 'usd', 500);
    saver.close();
    expect(savedAmount(world)).toBe(500);
    world.ledger.setAvailable(world.platformAccountId, 'usd', 600);
    world.noteChange();
    vi.advanceTimersByTime(SAVE_DELAY_MS * 4);
    await saver.idle();
    expect(savedAmount(world)).toBe(500);
  });

  it('saves what a world timer changed', async () => {
    vi.useFakeTimers();
    const world = newWorld();
    const saver = new StateSaver(world, file);
    world.timers.after(1_000, () => world.ledger.setAvailable(world.platformAccountId, 'usd', 700));
    vi.advanceTimersByTime(1_000 + SAVE_DELAY_MS);
    await saver.idle();
    expect(savedAmount(world)).toBe(700);
    saver.close();
  });

  it('has every change made before flush() on disk when it resolves, one write shared by callers that wait together', async () => {
    const world = newWorld();
    const saver = new StateSaver(world, file);
    world.ledger.setAvailable(world.platformAccountId, 'usd', 800);
    const first = world.durable();
    const second = world.durable();
    expect(second).toBe(first);
    await first;
    expect(savedAmount(world)).toBe(800);
    world.ledger.setAvailable(world.platformAccountId, 'usd', 900);
    await world.durable();
    expect(savedAmount(world)).toBe(900);
    saver.close();
  });

  it('lets a world without a state file answer at once, and stops waiting for the file after close', async () => {
    const memoryOnly = newWorld();
    await expect(memoryOnly.durable()).resolves.toBeUndefined();
    const world = newWorld();
    const saver = new StateSaver(world, file);
    saver.close();
    world.ledger.setAvailable(world.platformAccountId, 'usd', 1000);
    await world.durable();
    expect(savedAmount(world)).toBeUndefined();
  });
});
