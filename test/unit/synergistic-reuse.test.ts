/**
 * The synergistic law reuses its family evaluation when the tracking error is bit for bit the one
 * it last evaluated (laws/synergistic/law.ts). Check: in the closed loop's call order (jump guard,
 * logic update, torque on the measured input, then diagnostics on the true one), every output of
 * one law instance equals, bit for bit (Object.is), the same call on a law built fresh for it,
 * which has nothing to reuse. Inputs include repeats, a sign-flipped zero and the antipodal
 * quaternion (same attitude, different q_e bits) so a stale reuse would show.
 * Independent check of the value reused: at q_e = identity every member's potential V_p = Φ(Γ_p)
 * is that of the warped identity, and the family's minimum there is 0 for the member whose warp
 * leaves the identity fixed (Mayhew & Teel, IEEE TAC 58(11), 2013: V_p ≥ 0, V_q(I) = 0 for a
 * synergistic family's target member; from memory).
 */
import { describe, expect, it } from 'vitest';
import { makeRng } from '../../app/engine/math/prng';
import { qRandomUniform } from '../../app/engine/math/quaternion';
import type { AttitudeController, ControlDiagnostics, ControlInput } from '../../app/engine/control/types';
import { law, pyramidVehicle } from '../reference/closedloop-fixtures';

const veh = pyramidVehicle(
  [
    [1, 0, 0],
    [0, 1.2, 0],
    [0, 0, 0.8],
  ],
  5,
  50,
);
const spec = {
  kind: 'synergistic',
  gains: { omegaN: 1, zeta: 0.9 },
  potential: { eigenvalues: [1, 2, 3] },
  warpGain: 0.15,
  hysteresis: 0.2,
  initialLogic: 'auto',
};
const fresh = (): AttitudeController => law(spec, veh);

function input(q: ArrayLike<number>, w: ArrayLike<number>, qRef: ArrayLike<number>, h: ArrayLike<number>): ControlInput {
  return {
    q: Float64Array.from(q),
    omega: Float64Array.from(w),
    hWheel: Float64Array.from(h),
    qRef: Float64Array.from(qRef),
    omegaRef: Float64Array.of(0.001, -0.002, 0.0005),
    omegaDotRef: Float64Array.of(0, 1e-5, 0),
  };
}

const diag = (): ControlDiagnostics => ({ errorAngle: NaN, eta: NaN, potential: NaN, potentialMin: NaN, gap: NaN, lyapunov: NaN });
const bits = (x: ArrayLike<number> | ControlDiagnostics) =>
  ArrayBuffer.isView(x) || Array.isArray(x) ? Array.from(x as ArrayLike<number>) : Object.values(x);
function sameBits(a: ArrayLike<number> | ControlDiagnostics, b: ArrayLike<number> | ControlDiagnostics, what: string) {
  const x = bits(a),
    y = bits(b);
  expect(x.length, what).toBe(y.length);
  x.forEach((v, i) => expect(Object.is(v, y[i]), `${what}[${i}]: ${v} vs ${y[i]}`).toBe(true));
}

describe('synergistic law: reused family evaluation', () => {
  it('every call equals a fresh law given only that call, over repeats, −0 and antipodal inputs', () => {
    const rng = makeRng(424242, 3);
    const ctrl = fresh();
    const qRef = Array.from(qRandomUniform(new Float64Array(4), rng));
    let logic = ctrl.initialLogic(input([0, 0, 0, 1], [0, 0, 0], qRef, [0, 0, 0, 0]));
    let prev: ControlInput | null = null;
    for (let k = 0; k < 120; k++) {
      const q = Array.from(qRandomUniform(new Float64Array(4), rng));
      const w = [0.01 * rng.normal(), 0.01 * rng.normal(), 0.01 * rng.normal()];
      const h = [0.1 * rng.normal(), 0.1 * rng.normal(), 0.1 * rng.normal(), 0.1 * rng.normal()];
      let meas = input(q, w, qRef, h);
      if (k % 7 === 3 && prev) meas = prev; // the same input again
      if (k % 11 === 5) meas = input([-q[0]!, -q[1]!, -q[2]!, -q[3]!], w, qRef, h); // same attitude, other lift
      if (k % 13 === 6) meas = input(qRef, w, qRef, h); // q_e = identity: zeros of both signs in play
      const truth = input(Array.from(qRandomUniform(new Float64Array(4), rng)), w, qRef, h);

      const g = ctrl.jumpGuard(meas, logic);
      expect(Object.is(g, fresh().jumpGuard(meas, logic)), `guard ${k}`).toBe(true);
      if (g >= 0) {
        const u = ctrl.updateLogic(meas, logic);
        expect(u).toEqual(fresh().updateLogic(meas, logic));
        logic = u.logic;
      }
      sameBits(ctrl.torque(new Float64Array(3), meas, logic), fresh().torque(new Float64Array(3), meas, logic), `torque ${k}`);
      sameBits(ctrl.diagnostics(diag(), truth, logic), fresh().diagnostics(diag(), truth, logic), `diagnostics ${k}`);
      // the torque again after diagnostics moved the law to another q_e
      sameBits(ctrl.torque(new Float64Array(3), meas, logic), fresh().torque(new Float64Array(3), meas, logic), `torque again ${k}`);
      prev = meas;
    }
  });

  it('an error that differs from the last one in a single component is evaluated again', () => {
    const rng = makeRng(77, 1);
    const ctrl = fresh();
    const id = [0, 0, 0, 1];
    for (let k = 0; k < 30; k++) {
      const q = Array.from(qRandomUniform(new Float64Array(4), rng));
      // each swap keeps |q| = 1 and leaves two components as they were
      for (const [i, j] of [
        [0, 1],
        [1, 2],
        [2, 3],
        [0, 3],
        [1, 3],
        [0, 2],
      ] as const) {
        const p = q.slice();
        p[i] = q[j]!;
        p[j] = q[i]!;
        for (const x of [q, p]) {
          const at = input(x, [0.001, 0, 0], id, [0, 0, 0, 0]);
          sameBits(ctrl.torque(new Float64Array(3), at, 2), fresh().torque(new Float64Array(3), at, 2), `torque ${k} swap ${i}${j}`);
        }
      }
    }
  });

  it('at q_e = identity the family minimum is 0 and the gap is V_q − 0', () => {
    const ctrl = fresh();
    const qRef = [0.1, -0.2, 0.3, Math.sqrt(1 - 0.14)];
    const at = input(qRef, [0, 0, 0], qRef, [0, 0, 0, 0]);
    for (const logic of [1, 2, 3]) {
      ctrl.jumpGuard(at, logic);
      const d = ctrl.diagnostics(diag(), at, logic);
      expect(d.potentialMin).toBeCloseTo(0, 12);
      expect(d.gap).toBeCloseTo(d.potential, 12);
      expect(d.potential).toBeGreaterThanOrEqual(0);
    }
  });
});
