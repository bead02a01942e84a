/**
 * Box / cube capacity functions. An orthogonal triad of identical wheels (W = I) has a cube as
 * its momentum (and torque) envelope: references §3, after Markley, Reynolds, Liu & Lebsock,
 * "Maximum Torque and Momentum Envelopes for Reaction-Wheel Arrays", JGCD 33(5), 2010 (the
 * envelope is the wheel-limit cube mapped through the axis matrix). Check values of the triad:
 * h_max along an axis, 1.4142 h_max along (1,1,0)/√2, 1.7321 h_max along (1,1,1)/√3.
 */
import { describe, expect, it } from 'vitest';
import { boxCapacity, cubeCapacity } from '../../app/engine/plan/limits';
import { makeRng } from '../../app/engine/math/prng';

const v = (x: number, y: number, z: number) => {
  const n = Math.hypot(x, y, z);
  return Float64Array.from([x / n, y / n, z / n]);
};

describe('cubeCapacity (orthogonal-triad envelope, references §3)', () => {
  const h = 0.006; // 6 mN·m·s per wheel (invented)
  const cap = cubeCapacity(h);
  it('matches the triad check values', () => {
    expect(cap(v(1, 0, 0)) / h).toBeCloseTo(1, 12);
    expect(cap(v(0, -1, 0)) / h).toBeCloseTo(1, 12);
    expect(cap(v(1, 1, 0)) / h).toBeCloseTo(1.4142, 4);
    expect(cap(v(1, 1, 1)) / h).toBeCloseTo(1.7321, 4);
    expect(cap(v(-1, 1, -1)) / h).toBeCloseTo(Math.sqrt(3), 12);
  });
  it('the minimum over directions is h_max (references §3: "minimum h_max")', () => {
    const rng = makeRng(7, 0);
    let min = Infinity;
    for (let i = 0; i < 2000; i++) min = Math.min(min, cap(v(rng.normal(), rng.normal(), rng.normal())));
    expect(min).toBeGreaterThanOrEqual(h * (1 - 1e-12));
  });
});

describe('boxCapacity', () => {
  it('agrees with a bisection on "r·d lies in the box" (independent construction)', () => {
    const l = [0.3, 0.05, 0.2];
    const cap = boxCapacity(l);
    const rng = makeRng(11, 0);
    for (let i = 0; i < 200; i++) {
      const d = v(rng.normal(), rng.normal(), rng.normal());
      const inside = (r: number) => Math.abs(r * d[0]!) <= l[0]! && Math.abs(r * d[1]!) <= l[1]! && Math.abs(r * d[2]!) <= l[2]!;
      let lo = 0,
        hi = 10;
      for (let k = 0; k < 200; k++) {
        const mid = 0.5 * (lo + hi);
        if (inside(mid)) lo = mid;
        else hi = mid;
      }
      expect(Math.abs(cap(d) - lo)).toBeLessThan(1e-12);
    }
  });
  it('a zero half-width gives zero capacity along directions that touch it; a zero vector gives 0', () => {
    const cap = boxCapacity([1, 1, 0]);
    expect(cap(v(0, 0, 1))).toBe(0);
    expect(cap(v(1, 0, 1e-3))).toBe(0);
    expect(cap(v(1, 1, 0))).toBeCloseTo(Math.SQRT2, 12);
    expect(cubeCapacity(1)(new Float64Array(3))).toBe(0);
  });
});
