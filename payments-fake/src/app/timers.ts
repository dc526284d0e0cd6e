/** setTimeout with bookkeeping, so a reset or shutdown can cancel everything still waiting. */
export class Timers {
  private readonly handles = new Set<NodeJS.Timeout>();

  /** `afterRun` is told after each timer has run (the world uses it to save what the timer changed). */
  constructor(private readonly afterRun?: () => void) {}

  /** Runs `run` once after `ms`; the returned function cancels it if it has not run yet. */
  after(ms: number, run: () => void): () => void {
    const handle = setTimeout(() => {
      this.handles.delete(handle);
      try {
        run();
      } finally {
        this.afterRun?.();
      }
    }, ms);
    handle.unref();
    this.handles.add(handle);
    return () => {
      clearTimeout(handle);
      this.handles.delete(handle);
    };
  }

  get pending(): number {
    return this.handles.size;
  }

  clearAll(): void {
    for (const handle of this.handles) clearTimeout(handle);
    this.handles.clear();
  }
}
