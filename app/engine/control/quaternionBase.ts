/**
 * The shared base of the quaternion feedback laws on S³ (laws/quaternion-pd, laws/sign-switch,
 * laws/hysteretic): continuous PD, memoryless sign switch, hysteretic hybrid.
 *
 * All three: τ = τ_ff − k_p s ε − K_d ω_e, with (η, ε) = q_e, τ_ff the passive tracking
 * feedforward (tracking.ts) and s the chosen sign of the target lift:
 *   - PD:         s = +1 always (quaternion feedback as in Wie & Barba, JGCD 8(3), 1985, from
 *                 memory); it unwinds, the topological obstruction of Bhat & Bernstein,
 *                 Systems & Control Letters 39(1):63–70, 2000;
 *   - sign-switch: s = sgn(η), sgn(0) = +1 — discontinuous at η = 0, chatters under noise
 *                 (Mayhew, Sanfelice & Teel, IEEE TAC 58(5):1179–1191, 2013);
 *   - hysteretic: s = h ∈ {−1, 1}, flow set hη ≥ −δ, jump set hη ≤ −δ, h⁺ = sgn(η)
 *                 (Mayhew, Sanfelice & Teel, "Quaternion-based hybrid control for robust global
 *                 attitude tracking", IEEE TAC 56(11):2555–2566, 2011).
 * Lyapunov value W = 2k_p(1 − sη) + ½ω_eᵀJ⊥ω_e, Ẇ = −ω_eᵀK_dω_e on flows (methods §2a, §3);
 * a hysteretic jump lowers W by at least 4k_pδ.
 */
import type { Mat3, Vec3 } from '../math/mat3';
import { qAngle } from '../math/rotation';
import type { TrackingState } from './tracking';
import { computeTracking, errorKineticEnergy, feedforwardPassive, makeTrackingState, subtractMatVec } from './tracking';
import type { LawId } from './params';
import type { AttitudeController, ControlDiagnostics, ControlInput, PlantModel } from './types';

export abstract class QuaternionLawBase implements AttitudeController {
  abstract readonly kind: LawId;
  abstract readonly jumpDecrease: number;
  readonly certificate = null;
  protected readonly st: TrackingState = makeTrackingState();
  /**
   * The input whose tracking error this.st holds by prepareSample's promise (its values unchanged
   * until the next torque call), or null. Any other input forms its own, clearing this.
   */
  private prepared: ControlInput | null = null;

  constructor(
    readonly label: string,
    protected readonly plant: PlantModel,
    readonly kp: number,
    readonly Kd: Mat3,
  ) {}

  /** The sign s of the target lift for this state and logic. */
  protected abstract sign(eta: number, logic: number): number;

  abstract initialLogic(input: ControlInput): number;
  abstract jumpGuard(input: ControlInput, logic: number): number;
  abstract updateLogic(input: ControlInput, logic: number): { logic: number; why: string | null };

  prepareSample(input: ControlInput): void {
    computeTracking(this.st, this.plant, input);
    this.prepared = input;
  }

  /** The tracking error of `input`: the prepared one when it is that input, else formed now. */
  private track(input: ControlInput): TrackingState {
    if (input === this.prepared) return this.st;
    this.prepared = null;
    return computeTracking(this.st, this.plant, input);
  }

  torque(out: Vec3, input: ControlInput, logic: number): Vec3 {
    const st = this.track(input);
    // The promise ends with the torque: the caller may change the input after it.
    this.prepared = null;
    const s = this.sign(st.qe[3]!, logic) * this.kp;
    const ex = st.qe[0]!,
      ey = st.qe[1]!,
      ez = st.qe[2]!;
    feedforwardPassive(out, st, this.plant);
    out[0]! -= s * ex;
    out[1]! -= s * ey;
    out[2]! -= s * ez;
    return subtractMatVec(out, st, this.Kd, st.omegaE);
  }

  diagnostics(out: ControlDiagnostics, input: ControlInput, logic: number): ControlDiagnostics {
    return this.diagnosticsFrom(out, this.track(input), logic);
  }

  /** The tracking error the last torque call formed is still in this.st (torque writes only scratch after it). */
  diagnosticsOfLastTorque(out: ControlDiagnostics, logic: number): ControlDiagnostics {
    return this.diagnosticsFrom(out, this.st, logic);
  }

  private diagnosticsFrom(out: ControlDiagnostics, st: TrackingState, logic: number): ControlDiagnostics {
    const eta = st.qe[3]!;
    const s = this.sign(eta, logic);
    out.errorAngle = qAngle(st.qe);
    out.eta = eta;
    out.potential = 2 * (1 - s * eta);
    out.potentialMin = this.familyMin(eta);
    out.gap = out.potential - out.potentialMin;
    out.lyapunov = this.kp * out.potential + errorKineticEnergy(st, this.plant);
    return out;
  }

  /** Smallest potential of the law's family at this η. */
  protected abstract familyMin(eta: number): number;

  protected eta(input: ControlInput): number {
    return this.track(input).qe[3]!;
  }
}

/** Laws without hybrid logic: the logic value stays 0 and the jump set is empty. */
export abstract class MemorylessLaw extends QuaternionLawBase {
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
