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
  it('writes within the delay after the first unsaved change, not pushed back by later ones', () => {
    vi.useFakeTimers();
    const world = newWorld();
    const saver = new StateSaver(world, file);
    world.ledger.setAvailable(world.platformAccountId, 'usd', 100);
    world.noteChange();
    vi.advanceTimersByTime(SAVE_DELAY_MS - 50);
    world.ledger.setAvailable(world.platformAccountId, 'usd', 200);
    world.noteChange();
    expect(existsSync(file)).toBe(false);
    vi.advanceTimersByTime(50);
    expect(savedAmount(world)).toBe(200);
    saver.close();
  });

  it('skips the write when nothing changed', () => {
    vi.useFakeTimers();
    const world = newWorld();
    const saver = new StateSaver(world, file);
    world.noteChange();
    vi.advanceTimersByTime(SAVE_DELAY_MS);
    expect(existsSync(file)).toBe(false);
    world.ledger.setAvailable(world.platformAccountId, 'usd', 300);
    world.noteChange();
    vi.advanceTimersByTime(SAVE_DELAY_MS);
    const firstWrite = readFileSync(file, 'utf8');
    vi.advanceTimersByTime(1_000);
    world.noteChange();
    vi.advanceTimersByTime(SAVE_DELAY_MS);
    expect(readFileSync(file, 'utf8')).toBe(firstWrite);
    saver.close();
  });

  it('writes a reset at once and writes a last time on close, then stops', () => {
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
    expect(savedAmount(world)).toBe(500);
  });

  it('saves what a world timer changed', () => {
    vi.useFakeTimers();
    const world = newWorld();
    const saver = new StateSaver(world, file);
    world.timers.after(1_000, () => world.ledger.setAvailable(world.platformAccountId, 'usd', 700));
    vi.advanceTimersByTime(1_000 + SAVE_DELAY_MS);
    expect(savedAmount(world)).toBe(700);
    saver.close();
  });
});
