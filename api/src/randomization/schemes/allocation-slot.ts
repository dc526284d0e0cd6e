import { fail, RandomizationErrorCode } from '../randomization-error';

/** One pre-generated place in a stratum's sequence, as the allocator stores it. */
export interface AllocationSlot {
  stratumKey: string;
  /** 1-based position in the stratum's sequence: the n-th participant of the stratum takes slot n. */
  position: number;
  conditionId: string;
  /** 1-based block number; null for simple randomization. */
  blockIndex: number | null;
  blockSize: number | null;
  /** 1-based place inside the block; null for simple randomization. */
  positionInBlock: number | null;
}

export const MAX_SLOTS_PER_CALL = 1_000_000;

export function checkSlotCount(count: unknown, field = 'count'): number {
  if (typeof count !== 'number' || !Number.isSafeInteger(count) || count < 0 || count > MAX_SLOTS_PER_CALL) {
    fail(RandomizationErrorCode.InvalidInput, field, `must be a whole number from 0 to ${MAX_SLOTS_PER_CALL}`);
  }
  return count;
}
