/** decimalsBelow: the printed value is strictly below x and the largest such d-decimal value (checked by exact rational comparison with BigInt). */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { decimalsBelow } from '../../app/engine/math/below';

/** Exact comparison of a decimal string with a double: the double's exact binary value as a fraction (IEEE 754 doubles are dyadic rationals). */
function compare(text: string, x: number): number {
  const [ip, fp = ''] = text.replace('-', '').split('.');
  const sign = text.startsWith('-') ? -1n : 1n;
  const num = sign * BigInt(ip! + fp);
  const den = 10n ** BigInt(fp.length);
  // x = m · 2^e exactly
  const buf = new DataView(new ArrayBuffer(8));
  buf.setFloat64(0, x);
  const bits = buf.getBigUint64(0);
  const neg = bits >> 63n === 1n;
  const exp = Number((bits >> 52n) & 0x7ffn);
  let mant = bits & ((1n << 52n) - 1n);
  let e2: number;
  if (exp === 0) e2 = -1074;
  else {
    mant |= 1n << 52n;
    e2 = exp - 1075;
  }
  const xm = neg ? -mant : mant;
  // compare num/den with xm·2^e2
  const lhs = e2 >= 0 ? num : num * (1n << BigInt(-e2));
  const rhs = e2 >= 0 ? xm * (1n << BigInt(e2)) * den : xm * den;
  return lhs < rhs ? -1 : lhs > rhs ? 1 : 0;
}

describe('decimalsBelow', () => {
  it('the issue case: 0.031249… prints 0.031249, and 0.03125 itself prints below it', () => {
    expect(decimalsBelow(0.0312499999, 6)).toBe('0.031249');
    expect(decimalsBelow(0.03125, 5)).toBe('0.03124');
    expect(decimalsBelow(0.03125, 6)).toBe('0.031249');
  });
  it('strictly below x, and the next d-decimal value up is not (exact rational comparison)', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-6, max: 10, noNaN: true }), fc.integer({ min: 0, max: 8 }), (x, d) => {
        const s = decimalsBelow(x, d);
        expect(compare(s, x)).toBe(-1);
        const next = (Number(s) + 10 ** -d).toFixed(d);
        expect(compare(next, x)).toBeGreaterThanOrEqual(0);
      }),
      { seed: 20261203, numRuns: 3000 },
    );
  });
});
