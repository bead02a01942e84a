/**
 * Pointing-only (reduced-attitude) laws: body axis b on the reference's image of b, roll free.
 *
 * Both laws read y = R(q_e)ᵀ b (potential.ts: the target direction in body axes, independent of
 * the reference's roll) and use the passive tracking feedforward of the full laws (../tracking.ts:
 * τ_ff = J R_eᵀω̇_d + ω_r × (Jω_r + Gh), gyroscopic and wheel terms included), so a moving
 * reference direction is tracked and the energy argument is unchanged:
 *   smooth PD:    τ = τ_ff − k_p ∇V(y) − K_d ω_e,     ∇V = y × b,
 *                 W = k_p V + ½ω_eᵀJ⊥ω_e,  Ẇ = −ω_eᵀK_dω_e (standard PD on the sphere; with V's
 *                 critical point at −b it is only almost globally convergent: Bhat & Bernstein,
 *                 Systems & Control Letters 39(1):63–70, 2000, obstruction holds on S² as on SO(3));
 *   synergistic:  logic q ∈ {1..M}, τ = τ_ff − k_p ∇V_q(y) − K_d ω_e, flow set μ ≤ δ, jump set
 *                 μ ≥ δ, q⁺ ∈ argmin_p V_p(y) (lowest index among ties), μ = V_q − min_p V_p
 *                 (Mayhew & Teel's synergistic hybrid feedback on the 2-sphere, Automatica 2013
 *                 [venue from memory]; warped family of potential.ts);
 *                 W = k_p V_q + ½ω_eᵀJ⊥ω_e, Ẇ = −ω_eᵀK_dω_e on flows, a jump lowers W by k_pμ ≥ k_pδ.
 * Roll: every gradient here is ⊥ y (a cross product with y). The potentials depend on y alone and
 * a rotation about y leaves y unchanged, so the potential term never acts on the roll about the
 * line of sight, and at the target (y = b) there is no stiffness about b (∇V = y × b is also ⊥ b
 * everywhere). The damping K_d acts on the whole ω_e, roll-rate error included: the roll rate
 * relative to the reference decays, the roll angle settles wherever the transient leaves it (a
 * neutral direction: the closed loop converges to the circle {y = b, ω_e = 0}, not to a point).
 *
 * The pointed axis: the law's own b, unless the input carries the active target's axis
 * (ControlInput.pointingAxis, non-zero): then the law retargets to it. The synergistic family
 * follows: its warp directions are those it was built with, turned by the shortest rotation that
 * carries the build axis onto the new one (computed from the build directions each time, so the
 * family for an axis never depends on the history). A rotation R of (b, u_p) gives V'_p(Ry) =
 * V_p(y), so critical points, gaps and the certificate are unchanged (derived here; the potentials
 * involve only inner products, which rotations keep).
 *
 * diagnostics(): errorAngle = the pointing error φ = ∠(b, y); eta = cos(φ/2), the scalar part of
 * the swing rotation carrying y onto b (V = 1 − cos φ = 2(1 − eta²)), so that, as for the full
 * laws, errorAngle = 2 arccos(eta) and eta = 0 at the antipode; potential = V (PD) or V_q,
 * potentialMin = min_p V_p, gap = μ, lyapunov = W. `torque` and `diagnostics` allocate nothing.
 */
import type { Mat3, Vec3 } from '../../math/mat3';
import { symmetricEigen3 } from '../../math/mat3';
import { qRotateInverse } from '../../math/rotation';
import type { TrackingState } from '../tracking';
import { computeTracking, errorKineticEnergy, feedforwardPassive, makeTrackingState, subtractMatVec } from '../tracking';
import type { AttitudeController, ControlDiagnostics, ControlInput, PlantModel, ReducedControllerKind } from '../types';
import type { SphereCertificateResult } from './certificate';
import type { SphereFamily, SphereWorkspace } from './potential';
import {
  evaluateSphereFamily,
  makeSphereWorkspace,
  pointingAngle,
  pointingGradient,
  pointingPotential,
  sphereMemberGradient,
} from './potential';

abstract class ReducedLawBase implements AttitudeController {
  abstract readonly kind: ReducedControllerKind;
  abstract readonly jumpDecrease: number;
  /** The SO(3) certificate slot of the interface: unused by pointing laws (see sphereCertificate). */
  readonly certificate = null;
  /** The pointed body axis b (unit, body axes). */
  readonly axis: Float64Array;
  protected readonly st: TrackingState = makeTrackingState();
  /** y = R(q_e)ᵀ b at the last evaluation. */
  protected readonly y = new Float64Array(3);
  protected readonly grad = new Float64Array(3);

  constructor(
    readonly label: string,
    protected readonly plant: PlantModel,
    axis: ArrayLike<number>,
    /** Potential gain k_p, N·m per unit of V. */
    readonly kp: number,
    /** Rate gain K_d (column-major 3×3), N·m·s. */
    readonly Kd: Mat3,
  ) {
    const n = Math.hypot(axis[0]!, axis[1]!, axis[2]!);
    this.axis = Float64Array.of(axis[0]! / n, axis[1]! / n, axis[2]! / n);
  }

