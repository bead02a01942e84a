/**
 * Binary min-heap of (key, node) pairs over typed arrays, for A*. Duplicates are allowed (a node
 * pushed again with a better key); the search skips entries of nodes already closed.
 */
export class MinHeap {
  private keys: Float64Array;
  private vals: Int32Array;
  size = 0;

  constructor(capacity = 1024) {
    this.keys = new Float64Array(capacity);
    this.vals = new Int32Array(capacity);
  }

  push(key: number, val: number): void {
    if (this.size === this.keys.length) this.grow();
    let i = this.size++;
    const K = this.keys,
      V = this.vals;
    while (i > 0) {
      const p = (i - 1) >> 1;
      if (K[p]! <= key) break;
      K[i] = K[p]!;
      V[i] = V[p]!;
      i = p;
    }
    K[i] = key;
    V[i] = val;
  }

  /** Node of the smallest key (removed); −1 when empty. */
  pop(): number {
    if (this.size === 0) return -1;
    const K = this.keys,
      V = this.vals;
    const top = V[0]!;
    const n = --this.size;
    const key = K[n]!,
      val = V[n]!;
    let i = 0;
    for (;;) {
      let c = 2 * i + 1;
      if (c >= n) break;
      if (c + 1 < n && K[c + 1]! < K[c]!) c++;
      if (K[c]! >= key) break;
      K[i] = K[c]!;
      V[i] = V[c]!;
      i = c;
    }
    K[i] = key;
    V[i] = val;
    return top;
  }

  private grow(): void {
    const k = new Float64Array(2 * this.keys.length),
      v = new Int32Array(2 * this.vals.length);
    k.set(this.keys);
    v.set(this.vals);
    this.keys = k;
    this.vals = v;
  }
}
