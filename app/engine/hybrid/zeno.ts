/**
 * The Zeno watch of simulateHybrid: the times of the last `max` jumps in a ring, so that a burst of
 * jumps at one instant (allowed) is told from an accumulation of more than `max` jumps within
 * `window` seconds (the run stops as 'zeno' instead of hanging). No allocation after construction.
 */
export class JumpWindow {
  private readonly ring: Float64Array;
  private count = 0;
  private idx = 0;

  constructor(
    readonly max: number,
    readonly window: number,
  ) {
    this.ring = new Float64Array(max);
  }

  /** Count a jump at t; false (and not counted) when it would make more than max within the window. */
  admit(t: number): boolean {
    if (this.count >= this.max && t - this.ring[this.idx]! <= this.window) return false;
    this.ring[this.idx] = t;
    if (++this.idx === this.max) this.idx = 0;
    this.count++;
    return true;
  }
}