  /** The last non-zero input axis retargeted to (raw, as given). */
  private readonly inputAxis = new Float64Array(3);

  /** Fill the tracking state and y from a measurement (retargeting to the input's axis first). */
  protected pointing(input: ControlInput): Float64Array {
    const a = input.pointingAxis;
    if (
      a &&
      (a[0] !== 0 || a[1] !== 0 || a[2] !== 0) &&
      (a[0] !== this.inputAxis[0] || a[1] !== this.inputAxis[1] || a[2] !== this.inputAxis[2])
    ) {
      this.inputAxis[0] = a[0]!;
      this.inputAxis[1] = a[1]!;
      this.inputAxis[2] = a[2]!;
      const n = Math.hypot(a[0]!, a[1]!, a[2]!);
      this.axis[0] = a[0]! / n;
      this.axis[1] = a[1]! / n;
      this.axis[2] = a[2]! / n;
      this.retarget();
    }
    computeTracking(this.st, this.plant, input);
    return qRotateInverse(this.y, this.st.qe, this.axis);
  }

  /** Called after `axis` changed (the family follows it in the synergistic law). */
  protected retarget(): void {}

  /** ∇ of the active potential at this.y into this.grad (after `pointing`). */
  protected abstract activeGradient(logic: number): Float64Array;
  /** Active potential, family minimum (after `pointing`). */
  protected abstract potentials(out: ControlDiagnostics, logic: number): void;

  abstract initialLogic(input: ControlInput): number;
  abstract jumpGuard(input: ControlInput, logic: number): number;
  abstract updateLogic(input: ControlInput, logic: number): { logic: number; why: string | null };

  torque(out: Vec3, input: ControlInput, logic: number): Vec3 {
    this.pointing(input);
    const g = this.activeGradient(logic);
    feedforwardPassive(out, this.st, this.plant);
    out[0]! -= this.kp * g[0]!;
    out[1]! -= this.kp * g[1]!;
    out[2]! -= this.kp * g[2]!;
    return subtractMatVec(out, this.st, this.Kd, this.st.omegaE);
  }

  diagnostics(out: ControlDiagnostics, input: ControlInput, logic: number): ControlDiagnostics {
    const y = this.pointing(input);
    const phi = pointingAngle(this.axis, y);
    out.errorAngle = phi;
    out.eta = Math.cos(0.5 * phi);
    this.potentials(out, logic);
    out.gap = out.potential - out.potentialMin;
    out.lyapunov = this.kp * out.potential + errorKineticEnergy(this.st, this.plant);
    return out;
  }
}

/** Smooth reduced PD, τ = τ_ff − k_p (y × b) − K_d ω_e. Logic unused (0). */
export class ReducedPd extends ReducedLawBase {
  readonly kind = 'reduced-pd' as const;
  readonly jumpDecrease = 0;

  protected activeGradient(): Float64Array {
    return pointingGradient(this.grad, this.axis, this.y);
  }
  protected potentials(out: ControlDiagnostics): void {
    out.potential = pointingPotential(this.axis, this.y);
    out.potentialMin = out.potential;
  }
  initialLogic(): number {
    return 0;
  }
  jumpGuard(): number {
    return -1;
  }
  updateLogic(): { logic: number; why: string | null } {
    return { logic: 0, why: null };
  }
}

/** Synergistic reduced hybrid law over a warped family (potential.ts), logic q ∈ {1..M}. */
export class ReducedSynergistic extends ReducedLawBase {
  readonly kind = 'reduced-synergistic' as const;
  readonly jumpDecrease: number;
  private readonly ws: SphereWorkspace;
  /** The build axis and warp directions (the family for any other axis is their rotation). */
  private readonly axis0: Float64Array;
  private readonly dirs0: Float64Array;

  constructor(
    label: string,
    plant: PlantModel,
    readonly family: SphereFamily,
    kp: number,
    Kd: Mat3,
    /** Hysteresis δ on the gap μ (units of V). */
    readonly delta: number,
    /** Fixed 1-based q(0), or 0 for argmin at the start. */
    readonly startLogic: number,
    /** The S² certificate the family was built with (null when built without one). */
    readonly sphereCertificate: SphereCertificateResult | null,
  ) {
    super(label, plant, family.axis, kp, Kd);
    this.ws = makeSphereWorkspace(family);
    this.jumpDecrease = kp * delta;
    this.axis0 = Float64Array.from(family.axis);
    this.dirs0 = Float64Array.from(family.directions);
  }

  protected override retarget(): void {
    const f = this.family;
    f.axis.set(this.axis);
    for (let p = 0; p < f.members; p++) rotateShortest(f.directions, 3 * p, this.axis0, this.axis, this.dirs0);
  }

  private evaluate(input: ControlInput): SphereWorkspace {
    return evaluateSphereFamily(this.ws, this.family, this.pointing(input));
  }
  private valid(logic: number): boolean {
    return Number.isInteger(logic) && logic >= 1 && logic <= this.family.members;
  }
  /** Active 0-based member (an invalid logic value acts as the argmin, as a jump would set it). */
  private member(logic: number): number {
    return this.valid(logic) ? logic - 1 : this.ws.minIndex;
  }

