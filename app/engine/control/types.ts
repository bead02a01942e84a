/**
 * One interface for every attitude controller, smooth or hybrid.
 *
 * Conventions (rotation.ts): q = qInertialFromBody stored [x, y, z, w]; body rates in body axes;
 * attitude error q_e = q_d* ⊗ q, R_e = R(q_e), ω_e = ω − R_eᵀω_d (methods §1.1). Every law is in
 * tracking form: in regulation (ω_d = ω̇_d = 0) the feedforward vanishes and the textbook
 * regulation law remains.
 *
 * A controller owns at most one number of hybrid logic (h ∈ {−1, 1}, member index q ∈ {1..M},
 * 0 for laws without logic). The caller (closed loop / simulator) stores it with the plant state:
 *   - at the start of a run call `initialLogic`; at the start of each maneuver segment call
 *     `beginSegment` when the law has it (it latches per-segment data such as the eigenaxis law's
 *     saturation limits; `initialLogic` latches too, a run start being a segment start);
 *   - `jumpGuard(input, logic) ≥ 0` ⇔ (state, logic) is in the jump set D (closed sets, so C and D
 *     overlap on the boundary; Goebel, Sanfelice & Teel, IEEE CSM 29(2), 2009). In the ideal
 *     continuous mode the simulator locates the zero crossing of the guard;
 *   - at a sample or located crossing call `updateLogic`; it returns `why` ≠ null exactly when the
 *     logic changed. On a boundary where the jump map is the identity it may return the same logic
 *     with why = null even though the guard is ≥ 0: the simulator must then keep flowing.
 * `torque` and `diagnostics` write into `out` and allocate nothing.
 */
import type { Mat3, Vec3 } from '../math/mat3';
import type { Quat } from '../math/rotation';
import type { CertificateResult } from './certificate';
import type { SphereCertificateResult } from './sphere/certificate';

import type { LawId } from './params';

/** How a law's logic value reads: none (0), a sign h ∈ {−1, 1}, or a member index q ∈ {1..M}. */
export type LogicKind = 'none' | 'sign' | 'index';

/**
 * Pointing-only (reduced-attitude) laws of control/sphere/: one body axis on one inertial
 * direction, roll free.
 */
export type ReducedControllerKind = 'reduced-pd' | 'reduced-synergistic';

/** What the controller knows of the plant. */
export interface PlantModel {
  /** J⊥ = J_tot − G J_s Gᵀ, kg·m² (methods §6), column-major 3×3. */
  Jperp: Mat3;
  nWheels: number;
  /** Unit wheel spin axes in body axes, 3 per wheel (G's columns). */
  axes: Float64Array;
}

/** What a controller is designed for: the plant model it knows, and the torque the wheels can give along body x, y, z. */
export interface DesignModel extends PlantModel {
  /** Capacity of the wheel torque envelope along body x, y and z, N·m (the eigenaxis law's torque limit); absent: no limit in the law. */
  bodyAxisTorqueNm?: Vec3;
}

export interface ControlInput {
  /** Measured attitude qInertialFromBody. */
  q: Quat;
  /** Measured body rate, body axes, rad/s. */
  omega: Vec3;
  /** Wheel axial (absolute) momenta h_i, N·m·s, nWheels values: the body's gyroscopic term uses G h. */
  hWheel: Float64Array;
  /** Reference attitude qInertialFromReference (the target in regulation). */
  qRef: Quat;
  /** Reference body rate, in the reference frame's axes, rad/s. */
  omegaRef: Vec3;
  /** Reference body acceleration, reference axes, rad/s². */
  omegaDotRef: Vec3;
  /**
   * The body axis the active target points (unit, body axes) when that target is pointing-only
   * (roll free); absent or zero for a full-attitude target. Pointing laws take their axis from it.
   */
  pointingAxis?: Vec3;
}

export interface ControlDiagnostics {
  /** Shortest rotation angle of q_e, rad. */
  errorAngle: number;
  /** Scalar part η of q_e (sign as computed, not made positive). */
  eta: number;
  /** Active potential (V_q, or 2(1 − hη) for quaternion laws); unscaled by the gain. */
  potential: number;
  /** Minimum over the law's family of potentials (= potential for a family of one). */
  potentialMin: number;
  /** Synergy gap μ = potential − potentialMin. */
  gap: number;
  /** The law's Lyapunov value W (see each law for its definition and units). */
  lyapunov: number;
}

export interface AttitudeController {
  readonly kind: LawId | ReducedControllerKind;
  readonly label: string;
  /**
   * The drop of W that theory guarantees at each jump: 4k_pδ (hysteretic), k_Rδ (synergistic),
   * 0 for laws without logic.
   */
  readonly jumpDecrease: number;
  /** The synergistic law's certificate (null for other laws). */
  readonly certificate: CertificateResult | null;
  /** The synergistic pointing law's S² certificate (absent or null for other laws). */
  readonly sphereCertificate?: SphereCertificateResult | null;
  initialLogic(input: ControlInput): number;
  /** Re-latch per-segment data at a segment start (laws without such data omit it). */
  beginSegment?(input: ControlInput): void;
  jumpGuard(input: ControlInput, logic: number): number;
  updateLogic(input: ControlInput, logic: number): { logic: number; why: string | null };
  /** Body torque request, N·m, written into out. */
  torque(out: Vec3, input: ControlInput, logic: number): Vec3;
  diagnostics(out: ControlDiagnostics, input: ControlInput, logic: number): ControlDiagnostics;
  /**
   * Optional shortcut: `diagnostics` of the input the last `torque` call saw, from the tracking
   * error that call formed (not formed again). The caller uses it only when the input's values are
   * unchanged since; same bits as `diagnostics(out, thatInput, logic)`.
   */
  diagnosticsOfLastTorque?(out: ControlDiagnostics, logic: number): ControlDiagnostics;
  /**
   * Optional shortcut for a sampled loop: the caller promises that `input`'s values stay unchanged
   * until the law's next `torque` call on it, so the law may form its tracking error from it once
   * here and use it for the jump guard, the logic update and the torque of this sample (same bits
   * as forming it in each). A call on another input in between forms that one as usual.
   */
  prepareSample?(input: ControlInput): void;
}

export function makeDiagnostics(): ControlDiagnostics {
  return { errorAngle: 0, eta: 1, potential: 0, potentialMin: 0, gap: 0, lyapunov: 0 };
}
