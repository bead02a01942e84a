/**
 * Eigenaxis quaternion feedback with slew-rate and torque limits.
 *
 * Law (Wie, Weiss & Arapostathis, "Quaternion feedback regulator for spacecraft eigenaxis
 * rotations", JGCD 12(3):375–380, 1989; rate limit by per-axis saturation: Wie & Lu, "Feedback
 * control logic for spacecraft eigenaxis rotations under slew rate and control constraints", JGCD
 * 18(6):1372–1379, 1995; methods §2c), in tracking form with full gyroscopic cancellation:
 *   τ = ω × (J⊥ω + Gh) + J⊥(R_eᵀω̇_d − ω_e × ω_r) − J⊥(k sat_L(sε) + c ω_e),
 * so the error obeys ω̇_e = −k sat_L(sε) − cω_e and, from rest, turns about the fixed axis ε(0).
 * sat_L clips component i to ±L_i with L_i = (c/k) ω_max |ε_i(0)|/‖ε(0)‖, which drives ω_e to
 * −ω_max ε̂(0) while saturated: the slew rate approaches ω_max from below.
 *
 * Per segment: `beginSegment` (and `initialLogic`, a run start being a segment start) latches the
 * limits L from the error direction at that instant and the sign s = sgn(η(0)) (sgn 0 = +1), so
 * the slew goes the short way from where it starts. If `torque` is called before either, it
 * latches on that first call. The logic value itself is unused (0).
 *
 * Torque limit: after the law, a direction-preserving scale s = min(1, min_i τ_max,i/|τ_i|)
 * (methods §6). At a rest start the largest torque is |τ| = c ω_max |J⊥ε̂(0)| componentwise
 * (c J_ii ω_max |ε̂_i(0)| for diagonal J⊥): choose c or ω_max so that this stays under the limit,
 * because a scaled command no longer cancels the gyroscopic term.
 *
 * W reported: 2k(1 − sη) + ½‖ω_e‖² (1/s², inertia-normalised), a Lyapunov function of the
 * unsaturated loop only (Ẇ = −c‖ω_e‖² there).
 */
import type { Vec3 } from '../../../math/mat3';
import { m3MulVec } from '../../../math/mat3';
import { qAngle } from '../../../math/rotation';
import type { TrackingState } from '../../tracking';
import { computeTracking, feedforwardCancel, makeTrackingState, sgnPos } from '../../tracking';
import type { AttitudeController, ControlDiagnostics, ControlInput, PlantModel } from '../../types';

/**
 * Per-axis saturation limits L_i = (c/k) ω_max |ε_i| / ‖ε‖ for an initial error vector ε (Wie & Lu
 * 1995). For a zero error the direction is unknown: every axis gets (c/k) ω_max/√3, which still
 * keeps the saturated rate at ω_max.
 */
export function eigenaxisLimits(out: Vec3, k: number, c: number, omegaMax: number, eps0: ArrayLike<number>): Vec3 {
  const n = Math.hypot(eps0[0]!, eps0[1]!, eps0[2]!);
  const f = (c / k) * omegaMax;
  if (!(n > 1e-12)) {
    out[0] = out[1] = out[2] = f / Math.sqrt(3);
    return out;
  }
  out[0] = (f * Math.abs(eps0[0]!)) / n;
  out[1] = (f * Math.abs(eps0[1]!)) / n;
  out[2] = (f * Math.abs(eps0[2]!)) / n;
  return out;
}

export class Eigenaxis implements AttitudeController {
  readonly kind = 'eigenaxis' as const;
  readonly jumpDecrease = 0;
  readonly certificate = null;
  private readonly st: TrackingState = makeTrackingState();
  private readonly L = new Float64Array(3);
  private readonly a = new Float64Array(3);
  private liftSign = 1;
  private latched = false;

  constructor(
    readonly label: string,
    private readonly plant: PlantModel,
    /** k (1/s²) and c (1/s) of the closed loop ω̇_e = −k sat(ε) − cω_e. */
    readonly k: number,
    readonly c: number,
    readonly omegaMax: number,
    /** Per-axis body torque limit, N·m, or null for none. */
    readonly torqueLimit: Float64Array | null,
  ) {}

  /** The latched limits L (copied into out) and sign s of the current segment. */
  segmentLimits(out: Vec3): { limits: Vec3; sign: number; latched: boolean } {
    out[0] = this.L[0]!;
    out[1] = this.L[1]!;
    out[2] = this.L[2]!;
    return { limits: out, sign: this.liftSign, latched: this.latched };
  }

  private latch(input: ControlInput): void {
    const st = computeTracking(this.st, this.plant, input);
    const s = sgnPos(st.qe[3]!);
    this.liftSign = s;
    this.a[0] = s * st.qe[0]!;
    this.a[1] = s * st.qe[1]!;
    this.a[2] = s * st.qe[2]!;
    eigenaxisLimits(this.L, this.k, this.c, this.omegaMax, this.a);
    this.latched = true;
  }

  initialLogic(input: ControlInput): number {
    this.latch(input);
    return 0;
  }
  beginSegment(input: ControlInput): void {
    this.latch(input);
  }
  jumpGuard(): number {
    return -1;
  }
  updateLogic(): { logic: number; why: string | null } {
    return { logic: 0, why: null };
  }

  torque(out: Vec3, input: ControlInput): Vec3 {
    if (!this.latched) this.latch(input);
    const st = computeTracking(this.st, this.plant, input);
    const s = this.liftSign,
      L = this.L,
      k = this.k,
      c = this.c;
    const a = this.a;
    for (let i = 0; i < 3; i++) {
      const e = s * st.qe[i]!;
      const sat = e > L[i]! ? L[i]! : e < -L[i]! ? -L[i]! : e;
      a[i] = -(k * sat + c * st.omegaE[i]!);
    }
    feedforwardCancel(out, st, this.plant, input.omega);
    m3MulVec(a, this.plant.Jperp, a);
    out[0]! += a[0]!;
    out[1]! += a[1]!;
    out[2]! += a[2]!;
    const lim = this.torqueLimit;
    if (lim) {
      let scale = 1;
      for (let i = 0; i < 3; i++) {
        const m = Math.abs(out[i]!);
        if (m * scale > lim[i]!) scale = lim[i]! / m;
      }
      out[0]! *= scale;
      out[1]! *= scale;
      out[2]! *= scale;
    }
    return out;
  }

  diagnostics(out: ControlDiagnostics, input: ControlInput): ControlDiagnostics {
    const st = computeTracking(this.st, this.plant, input);
    const eta = st.qe[3]!;
    const s = this.latched ? this.liftSign : sgnPos(eta);
    out.errorAngle = qAngle(st.qe);
    out.eta = eta;
    out.potential = 2 * (1 - s * eta);
    out.potentialMin = out.potential;
    out.gap = 0;
    const w = st.omegaE;
    out.lyapunov = this.k * out.potential + 0.5 * (w[0]! * w[0]! + w[1]! * w[1]! + w[2]! * w[2]!);
    return out;
  }
}
