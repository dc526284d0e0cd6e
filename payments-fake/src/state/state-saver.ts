// Keeps the state file up to date while the stand-in runs. The world says when something may
// have changed (after every request, timer and webhook attempt); the saver writes at most
// SAVE_DELAY_MS after the first change it has not written yet — the timer is not pushed back by
// later changes, so a steady stream of requests cannot starve the file — and skips the write when
// the content is the same as last time (most GETs change nothing). A reset is written at once,
// so the file is empty by the time POST /_control/reset answers; close() writes a last time.

import type { ProviderWorld } from './provider-world';
import { writeFileAtomically } from './state-file';
import { snapshotText, worldState } from './world-snapshot';

export const SAVE_DELAY_MS = 250;

export class StateSaver {
  private timer: NodeJS.Timeout | undefined;
  /** Compact JSON of the state last written (or read at start), to skip writes that change nothing. */
  private lastSaved: string;
  private closed = false;
  private readonly stopListening: () => void;

  constructor(
    private readonly world: ProviderWorld,
    readonly file: string,
    private readonly delayMs = SAVE_DELAY_MS,
  ) {
    this.lastSaved = JSON.stringify(worldState(world));
    this.stopListening = world.onChange((change) => (change === 'reset' ? this.saveNow() : this.scheduleSave()));
  }

  private scheduleSave(): void {
    if (this.closed || this.timer) return;
    this.timer = setTimeout(() => {
      this.timer = undefined;
      try {
        this.write(false);
      } catch (error) {
        // The stand-in keeps serving from memory; the next change tries again.
        console.error(`payments-fake: ${error instanceof Error ? error.message : String(error)}`);
      }
    }, this.delayMs);
    this.timer.unref();
  }

  private cancelTimer(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = undefined;
  }

  /** Writes the world now, changed or not. Throws a StateFileError when the disk refuses. */
  saveNow(): void {
    this.cancelTimer();
    this.write(true);
  }

  private write(always: boolean): void {
    const state = worldState(this.world);
    const compact = JSON.stringify(state);
    if (!always && compact === this.lastSaved) return;
    writeFileAtomically(this.file, snapshotText(state, new Date()));
    this.lastSaved = compact;
  }

  /** Stops listening and writes the final state (the server's close path, SIGTERM and SIGINT). */
  close(): void {
    if (this.closed) return;
    this.closed = true;
    this.cancelTimer();
    this.stopListening();
    this.write(true);
  }
}
