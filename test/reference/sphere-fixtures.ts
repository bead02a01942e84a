/**
 * Helpers for the pointing-law tests (sphere-*.test.ts): starts built from a direction on S², and
 * a controller wrapper that feeds the law a perturbed measurement while runClosedLoop (unchanged)
 * records the true state. Attitudes here are built with the npm `quaternion` package (an outside
 * library, Hamilton product, scalar first), not with the engine's rotation.ts.
 */
import Quaternion from 'quaternion';
import type { AttitudeController, ControlDiagnostics, ControlInput } from '../../app/engine/control/types';
import type { Rng } from '../../app/engine/math/prng';

export type V3 = [number, number, number];

/** Uniform direction on S²: a normalised 3-D Gaussian (Muller, CACM 2(4), 1959). */
export function uniformDirection(rng: Rng): V3 {
  for (;;) {
    const v: V3 = [rng.normal(), rng.normal(), rng.normal()];
    const n = Math.hypot(...v);
    if (n > 1e-9) return [v[0] / n, v[1] / n, v[2] / n];
  }
}

/**
 * An attitude q (scalar-last) with R(q)ᵀ r = y0 for the inertial target r = R(q_d) b and the
 * reference q_d = identity, i.e. R(q) y0 = b, then turned by `roll` about b (inertial):
 * q = twist(b, roll) ⊗ fromVectors(y0 → b).
 */
export function attitudeSeeing(y0: V3, b: V3, roll: number): [number, number, number, number] {
  const qs = Quaternion.fromVectors(y0, b);
  const q = Quaternion.fromAxisAngle(b, roll).mul(qs).normalize();
  return [q.x, q.y, q.z, q.w];
}

/** The target direction in body axes, R(q)ᵀ b (reference = identity), computed with `quaternion`. */
export function seenDirection(q: ArrayLike<number>, b: V3): V3 {
  const v = new Quaternion(q[3]!, q[0]!, q[1]!, q[2]!).conjugate().rotateVector(b) as number[];
  return [v[0]!, v[1]!, v[2]!];
}

export function angle(a: ArrayLike<number>, b: ArrayLike<number>): number {
  const c = [a[1]! * b[2]! - a[2]! * b[1]!, a[2]! * b[0]! - a[0]! * b[2]!, a[0]! * b[1]! - a[1]! * b[0]!];
  return Math.atan2(Math.hypot(c[0]!, c[1]!, c[2]!), a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!);
}

/**
 * Wrap a law so that torque, jump guard and logic see `perturb(input)`; diagnostics (which the
 * closed loop evaluates on the TRUE state for the trace) pass through unchanged.
 */
export function withMeasurement(
  law: AttitudeController,
  perturb: (qOut: Float64Array, input: ControlInput) => void,
): AttitudeController & { perturbed: number } {
  const q = new Float64Array(4);
  const inp: ControlInput = {
    q,
    omega: new Float64Array(3),
    hWheel: new Float64Array(0),
    qRef: new Float64Array(4),
    omegaRef: new Float64Array(3),
    omegaDotRef: new Float64Array(3),
  };
  const view = (input: ControlInput): ControlInput => {
    perturb(q, input);
    inp.omega = input.omega;
    inp.hWheel = input.hWheel;
    inp.qRef = input.qRef;
    inp.omegaRef = input.omegaRef;
    inp.omegaDotRef = input.omegaDotRef;
    return inp;
  };
  const w = {
    kind: law.kind,
    label: law.label,
    jumpDecrease: law.jumpDecrease,
    certificate: law.certificate,
    perturbed: 0,
    initialLogic: (i: ControlInput) => law.initialLogic(view(i)),
    jumpGuard: (i: ControlInput, l: number) => law.jumpGuard(view(i), l),
    updateLogic: (i: ControlInput, l: number) => law.updateLogic(view(i), l),
    torque: (out: Float64Array, i: ControlInput, l: number) => law.torque(out, view(i), l),
    diagnostics: (out: ControlDiagnostics, i: ControlInput, l: number) => law.diagnostics(out, i, l),
  };
  return w;
}
