/**
 * Boresight pointing error (app/engine/metrics/boresight.ts) against outside references:
 * - the `quaternion` npm package (2.2.0, Hamilton quaternions, scalar first) rotates the axis by q
 *   and by q_ref, and mathjs (15.2.0) gives the angle between the two inertial vectors as
 *   acos(u·v / (|u||v|)) — a different route (two inertial rotations, acos) from the engine's
 *   (one error rotation, atan2);
 * - closed forms: an axis along the error rotation axis has no boresight error; an axis
 *   perpendicular to it has the full error angle (Euler's rotation theorem: a rotation by θ about
 *   n moves a unit vector a by the angle between a and R a, which is θ when a ⟂ n and 0 when a ∥ n).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import * as math from 'mathjs';
import Quaternion from 'quaternion';
import { boresightErrorAngles, unitAxis } from '../../app/engine/metrics/boresight';
import type { RunTrace } from '../../app/engine/sim/types';
import { qAngleBetween, qFromAxisAngle, qMultiply } from '../../app/engine/math/rotation';

function traceOf(q: number[][], qRef: number[][]): RunTrace {
  const n = q.length;
  return { n, q: Float64Array.from(q.flat()), qRef: Float64Array.from(qRef.flat()) } as unknown as RunTrace;
}

const unitQuat = fc
  .tuple(fc.double({ min: -1, max: 1 }), fc.double({ min: -1, max: 1 }), fc.double({ min: -1, max: 1 }), fc.double({ min: -1, max: 1 }))
  .filter((v) => Math.hypot(...v) > 0.1)
  .map((v) => {
    const n = Math.hypot(...v);
    return v.map((x) => x / n);
  });
const axis = fc
  .tuple(fc.double({ min: -1, max: 1 }), fc.double({ min: -1, max: 1 }), fc.double({ min: -1, max: 1 }))
  .filter((v) => Math.hypot(...v) > 0.1);

describe('boresight pointing error', () => {
  it('matches the angle between R(q)a and R(q_ref)a from the quaternion package and mathjs', () => {
    fc.assert(
      fc.property(unitQuat, unitQuat, axis, (q, r, a) => {
        const u = unitAxis(a)!;
        const got = boresightErrorAngles(new Float64Array(1), traceOf([q], [r]), u)[0]!;
        // quaternion package: constructor (w, x, y, z); rotateVector is q v q* (Hamilton).
        const vb = new Quaternion(q[3]!, q[0]!, q[1]!, q[2]!).rotateVector([...u]) as number[];
        const vr = new Quaternion(r[3]!, r[0]!, r[1]!, r[2]!).rotateVector([...u]) as number[];
        const c = Number(math.dot(vb, vr)) / (Number(math.norm(vb)) * Number(math.norm(vr)));
        const ref = Math.acos(Math.min(1, Math.max(-1, c)));
        // acos loses digits near 0 and π (its slope is infinite there): compare with a tolerance
        // that allows for it, 1e-7 rad, far below anything a plot shows.
        expect(Math.abs(got - ref)).toBeLessThan(1e-7);
      }),
      { numRuns: 500 },
    );
  });

  it('is zero along the error axis and the full error angle across it', () => {
    const qRef = [0.1, -0.3, 0.2, 0.927];
    const nr = Math.hypot(...qRef);
    const r = qRef.map((x) => x / nr);
    for (const [n, theta] of [
      [[0, 0, 1], 0.7],
      [[1, 2, -1], 2.5],
      [[-0.3, 0.1, 0.9], Math.PI - 1e-6],
    ] as [number[], number][]) {
      const nu = unitAxis(n)!;
      // q = q_ref ⊗ R(n, θ): the error q_ref* ⊗ q is the rotation θ about n (body axes).
      const q = Array.from(qMultiply(new Float64Array(4), r, qFromAxisAngle(new Float64Array(4), nu, theta)));
      const tr = traceOf([q], [r]);
      expect(boresightErrorAngles(new Float64Array(1), tr, nu)[0]).toBeLessThan(1e-9);
      // A unit vector perpendicular to n.
      const e = Math.abs(nu[0]) < 0.5 ? [1, 0, 0] : [0, 1, 0];
      const p = unitAxis([nu[1] * e[2]! - nu[2] * e[1]!, nu[2] * e[0]! - nu[0] * e[2]!, nu[0] * e[1]! - nu[1] * e[0]!])!;
      expect(boresightErrorAngles(new Float64Array(1), tr, p)[0]).toBeCloseTo(theta, 9);
      // And never more than the attitude error angle (rotation.ts qAngleBetween).
      const full = qAngleBetween(q, r);
      for (const a of [
        [1, 0, 0],
        [0, 1, 0],
        [0.3, 0.4, -0.5],
      ]) {
        expect(boresightErrorAngles(new Float64Array(1), tr, unitAxis(a)!)[0]).toBeLessThanOrEqual(full + 1e-12);
      }
    }
  });

  it('does not depend on the stored sign of q or q_ref', () => {
    const q = [0.2, 0.1, -0.4, 0.888];
    const r = [-0.5, 0.5, 0.5, 0.5];
    const a = unitAxis([0, 0, 1])!;
    const one = boresightErrorAngles(new Float64Array(1), traceOf([q], [r]), a)[0]!;
    const neg = (v: number[]) => v.map((x) => -x);
    expect(boresightErrorAngles(new Float64Array(1), traceOf([neg(q)], [r]), a)[0]).toBeCloseTo(one, 14);
    expect(boresightErrorAngles(new Float64Array(1), traceOf([q], [neg(r)]), a)[0]).toBeCloseTo(one, 14);
  });

  it('refuses a zero or non-finite axis', () => {
    expect(unitAxis([0, 0, 0])).toBeNull();
    expect(unitAxis([Number.NaN, 0, 1])).toBeNull();
    expect(unitAxis([1, 0])).toBeNull();
    expect(unitAxis([0, 3, 4])).toEqual([0, 0.6, 0.8]);
  });
});
