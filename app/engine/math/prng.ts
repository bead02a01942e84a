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

export class Xoshiro128 implements Rng {
  private a: number;
  private b: number;
  private c: number;
  private d: number;
  private spare = 0;
  private hasSpare = false;

  /** `seed` and `stream` are integers (taken modulo 2^32). */
  constructor(seed: number, stream = 0) {
    const st = { s: (Math.trunc(seed) ^ Math.imul(Math.trunc(stream) + 1, 0x632be5ab)) | 0 };
    // Mix the stream in twice so neighbouring streams decorrelate.
    splitmix32(st);
    st.s = (st.s ^ Math.imul(Math.trunc(stream), 0x2545f491)) | 0;
    this.a = splitmix32(st);
    this.b = splitmix32(st);
    this.c = splitmix32(st);
    this.d = splitmix32(st);
    if ((this.a | this.b | this.c | this.d) === 0) this.a = 1;
  }

  nextUint32(): number {
    const result = Math.imul(rotl(Math.imul(this.b, 5) >>> 0, 7), 9) >>> 0;
    const t = (this.b << 9) >>> 0;
    this.c = (this.c ^ this.a) >>> 0;
    this.d = (this.d ^ this.b) >>> 0;
    this.b = (this.b ^ this.c) >>> 0;
    this.a = (this.a ^ this.d) >>> 0;
    this.c = (this.c ^ t) >>> 0;
    this.d = rotl(this.d, 11);
    return result;
  }

  next(): number {
    return this.nextUint32() / 4294967296;
  }

  normal(): number {
    if (this.hasSpare) {
      this.hasSpare = false;
      return this.spare;
    }
    let u = 0;
    while (u === 0) u = this.next();
    const v = this.next();
    const r = Math.sqrt(-2 * Math.log(u));
    this.spare = r * Math.sin(2 * Math.PI * v);
    this.hasSpare = true;
    return r * Math.cos(2 * Math.PI * v);
  }
}

export function makeRng(seed: number, stream = 0): Rng {
  return new Xoshiro128(seed, stream);
}
