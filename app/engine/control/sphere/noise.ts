/**
 * Worst-case bounded measurement noise for pointing laws: the S² analogue of the reflection model
 * of sim/sensors.ts (the adversarial mechanism of Mayhew, Sanfelice & Teel, IEEE TAC 56(11), 2011,
 * and IEEE TAC 58(5), 2013, that holds a memoryless or smooth law at its undesired critical point).
 *
 * Antipodal stall. Let y = R(q_e)ᵀ b be the TRUE target direction in body axes (potential.ts) and
 * ψ = ∠(y, −b) = π − φ its distance from the antipode. Whenever ψ ≤ ē the measured attitude is
 *   q̃ = q ⊗ δq,   δq = the shortest rotation (body axes) carrying −b onto y, angle ψ,
 * so that the law's measured direction is ỹ = R(δq)ᵀ y = −b exactly.
 *  - Bounded: q̃ differs from q by a rotation of angle ψ ≤ ē, so the noise has size ≤ ē both as an
 *    attitude error on SO(3) and as a direction error on S² (∠(ỹ, y) = ψ).
 *  - It stalls the smooth law: ∇V(ỹ) = ỹ × b = 0, so the reduced PD commands only τ_ff − K_d ω_e.
 *    In regulation from rest the command is zero and the body never leaves the ē-cap around the
 *    antipode; with some initial rate it only loses energy while inside the cap (the smooth law
 *    believes it sits on its equilibrium at −b).
 *  - It does not stall a synergistic law: its active V_q has no critical point at −b (the
 *    undesired one sits θ* away, critical.ts), so ∇V_q(−b) ≠ 0 pushes the body out of the cap;
 *    once outside, the measurements are true and the certificate's argument applies.
 * The lead wires this into the sensors; until then tests apply it inside a controller wrapper.
 * No allocation (module scratch).
 */
import { qConjMultiply, qFromAxisAngle, qMultiply, qNormalize, qRotateInverse } from '../../math/rotation';

const qe = new Float64Array(4);
const dq = new Float64Array(4);
const y = new Float64Array(3);
const axisScratch = new Float64Array(3);
const qt = new Float64Array(4);
const bUnit = new Float64Array(3);

/**
 * Write the stalled measurement into qOut when the true pointing error (of qTrue against qRef for
 * the body axis b) is within ēRad of the antipode; otherwise copy qMeasured (the measurement so
 * far, e.g. with random noise) into qOut. Returns true when the stall was applied. qOut may alias
 * qMeasured.
 */
export function applyAntipodalStall(
  qOut: Float64Array,
  qMeasured: ArrayLike<number>,
  qTrue: ArrayLike<number>,
  qRef: ArrayLike<number>,
  axis: ArrayLike<number>,
  ebarRad: number,
): boolean {
  const bn = Math.hypot(axis[0]!, axis[1]!, axis[2]!);
  const bx = axis[0]! / bn,
    by = axis[1]! / bn,
    bz = axis[2]! / bn;
  bUnit[0] = bx;
  bUnit[1] = by;
  bUnit[2] = bz;
  qConjMultiply(qe, qRef, qTrue);
  qRotateInverse(y, qe, bUnit);
  // ψ = ∠(y, −b); rotation axis (−b) × y
  const cx = -(by * y[2]! - bz * y[1]!),
    cy = -(bz * y[0]! - bx * y[2]!),
    cz = -(bx * y[1]! - by * y[0]!);
  const s = Math.hypot(cx, cy, cz);
  const psi = Math.atan2(s, -(bx * y[0]! + by * y[1]! + bz * y[2]!));
  if (!(ebarRad > 0) || psi > ebarRad) {
    if (qOut !== qMeasured) for (let i = 0; i < 4; i++) qOut[i] = qMeasured[i]!;
    return false;
  }
  if (s > 0) {
    axisScratch[0] = cx;
    axisScratch[1] = cy;
    axisScratch[2] = cz;
    qFromAxisAngle(dq, axisScratch, psi);
  } else {
    dq[0] = dq[1] = dq[2] = 0;
    dq[3] = 1;
  }
  qMultiply(qt, qTrue, dq);
  qNormalize(qOut, qt);
  return true;
}
