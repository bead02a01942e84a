/**
 * Synergistic hybrid feedback on SO(3) with an angular-warping family (Mayhew & Teel,
 * "Synergistic hybrid feedback for global rigid-body attitude tracking on SO(3)", IEEE TAC
 * 58(11):2730–2742, 2013; family by angular warping: Berkane & Tayebi, IEEE TAC 62(1):495–501,
 * 2017; methods §4).
 *
 *   logic q ∈ {1..M};  μ(R_e, q) = V_q(R_e) − min_p V_p(R_e)
 *   flow set μ ≤ δ, jump set μ ≥ δ, q⁺ = argmin_p V_p(R_e) (ties: the LOWEST index, with the
 *   relative tie tolerance of potential.ts — a deterministic selection of the set-valued map)
 *   τ = τ_ff − k_R b_q(R_e) − K_ω ω_e,   τ_ff the passive tracking feedforward (tracking.ts)
 *   W = k_R V_q(R_e) + ½ω_eᵀJ⊥ω_e,  Ẇ = −ω_eᵀK_ωω_e on flows, W drops by k_R μ ≥ k_R δ at a jump.
 */
import type { Mat3, Vec3 } from '../../../math/mat3';
import { qAngle } from '../../../math/rotation';
import type { CertificateResult } from '../../certificate';
import type { FamilyWorkspace, WarpFamily } from '../../potential';
import { evaluateFamily, makeFamilyWorkspace, memberGradient } from '../../potential';
import type { TrackingState } from '../../tracking';
import { computeTracking, errorKineticEnergy, feedforwardPassive, makeTrackingState, subtractMatVec } from '../../tracking';
import type { AttitudeController, ControlDiagnostics, ControlInput, PlantModel } from '../../types';

export class Synergistic implements AttitudeController {
  readonly kind = 'synergistic' as const;
  readonly jumpDecrease: number;
  private readonly st: TrackingState = makeTrackingState();
  private readonly ws: FamilyWorkspace;
  private readonly b = new Float64Array(3);
  /** ws holds an evaluation (at ws.q). */
  private evaluated = false;

  constructor(
    readonly label: string,
    private readonly plant: PlantModel,
    readonly family: WarpFamily,
    readonly kR: number,
    readonly Komega: Mat3,
    readonly delta: number,
    /** Fixed 1-based q(0), or 0 for argmin at the start. */
    readonly startLogic: number,
    readonly certificate: CertificateResult | null,
  ) {
    this.ws = makeFamilyWorkspace(family);
    this.jumpDecrease = kR * delta;
  }

  /**
   * The tracking error, and the family at it. The family is a function of q_e alone, so when q_e
   * is bit for bit the one ws was last evaluated at (the jump guard, the logic update and the
   * torque of one sample see the same measured input) ws already holds it.
   */
  private evaluate(input: ControlInput): FamilyWorkspace {
    const qe = computeTracking(this.st, this.plant, input).qe;
    const ws = this.ws;
    const at = ws.q;
    if (this.evaluated && sameBits(at[0]!, qe[0]!) && sameBits(at[1]!, qe[1]!) && sameBits(at[2]!, qe[2]!) && sameBits(at[3]!, qe[3]!))
      return ws;
    this.evaluated = true;
    return evaluateFamily(ws, this.family, qe);
  }

  private valid(logic: number): boolean {
    return Number.isInteger(logic) && logic >= 1 && logic <= this.family.members;
  }

  /** Active 0-based member (an invalid logic value acts as the argmin, as a jump would set it). */
  private member(logic: number): number {
    return this.valid(logic) ? logic - 1 : this.ws.minIndex;
  }

  initialLogic(input: ControlInput): number {
    if (this.valid(this.startLogic)) return this.startLogic;
    return this.evaluate(input).minIndex + 1;
  }

  /** g = μ(R_e, q) − δ ≥ 0 ⇔ jump set. */
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
        why: `synergy gap ${mu.toFixed(4)} ≥ δ = ${this.delta}: V_${logic} = ${ws.V[logic - 1]!.toFixed(4)} → V_${best} = ${ws.minValue.toFixed(4)}`,
      };
    return { logic, why: null };
  }

  torque(out: Vec3, input: ControlInput, logic: number): Vec3 {
    const ws = this.evaluate(input);
    const b = memberGradient(this.b, this.family, ws, this.member(logic));
    feedforwardPassive(out, this.st, this.plant);
    out[0]! -= this.kR * b[0]!;
    out[1]! -= this.kR * b[1]!;
    out[2]! -= this.kR * b[2]!;
    return subtractMatVec(out, this.st, this.Komega, this.st.omegaE);
  }

  diagnostics(out: ControlDiagnostics, input: ControlInput, logic: number): ControlDiagnostics {
    const ws = this.evaluate(input);
    const p = this.member(logic);
    out.errorAngle = qAngle(this.st.qe);
    out.eta = this.st.qe[3]!;
    out.potential = ws.V[p]!;
    out.potentialMin = ws.minValue;
    out.gap = ws.V[p]! - ws.minValue;
    out.lyapunov = this.kR * ws.V[p]! + errorKineticEnergy(this.st, this.plant);
    return out;
  }
}

/** a and b are the same double (+0 and −0 differ; NaN never matches, so it is evaluated again). */
function sameBits(a: number, b: number): boolean {
  return a === b && (a !== 0 || 1 / a === 1 / b);
}
