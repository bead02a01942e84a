/**
 * Gains from a natural frequency and damping ratio, and the torque they imply.
 *
 * Small-angle matching (derived, methods §2): ε ≈ (θ/2)u, so τ = −k_p ε − k_d ω gives
 * J θ̈ = −(k_p/2)θ − k_d θ̇ ⇒ k_p = 2Jω_n², k_d = 2ζω_n J; the eigenaxis closed loop
 * ω̇ = −kε − cω gives k = 2ω_n², c = 2ζω_n (methods §2c). J is a 3×3 inertia, so a scalar gain
 * cannot give every axis the same bandwidth: we use the largest principal moment, so every axis is
 * at least as fast and as damped as asked (common practice, no source).
 * Synergistic potentials: near I the warp vanishes to first order and b_q ≈ 2Ā·(θu), so the
 * stiffness is 2k_R Ā; k_R = J_max ω_n² / (2 λ_min(Ā)) keeps every axis at least at ω_n (derived
 * here, no source).
 */
import type { Mat3 } from '../math/mat3';
import { symmetricEigen3 } from '../math/mat3';
import { qFromAxisAngle } from '../math/rotation';
import type { WarpFamily } from './potential';
import { evaluateFamily, makeFamilyWorkspace, memberGradient } from './potential';

export interface BandwidthGains {
  omegaN: number;
  zeta: number;
  /** Inertia used for the scalar gains: the largest principal moment of J⊥, kg·m². */
  inertiaRef: number;
  /** Quaternion PD / hysteretic stiffness, N·m (per unit ε). */
  kp: number;
  /** Damping, N·m·s. */
  kd: number;
  /** Eigenaxis law gains (inertia-normalised): k = 2ω_n² (1/s²), c = 2ζω_n (1/s). */
  kEigen: number;
  cEigen: number;
  /** The error angle the torque figure is for, rad. */
  errorAngleRad: number;
  /** |k_p ε| = k_p sin(θ/2) at that error, at rest: the torque these gains ask for, N·m. */
  torqueAtErrorNm: number;
}

/** Gains for the quaternion laws (PD, sign-switch, hysteretic, eigenaxis). */
export function gainsFromBandwidth(Jperp: Mat3, omegaN: number, zeta: number, errorAngleRad = Math.PI / 2): BandwidthGains {
  const jRef = symmetricEigen3(Jperp).values[2]!;
  const kp = 2 * jRef * omegaN * omegaN;
  const kd = 2 * zeta * omegaN * jRef;
  return {
    omegaN,
    zeta,
    inertiaRef: jRef,
    kp,
    kd,
    kEigen: 2 * omegaN * omegaN,
    cEigen: 2 * zeta * omegaN,
    errorAngleRad,
    torqueAtErrorNm: kp * Math.abs(Math.sin(0.5 * errorAngleRad)),
  };
}

export interface SynergisticBandwidthGains {
  omegaN: number;
  zeta: number;
  inertiaRef: number;
  /** Potential gain k_R, N·m per unit of V. */
  kR: number;
  /** Rate gain K_ω (scalar), N·m·s. */
  kOmega: number;
  errorAngleRad: number;
  /** Largest k_R‖b_p‖ at rest for that error angle about the principal axes of A, over all members, N·m. */
  torqueAtErrorNm: number;
}

export function synergisticGainsFromBandwidth(
  Jperp: Mat3,
  fam: WarpFamily,
  omegaN: number,
  zeta: number,
  errorAngleRad = Math.PI / 2,
): SynergisticBandwidthGains {
  const jRef = symmetricEigen3(Jperp).values[2]!;
  // λ_min(Ā) = ½(tr A − λ_max(A))
  const abarMin = 0.5 * (fam.traceA - fam.eigenvalues[2]!);
  const kR = (jRef * omegaN * omegaN) / (2 * abarMin);
  const kOmega = 2 * zeta * omegaN * jRef;
  const ws = makeFamilyWorkspace(fam);
  const q = new Float64Array(4),
    b = new Float64Array(3),
    ax = new Float64Array(3);
  let worst = 0;
  for (let i = 0; i < 3; i++) {
    ax[0] = fam.eigenvectors[3 * i]!;
    ax[1] = fam.eigenvectors[3 * i + 1]!;
    ax[2] = fam.eigenvectors[3 * i + 2]!;
    qFromAxisAngle(q, ax, errorAngleRad);
    evaluateFamily(ws, fam, q);
    for (let p = 0; p < fam.members; p++) {
      memberGradient(b, fam, ws, p);
      worst = Math.max(worst, Math.hypot(b[0]!, b[1]!, b[2]!));
    }
  }
  return { omegaN, zeta, inertiaRef: jRef, kR, kOmega, errorAngleRad, torqueAtErrorNm: kR * worst };
}