  protected activeGradient(logic: number): Float64Array {
    const ws = evaluateSphereFamily(this.ws, this.family, this.y);
    return sphereMemberGradient(this.grad, this.family, ws, this.member(logic));
  }
  protected potentials(out: ControlDiagnostics, logic: number): void {
    const ws = evaluateSphereFamily(this.ws, this.family, this.y);
    out.potential = ws.V[this.member(logic)]!;
    out.potentialMin = ws.minValue;
  }

  initialLogic(input: ControlInput): number {
    if (this.valid(this.startLogic)) return this.startLogic;
    return this.evaluate(input).minIndex + 1;
  }

  /** g = μ(y, q) − δ ≥ 0 ⇔ jump set. */
  jumpGuard(input: ControlInput, logic: number): number {
    if (!this.valid(logic)) return 1;
    const ws = this.evaluate(input);
    return ws.V[logic - 1]! - ws.minValue - this.delta;
  }

  updateLogic(input: ControlInput, logic: number): { logic: number; why: string | null } {
    const ws = this.evaluate(input);
    const best = ws.minIndex + 1;
    if (!this.valid(logic)) return { logic: best, why: `logic reset to q = ${best} (invalid value ${logic})` };
    const mu = ws.V[logic - 1]! - ws.minValue;
    if (mu >= this.delta && best !== logic)
      return {
        logic: best,
        why: `pointing synergy gap ${mu.toFixed(4)} ≥ δ = ${this.delta}: V_${logic} = ${ws.V[logic - 1]!.toFixed(4)} → V_${best} = ${ws.minValue.toFixed(4)}`,
      };
    return { logic, why: null };
  }
}

/**
 * out[o..o+2] = R v[o..o+2], R the shortest rotation carrying unit `from` onto unit `to`:
 * R v = c v + (w × v) + (w·v)/(1 + c) w, w = from × to, c = from·to (Rodrigues' formula with
 * sin φ = |w|, cos φ = c; standard, no source). For to = −from any rotation by π about an axis ⊥
 * from will do: the one about the body axis least aligned with `from`, made ⊥ it.
 */
function rotateShortest(out: Float64Array, o: number, from: Float64Array, to: Float64Array, v: Float64Array): void {
  const fx = from[0]!,
    fy = from[1]!,
    fz = from[2]!;
  const vx = v[o]!,
    vy = v[o + 1]!,
    vz = v[o + 2]!;
  const c = fx * to[0]! + fy * to[1]! + fz * to[2]!;
  if (c > -1 + 1e-12) {
    const wx = fy * to[2]! - fz * to[1]!,
      wy = fz * to[0]! - fx * to[2]!,
      wz = fx * to[1]! - fy * to[0]!;
    const k = (wx * vx + wy * vy + wz * vz) / (1 + c);
    out[o] = c * vx + (wy * vz - wz * vy) + k * wx;
    out[o + 1] = c * vy + (wz * vx - wx * vz) + k * wy;
    out[o + 2] = c * vz + (wx * vy - wy * vx) + k * wz;
    return;
  }
  const ax = Math.abs(fx),
    ay = Math.abs(fy),
    az = Math.abs(fz);
  let nx = ax <= ay && ax <= az ? 1 : 0,
    ny = nx === 0 && ay <= az ? 1 : 0,
    nz = nx === 0 && ny === 0 ? 1 : 0;
  const d = nx * fx + ny * fy + nz * fz;
  nx -= d * fx;
  ny -= d * fy;
  nz -= d * fz;
  const m = Math.hypot(nx, ny, nz);
  nx /= m;
  ny /= m;
  nz /= m;
  const nv = 2 * (nx * vx + ny * vy + nz * vz);
  out[o] = nv * nx - vx;
  out[o + 1] = nv * ny - vy;
  out[o + 2] = nv * nz - vz;
}

export interface ReducedBandwidthGains {
  omegaN: number;
  zeta: number;
  /** Inertia used for the scalar gains: the largest principal moment of J⊥, kg·m². */
  inertiaRef: number;
  /** k_p = J_ref ω_n², N·m per unit of V. */
  kp: number;
  /** k_d = 2ζω_n J_ref, N·m·s (use as K_d = k_d I). */
  kd: number;
}

/**
 * Gains from a natural frequency and damping ratio. Small-angle matching (derived here): a tilt φ
 * of y from b about an axis n ⊥ b gives |∇V| = sin φ ≈ φ, so J_n φ̈ = −k_p φ − k_d φ̇; the warp
 * vanishes to first order at b (θ = kV = O(φ²)), so the same gains hold for every member. With
 * the largest principal moment every tilt axis is at least as fast and as damped as asked
 * (common practice, no source; the same choice as ../gains.ts).
 */
export function reducedGainsFromBandwidth(Jperp: Mat3, omegaN: number, zeta: number): ReducedBandwidthGains {
  const jRef = symmetricEigen3(Jperp).values[2]!;
  return { omegaN, zeta, inertiaRef: jRef, kp: jRef * omegaN * omegaN, kd: 2 * zeta * omegaN * jRef };
}
