/**
 * Growable storage for a hybrid arc: (t, j, x) points in typed arrays that double when full,
 * so recording costs amortised O(1) and allocates only on growth, never per point.
 */
export class ArcBuffer {
  readonly dim: number;
  count = 0;
  t: Float64Array;
  j: Int32Array;
  x: Float64Array;

  constructor(dim: number, initialCapacity = 256) {
    this.dim = dim;
    const cap = Math.max(4, initialCapacity);
    this.t = new Float64Array(cap);
    this.j = new Int32Array(cap);
    this.x = new Float64Array(cap * dim);
  }

  private grow(): void {
    const cap = this.t.length * 2;
    const t = new Float64Array(cap);
    t.set(this.t);
    const j = new Int32Array(cap);
    j.set(this.j);
    const x = new Float64Array(cap * this.dim);
    x.set(this.x);
    this.t = t;
    this.j = j;
    this.x = x;
  }

  push(t: number, j: number, x: ArrayLike<number>): void {
    if (this.count === this.t.length) this.grow();
    const k = this.count++;
    this.t[k] = t;
    this.j[k] = j;
    const d = this.dim,
      off = k * d;
    for (let i = 0; i < d; i++) this.x[off + i] = x[i]!;
  }

  /** Views trimmed to the stored points (no copy). */
  views(): { t: Float64Array; j: Int32Array; x: Float64Array } {
    return {
      t: this.t.subarray(0, this.count),
      j: this.j.subarray(0, this.count),
      x: this.x.subarray(0, this.count * this.dim),
    };
  }
}
