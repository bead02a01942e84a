/**
 * Tracking error and feedforward shared by every law (methods §1.1, §3, §6).
 *
 *   q_e = q_d* ⊗ q,  ω_r = R_eᵀω_d,  ω_e = ω − ω_r,   Ṙ_e = R_e ω_e^×,
 *   d/dt(ω_r) = R_eᵀω̇_d − ω_e × ω_r.
 * Plant (gyrostat, methods §6): J⊥ω̇ = −ω × (J⊥ω + Gh) + τ, τ the body control torque.
 *
 * Two feedforward forms:
 *  - passive (Mayhew, Sanfelice & Teel, IEEE TAC 56(11):2555–2566, 2011, tracking form as in
 *    Markley & Crassidis, Fundamentals of Spacecraft Attitude Determination and Control, 2014,
 *    Ex. 7.8, extended by the wheel term): τ_ff = J R_eᵀω̇_d + ω_r × (Jω_r + Gh). With it
 *    ω_eᵀ(J ω̇_e) = ω_eᵀ(τ − τ_ff) exactly, because ω_eᵀ(ω_r × Jω_e) = ω_eᵀJ(ω_e × ω_r) and
 *    ω_eᵀ(ω_e × Gh) = 0, so every energy argument of the regulation law carries over. It vanishes
 *    in regulation: the laws keep their textbook regulation form.
 *  - cancelling (computed torque, used by the eigenaxis law, Wie, Weiss & Arapostathis, JGCD
 *    12(3):375–380, 1989): τ_ff = ω × (Jω + Gh) + J R_eᵀω̇_d − J(ω_e × ω_r), giving J ω̇_e = τ − τ_ff.
 */
import type { Vec3 } from '../math/mat3';
import { m3MulVec, v3Cross } from '../math/mat3';
import { qConjMultiply, qRotateInverse } from '../math/rotation';
import type { ControlInput, PlantModel } from './types';

export interface TrackingState {
  /** q_e = q_d* ⊗ q, [x, y, z, w]. */
  readonly qe: Float64Array;
  /** ω_r = R_eᵀω_d (body axes). */
  readonly omegaR: Float64Array;
  /** ω_e = ω − ω_r. */
  readonly omegaE: Float64Array;
  /** G h, body axes. */
  readonly gh: Float64Array;
  /** R_eᵀω̇_d. */
  readonly accelR: Float64Array;
  /** scratch */
  readonly t1: Float64Array;
  readonly t2: Float64Array;
}

export function makeTrackingState(): TrackingState {
  return {
    qe: new Float64Array(4),
    omegaR: new Float64Array(3),
    omegaE: new Float64Array(3),
    gh: new Float64Array(3),
    accelR: new Float64Array(3),
    t1: new Float64Array(3),
    t2: new Float64Array(3),
  };
}

/** Fill the error state from a measurement and reference. Returns st. */
export function computeTracking(st: TrackingState, plant: PlantModel, input: ControlInput): TrackingState {
  qConjMultiply(st.qe, input.qRef, input.q);
  // R_eᵀ v = q_e* ⊗ v ⊗ q_e
  qRotateInverse(st.omegaR, st.qe, input.omegaRef);
  qRotateInverse(st.accelR, st.qe, input.omegaDotRef);
  const w = input.omega;
  st.omegaE[0] = w[0]! - st.omegaR[0]!;
  st.omegaE[1] = w[1]! - st.omegaR[1]!;
  st.omegaE[2] = w[2]! - st.omegaR[2]!;
  let gx = 0,
    gy = 0,
    gz = 0;
  const ax = plant.axes,
    h = input.hWheel;
  for (let i = 0; i < plant.nWheels; i++) {
    gx += ax[3 * i]! * h[i]!;
    gy += ax[3 * i + 1]! * h[i]!;
    gz += ax[3 * i + 2]! * h[i]!;
  }
  st.gh[0] = gx;
  st.gh[1] = gy;
  st.gh[2] = gz;
  return st;
}

/** out = J R_eᵀω̇_d + ω_r × (Jω_r + Gh)  (passive tracking feedforward). */
export function feedforwardPassive(out: Vec3, st: TrackingState, plant: PlantModel): Vec3 {
  const J = plant.Jperp;
  m3MulVec(st.t1, J, st.omegaR);
  st.t1[0]! += st.gh[0]!;
  st.t1[1]! += st.gh[1]!;
  st.t1[2]! += st.gh[2]!;
  v3Cross(st.t2, st.omegaR, st.t1);
  m3MulVec(st.t1, J, st.accelR);
  out[0] = st.t1[0]! + st.t2[0]!;
  out[1] = st.t1[1]! + st.t2[1]!;
  out[2] = st.t1[2]! + st.t2[2]!;
  return out;
}

/** out = ω × (Jω + Gh) + J(R_eᵀω̇_d − ω_e × ω_r)  (full gyroscopic cancellation). */
export function feedforwardCancel(out: Vec3, st: TrackingState, plant: PlantModel, omega: ArrayLike<number>): Vec3 {
  const J = plant.Jperp;
  m3MulVec(st.t1, J, omega);
  st.t1[0]! += st.gh[0]!;
  st.t1[1]! += st.gh[1]!;
  st.t1[2]! += st.gh[2]!;
  v3Cross(st.t2, omega, st.t1);
  const ox = st.t2[0]!,
    oy = st.t2[1]!,
    oz = st.t2[2]!;
  v3Cross(st.t1, st.omegaE, st.omegaR);
  st.t1[0] = st.accelR[0]! - st.t1[0]!;
  st.t1[1] = st.accelR[1]! - st.t1[1]!;
  st.t1[2] = st.accelR[2]! - st.t1[2]!;
  m3MulVec(st.t2, J, st.t1);
  out[0] = ox + st.t2[0]!;
  out[1] = oy + st.t2[1]!;
  out[2] = oz + st.t2[2]!;
  return out;
}

/** ½ ω_eᵀ J ω_e. */
export function errorKineticEnergy(st: TrackingState, plant: PlantModel): number {
  m3MulVec(st.t1, plant.Jperp, st.omegaE);
  const e = st.omegaE;
  return 0.5 * (e[0]! * st.t1[0]! + e[1]! * st.t1[1]! + e[2]! * st.t1[2]!);
}

/** out −= K v (K column-major 3×3), using st.t1 as scratch. */
export function subtractMatVec(out: Vec3, st: TrackingState, K: ArrayLike<number>, v: ArrayLike<number>): Vec3 {
  m3MulVec(st.t1, K, v);
  out[0]! -= st.t1[0]!;
  out[1]! -= st.t1[1]!;
  out[2]! -= st.t1[2]!;
  return out;
}

/** sgn with sgn(0) = +1 (methods §2b). */
export function sgnPos(x: number): number {
  return x < 0 ? -1 : 1;
}
