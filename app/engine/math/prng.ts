/**
 * Seeded pseudo-random numbers, reproducible across platforms and workers.
 *
 * Generator: xoshiro128** (Blackman & Vigna, "Scrambled linear pseudorandom number generators",
 * ACM TOMS 47(4), 2021), seeded through splitmix32 so that a (seed, stream) pair — e.g. a study's
 * seed and a case index — gives an independent, repeatable sequence. All arithmetic is 32-bit
 * integer (Math.imul, >>> 0), so results are identical in every JavaScript engine.
 */

export interface Rng {
  /** Uniform in [0, 1), 32 bits of resolution. */
  next(): number;
  /** Standard normal (Box–Muller, one value per call; the pair's second value is cached). */
  normal(): number;
  /**
   * out[0 … count−1] = `count` standard normals: the same values, drawn in the same order, as
   * `count` calls of normal() (and the same generator state after). One call instead of `count`
   * keeps the values out of heap numbers in the sensors' per-sample path.
   */
  normals(out: Float64Array, count: number): void;
}

function splitmix32(state: { s: number }): number {
  state.s = (state.s + 0x9e3779b9) | 0;
  let z = state.s;
  z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
  z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
  return (z ^ (z >>> 16)) >>> 0;
}

function rotl(x: number, k: number): number {
  return ((x << k) | (x >>> (32 - k))) >>> 0;
}

class Xoshiro128 implements Rng {
  // State words and the cached normal live in typed arrays: plain object fields holding values
  // ≥ 2^31 or doubles would be boxed, allocating on every draw in the per-sample hot path.
  private readonly s = new Uint32Array(4);
  private readonly spare = new Float64Array(1);
  private hasSpare = false;

  /** `seed` and `stream` are integers (taken modulo 2^32). */
  constructor(seed: number, stream = 0) {
    const st = { s: (Math.trunc(seed) ^ Math.imul(Math.trunc(stream) + 1, 0x632be5ab)) | 0 };
    // Mix the stream in twice so neighbouring streams decorrelate.
    splitmix32(st);
    st.s = (st.s ^ Math.imul(Math.trunc(stream), 0x2545f491)) | 0;
    const s = this.s;
    s[0] = splitmix32(st);
    s[1] = splitmix32(st);
    s[2] = splitmix32(st);
    s[3] = splitmix32(st);
    if ((s[0] | s[1] | s[2] | s[3]) === 0) s[0] = 1;
  }

  nextUint32(): number {
    const s = this.s;
    const a = s[0]!,
      b = s[1]!,
      c = s[2]!,
      d = s[3]!;
    const result = Math.imul(rotl(Math.imul(b, 5) >>> 0, 7), 9) >>> 0;
    const t = (b << 9) >>> 0;
    const c1 = (c ^ a) >>> 0;
    const d1 = (d ^ b) >>> 0;
    s[1] = b ^ c1;
    s[0] = a ^ d1;
    s[2] = c1 ^ t;
    s[3] = rotl(d1, 11);
    return result;
  }

  next(): number {
    return this.nextUint32() / 4294967296;
  }

  normals(out: Float64Array, count: number): void {
    for (let i = 0; i < count; i++) {
      if (this.hasSpare) {
        this.hasSpare = false;
        out[i] = this.spare[0]!;
        continue;
      }
      // normal() below, written out
      let u = 0;
      while (u === 0) u = this.next();
      const v = this.next();
      const r = Math.sqrt(-2 * Math.log(u));
      const a = 2 * Math.PI * v;
      this.spare[0] = r * Math.sin(a);
      this.hasSpare = true;
      out[i] = r * Math.cos(a);
    }
  }

  normal(): number {
    if (this.hasSpare) {
      this.hasSpare = false;
      return this.spare[0]!;
    }
    let u = 0;
    while (u === 0) u = this.next();
    const v = this.next();
    const r = Math.sqrt(-2 * Math.log(u));
    const a = 2 * Math.PI * v; // formed once for both (the same product as before)
    this.spare[0] = r * Math.sin(a);
    this.hasSpare = true;
    return r * Math.cos(a);
  }
}

export function makeRng(seed: number, stream = 0): Rng {
  return new Xoshiro128(seed, stream);
}
