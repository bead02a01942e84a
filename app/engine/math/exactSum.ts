/**
 * Exact sums of doubles, for statistics that must merge to the same bits however the data were
 * split (campaign shards): addition of exact values is associative and commutative, so the sum of
 * any partition, merged in any order, is the same number.
 *
 * Every finite double is M·2^E with M a 53-bit integer and E ≥ −1074 (IEEE 754-2019 §3.4 binary64);
 * its square is M²·2^(2E). An exact sum holds the integer `m` and exponent `e` of the value m·2^e,
 * with e the smallest exponent added so far; adding aligns by shifting the integer (BigInt), so
 * nothing is ever rounded. Memory grows with the spread of exponents, not with the count: about
 * (largest − smallest exponent + 53 + log2 n) bits, a few hundred bits for ordinary data.
 *
 * Conversion back to a double rounds once, to nearest (ties to even), through BigInt division with
 * a sticky bit; results in the subnormal range (below 2^−1022) may be rounded twice. Not a per-step
 * hot path: a statistic gets one value per case, and each add allocates a few small BigInts.
 */

/** The exact value m·2^e. Mutable: `exactAdd*` update it in place. */
export interface ExactSum {
  m: bigint;
  e: number;
}

// Scratch for reading a double's bits (made once at module load).
const bitsView = new DataView(new ArrayBuffer(8));

/** 2^k as a double, exact for −1022 ≤ k ≤ 1023 (built from its bits, not Math.pow). */
function pow2(k: number): number {
  bitsView.setUint32(0, (k + 1023) << 20);
  bitsView.setUint32(4, 0);
  return bitsView.getFloat64(0);
}

/** x · 2^k, exact while every intermediate stays a normal double. */
function scale2(x: number, k: number): number {
  let v = x;
  let r = k;
  while (r > 1023) {
    v *= pow2(1023);
    r -= 1023;
  }
  while (r < -1022) {
    v *= pow2(-1022);
    r += 1022;
  }
  return v * pow2(r);
}

export function exactZero(): ExactSum {
  return { m: 0n, e: 0 };
}

/** Split a finite nonzero double into (signed integer mantissa, exponent); result in `out`. */
function decompose(x: number, out: { mant: number; exp: number }): void {
  bitsView.setFloat64(0, x);
  const hi = bitsView.getUint32(0);
  const lo = bitsView.getUint32(4);
  const biased = (hi >>> 20) & 0x7ff;
  const frac = (hi & 0xfffff) * 4294967296 + lo; // < 2^52: exact
  const mant = biased === 0 ? frac : frac + 4503599627370496; // implicit leading 1 (2^52)
  out.mant = hi >>> 31 ? -mant : mant;
  out.exp = biased === 0 ? -1074 : biased - 1075;
}

const parts = { mant: 0, exp: 0 };

/** s += m·2^e (exact). */
function addScaled(s: ExactSum, m: bigint, e: number): void {
  if (m === 0n) return;
  if (s.m === 0n) {
    s.m = m;
    s.e = e;
    return;
  }
  if (e < s.e) {
    s.m <<= BigInt(s.e - e);
    s.e = e;
  }
  s.m += e > s.e ? m << BigInt(e - s.e) : m;
}

/** s += x, exactly. `x` must be finite. */
export function exactAdd(s: ExactSum, x: number): ExactSum {
  if (x === 0) return s;
  decompose(x, parts);
  addScaled(s, BigInt(parts.mant), parts.exp);
  return s;
}

/** s += x², exactly. `x` must be finite. */
export function exactAddSquare(s: ExactSum, x: number): ExactSum {
  if (x === 0) return s;
  decompose(x, parts);
  const m = BigInt(parts.mant);
  addScaled(s, m * m, 2 * parts.exp);
  return s;
}

/** out = a + b, exactly (out may be a or b). */
export function exactMerge(out: ExactSum, a: ExactSum, b: ExactSum): ExactSum {
  const bm = b.m,
    be = b.e;
  out.m = a.m;
  out.e = a.e;
  addScaled(out, bm, be);
  return out;
}

/** Bits of |v| (0 for 0). */
function bitLength(v: bigint): number {
  if (v === 0n) return 0;
  const hex = (v < 0n ? -v : v).toString(16);
  return 4 * (hex.length - 1) + (32 - Math.clz32(parseInt(hex[0]!, 16)));
}

/** The canonical form of a value (odd mantissa, or 0·2^0): one representation per number. */
export function exactCanonical(s: ExactSum): ExactSum {
  let m = s.m;
  let e = s.e;
  if (m === 0n) return { m: 0n, e: 0 };
  const neg = m < 0n;
  if (neg) m = -m;
  const tz = bitLength(m & -m) - 1; // trailing zero bits
  if (tz > 0) {
    m >>= BigInt(tz);
    e += tz;
  }
  return { m: neg ? -m : m, e };
}

/**
 * The double nearest to num·2^e / den (den > 0), ties to even; one rounding (except in the
 * subnormal range, see the file comment). Overflow gives ±Infinity.
 */
export function ratioToNumber(num: bigint, e: number, den: bigint): number {
  if (den <= 0n) throw new RangeError('ratioToNumber: the denominator must be positive');
  if (num === 0n) return 0;
  const neg = num < 0n;
  const a = neg ? -num : num;
  // Enough quotient bits (≥ 64) that the 53-bit rounding sees the true guard bits; the remainder
  // becomes a sticky bit far below them.
  const shift = Math.max(0, 66 + bitLength(den) - bitLength(a));
  const scaled = a << BigInt(shift);
  let q = scaled / den;
  if (scaled % den !== 0n) q |= 1n;
  let exp = e - shift;
  const bits = bitLength(q);
  if (bits > 64) {
    const drop = bits - 64;
    const sticky = (q & ((1n << BigInt(drop)) - 1n)) !== 0n;
    q >>= BigInt(drop);
    if (sticky) q |= 1n;
    exp += drop;
  }
  // Number(bigint) rounds to nearest, ties to even (ECMA-262 §21.1.1.1 Number(value)).
  const v = scale2(Number(q), exp);
  return neg ? -v : v;
}

/** The double nearest to the exact sum. */
export function exactToNumber(s: ExactSum): number {
  return ratioToNumber(s.m, s.e, 1n);
}

/** "<signed hex mantissa>p<exponent>" of the canonical form, e.g. "-1fp-3" = −31·2^−3. */
export function exactToString(s: ExactSum): string {
  const c = exactCanonical(s);
  const hex = c.m < 0n ? `-${(-c.m).toString(16)}` : c.m.toString(16);
  return `${hex}p${c.e}`;
}

// Sums and sums of squares of doubles stay within these (squares reach 2^±2150; a sum of up to 2^53
// terms adds 53 bits): larger texts are refused rather than expanded into huge integers.
const EXACT_TEXT = /^(-?)([0-9a-f]{1,1200})p(-?\d{1,5})$/;
const MAX_ABS_EXPONENT = 4400;

/** Parse `exactToString` text; null when the text is not of that form (or out of range). */
export function exactFromString(text: string): ExactSum | null {
  const g = EXACT_TEXT.exec(text);
  if (!g) return null;
  const e = Number(g[3]);
  if (Math.abs(e) > MAX_ABS_EXPONENT) return null;
  const mag = BigInt(`0x${g[2]!}`);
  return exactCanonical({ m: g[1] ? -mag : mag, e });
}
