/**
 * Time for the stand-in's objects. Tests move it forward (POST /_control/clock) to reach
 * expiry without waiting; webhook signatures always use the real time, because the receiver
 * checks them against its own clock.
 */
export class Clock {
  private offsetMs = 0;

  nowMs(): number {
    return Date.now() + this.offsetMs;
  }

  /** Unix seconds, the provider's unit for `created`, `expires_at`, `arrival_date`. */
  nowSeconds(): number {
    return Math.floor(this.nowMs() / 1000);
  }

  advance(seconds: number): void {
    this.offsetMs += seconds * 1000;
  }

  reset(): void {
    this.offsetMs = 0;
  }

  /** How far the clock was moved ahead of the real time, for the state file. */
  toSnapshot(): { offsetMs: number } {
    return { offsetMs: this.offsetMs };
  }

  restoreSnapshot(snapshot: { offsetMs: number }): void {
    this.offsetMs = snapshot.offsetMs;
  }
}
