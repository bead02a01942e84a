/**
 * hypot3 (app/engine/math/hypot.ts) against the runtime's own Math.hypot (ECMA-262 §21.3.2.18, V8's
 * implementation in node): the same double bit for bit (Object.is, so −0/+0 and NaN count), over
 * random inputs spread across the whole double range, and the standard's special values.
 */
import { describe, expect, it } from 'vitest';
import { hypot3 } from '../../app/engine/math/hypot';
import { makeRng } from '../../app/engine/math/prng';

describe('hypot3', () => {
  it('is Math.hypot bit for bit over 10^6 random triples (magnitudes 1e-320 … 1e308, zeros, equal values)', () => {
    const rng = makeRng(20261204, 0);
    // 53 random bits from two 32-bit draws, so the mantissas are full.
    const uniform = (): number => rng.next() + rng.next() / 4294967296;
    const draw = (): number => {
      const k = uniform();
      if (k < 0.04) return 0;
      if (k < 0.06) return -0;
      if (k < 0.08) return (uniform() - 0.5) * Number.MIN_VALUE * 2e5; // subnormal (below 1e-318)
      if (k < 0.1) return (uniform() - 0.5) * 3.5 * 1e308; // near overflow
      const e = Math.floor(uniform() * 60) - 30;
      return (uniform() - 0.5) * 10 ** e;
    };
    let mismatches = 0;
    let first = '';
    for (let i = 0; i < 1_000_000; i++) {
      const a = draw();
      const b = i % 7 === 0 ? a : draw();
      const c = i % 11 === 0 ? -b : draw();
      const want = Math.hypot(a, b, c);
      const got = hypot3(a, b, c);
      if (!Object.is(want, got)) {
        if (mismatches === 0) first = `(${a}, ${b}, ${c}): ${got} vs ${want}`;
        mismatches++;
      }
    }
    expect(first).toBe('');
    expect(mismatches).toBe(0);
  });

  it('unit-quaternion vector parts (the error angle’s input) are Math.hypot bit for bit', () => {
    const rng = makeRng(7, 1);
    const uniform = (): number => rng.next() + rng.next() / 4294967296;
    let mismatches = 0;
    for (let i = 0; i < 200_000; i++) {
      const x = rng.normal(),
        y = rng.normal(),
        z = rng.normal(),
        w = rng.normal() * 10 ** (Math.floor(uniform() * 12) - 6);
      const n = Math.sqrt(x * x + y * y + z * z + w * w);
      if (!Object.is(hypot3(x / n, y / n, z / n), Math.hypot(x / n, y / n, z / n))) mismatches++;
    }
    expect(mismatches).toBe(0);
  });

  it('special values as ECMA-262 §21.3.2.18 states them, and an exact Pythagorean quadruple', () => {
    expect(hypot3(Infinity, NaN, 0)).toBe(Infinity); // any ±∞ wins over NaN
    expect(hypot3(NaN, 1, -Infinity)).toBe(Infinity);
    expect(hypot3(NaN, 1, 2)).toBeNaN();
    expect(hypot3(1, 2, NaN)).toBeNaN();
    expect(Object.is(hypot3(-0, -0, 0), 0)).toBe(true); // +0
    expect(hypot3(1e308, 1e308, 1e308)).toBe(Math.hypot(1e308, 1e308, 1e308)); // no overflow: ≈ 1.732e308
    expect(Number.isFinite(hypot3(1e308, 1e308, 1e308))).toBe(true);
    expect(hypot3(2, 3, 6)).toBe(7); // 4 + 9 + 36 = 49 (Pythagorean quadruple, arithmetic)
    expect(hypot3(-1, -4, 8)).toBe(9); // 1 + 16 + 64 = 81
  });
});
