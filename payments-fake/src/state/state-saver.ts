// Keeps the state file up to date while the stand-in runs. The world says when something may
// have changed (after every request, timer and webhook attempt); the saver writes at most
// SAVE_DELAY_MS after the first change it has not written yet — the timer is not pushed back by
// later changes, so a steady stream of requests cannot starve the file — and skips the write when
// the content is the same as last time (most GETs change nothing). A reset is written at once,
// so the file is empty by the time POST /_control/reset answers; close() writes a last time.
//
// What the stand-in acknowledges must survive a crash (kill -9), so a provider call that changes
// something waits for `flush()` before it answers, and a webhook waits before it goes out. Calls
// that finish while a write is on its way share the next one (group commit): one snapshot, one
// fsync and one rename cover them all. Every write is numbered when it takes its snapshot and a
// write never replaces a newer one, so the file only ever moves forward.

import type { ProviderWorld } from './provider-world';
import { prepareFileReplacement, writeFileAtomically } from './state-file';
import { snapshotTextOf, worldState } from './world-snapshot';

export const SAVE_DELAY_MS = 250;

export class StateSaver {
  private timer: NodeJS.Timeout | undefined;
  /** Compact JSON of the state last written (or read at start), to skip writes that change nothing. */
  private lastSaved: string;
  private closed = false;
  private readonly stopListening: () => void;
  /** Number of the last snapshot taken for writing, and of the newest one on disk. */
  private taken = 0;
  private committed = 0;
  /** The durable write on its way, and the one that will start after it (which new callers join). */
  private running: Promise<void> = Promise.resolve();
  private queued: Promise<void> | undefined;

  constructor(
    private readonly world: ProviderWorld,
    readonly file: string,
    private readonly delayMs = SAVE_DELAY_MS,
  ) {
    this.lastSaved = JSON.stringify(worldState(world));
    this.stopListening = world.onChange((change) => (change === 'reset' ? this.saveNow() : this.scheduleSave()));
    world.useDurableStore(() => this.flush());
  }

  /** Resolves once everything the world holds at the time of the call is on disk. */
  flush(): Promise<void> {
    if (this.closed) return Promise.resolve();
    if (this.queued) return this.queued;
    const next = this.running.then(() => {
      this.queued = undefined;
      return this.writeDurably();
    });
    this.queued = next;
    this.running = next.catch(() => undefined);
    return next;
  }

  private async writeDurably(): Promise<void> {
    const number = ++this.taken;
    const state = worldState(this.world);
    const compact = JSON.stringify(state);
    if (compact === this.lastSaved) return;
    const replacement = await prepareFileReplacement(this.file, snapshotTextOf(compact, new Date()));
    // A newer snapshot (a timer's write, close) reached the disk meanwhile and holds all of this one.
    if (this.committed > number || this.closed) {
      replacement.discard();
      return;
    }
    replacement.commit();
    this.committed = number;
    this.lastSaved = compact;
  }

  private scheduleSave(): void {
    if (this.closed || this.timer) return;
    this.timer = setTimeout(() => {
      this.timer = undefined;
      // The stand-in keeps serving from memory; the next change tries again.
      this.flush().catch((error: unknown) =>
        console.error(`payments-fake: ${error instanceof Error ? error.message : String(error)}`),
      );
    }, this.delayMs);
    this.timer.unref();
  }

  /** Resolves once no write is on its way (starts none). */
  idle(): Promise<void> {
    return this.running;
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
    const number = ++this.taken;
    const state = worldState(this.world);
    const compact = JSON.stringify(state);
    if (!always && compact === this.lastSaved) return;
    writeFileAtomically(this.file, snapshotTextOf(compact, new Date()));
    this.committed = number;
    this.lastSaved = compact;
  }

  /** Stops listening and writes the final state (the server's close path, SIGTERM and SIGINT). */
  close(): void {
    if (this.closed) return;
    this.closed = true;
    this.cancelTimer();
    this.stopListening();
    this.world.useDurableStore(undefined);
    this.write(true);
  }
}
