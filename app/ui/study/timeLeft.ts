/**
 * The study's time-left estimate. The old one, elapsed / done × (total − done) from the first
 * worker's start, was about 7× too long early in a study: each worker's first case carries its
 * start-up (engine modules compiled, the study context built, the JIT still cold) and takes ~15×
 * a steady case (measured: Tern-12 study, 3.0 s for the first case against 0.2 s for the next
 * ones in one thread). Here the rate is each worker's steady rate (its completions after its
 * first, over the time since its first) summed over the workers that have one, so start-up
 * never enters the rate; the estimate counts down between completions.
 * Constant-rate extrapolation: common practice, no source.
 */

export interface CaseCompletion {
  /** Which worker finished the case. */
  worker: number;
  /** When, ms on any monotonic clock. */
  t: number;
}

export class TimeLeftEstimator {
  private readonly first = new Map<number, number>();
  private readonly last = new Map<number, number>();
  private readonly count = new Map<number, number>();
  private done = 0;
  private tLast = -Infinity;

  constructor(readonly total: number) {}

  add(c: CaseCompletion): void {
    this.done++;
    if (!this.first.has(c.worker)) this.first.set(c.worker, c.t);
    this.last.set(c.worker, c.t);
    this.count.set(c.worker, (this.count.get(c.worker) ?? 0) + 1);
    this.tLast = Math.max(this.tLast, c.t);
  }

  /** Steady cases per ms over all workers with at least two completions, or null. */
  rate(): number | null {
    let r = 0;
    let any = false;
    for (const [w, n] of this.count) {
      const span = this.last.get(w)! - this.first.get(w)!;
      if (n >= 2 && span > 0) {
        r += (n - 1) / span;
        any = true;
      }
    }
    return any ? r : null;
  }

  /** Estimated ms left at time `now` (same clock as the completions); null until a rate exists. */
  remainingMs(now: number): number | null {
    if (this.done >= this.total) return 0;
    const r = this.rate();
    if (r === null) return null;
    const atLast = (this.total - this.done) / r;
    return Math.max(0, atLast - Math.max(0, now - this.tLast));
  }
}
