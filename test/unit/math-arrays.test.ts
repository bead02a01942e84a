/**
 * allFinite (app/engine/math/arrays.ts) against the ECMAScript definition it stands for:
 * Array.prototype.every with Number.isFinite (ECMA-262 §23.1.3.6 and §21.1.2.2), over typed and
 * plain arrays with NaN, ±Infinity, −0 and the empty array.
 */
import { describe, expect, it } from 'vitest';
import { allFinite } from '../../app/engine/math/arrays';
import { makeRng } from '../../app/engine/math/prng';

const SPECIALS = [NaN, Infinity, -Infinity, -0, 0, Number.MAX_VALUE, -Number.MIN_VALUE];

describe('allFinite', () => {
  it('agrees with every(Number.isFinite) on random arrays with special values', () => {
    const rng = makeRng(5, 1);
    for (let c = 0; c < 500; c++) {
      const n = Math.floor(rng.next() * 8);
      const xs = Array.from({ length: n }, () =>
        rng.next() < 0.15 ? SPECIALS[Math.floor(rng.next() * SPECIALS.length)]! : rng.next() - 0.5,
      );
      const expected = xs.every((x) => Number.isFinite(x));
      expect(allFinite(xs)).toBe(expected);
      expect(allFinite(Float64Array.from(xs))).toBe(expected);
    }
  });

  it('is true for an empty array and false for a single NaN at the end', () => {
    expect(allFinite([])).toBe(true);
    expect(allFinite(new Float64Array([1, 2, NaN]))).toBe(false);
  });
});
