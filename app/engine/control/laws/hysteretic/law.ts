/** Hysteretic hybrid quaternion feedback (methods §3); see quaternionBase.ts for the shared form and sources. */
import type { Mat3 } from '../../../math/mat3';
import { sgnPos } from '../../tracking';
import { QuaternionLawBase } from '../../quaternionBase';
import type { ControlInput, PlantModel } from '../../types';

/** Hysteretic hybrid quaternion feedback, logic h ∈ {−1, 1} (MST 2011). */
export class Hysteretic extends QuaternionLawBase {
  readonly kind = 'hysteretic' as const;
  readonly jumpDecrease: number;

  constructor(
    label: string,
    plant: PlantModel,
    kp: number,
    Kd: Mat3,
    /** Hysteresis δ ≥ 0 (δ = 0: sign switch; δ ≥ 1: no jump possible, continuous PD). */
    readonly delta: number,
    /** Fixed h(0), or 0 for "sgn(η) at the start". */
    readonly startLogic: number,
  ) {
    super(label, plant, kp, Kd);
    this.jumpDecrease = 4 * kp * delta;
  }

  protected sign(eta: number, logic: number): number {
    // An invalid logic value is treated as the jump map would set it.
    return logic === 1 || logic === -1 ? logic : sgnPos(eta);
  }
  protected familyMin(eta: number): number {
    return 2 * (1 - Math.abs(eta));
  }

  initialLogic(input: ControlInput): number {
    return this.startLogic === 1 || this.startLogic === -1 ? this.startLogic : sgnPos(this.eta(input));
  }

  /** g = −hη − δ ≥ 0 ⇔ hη ≤ −δ (jump set). */
  jumpGuard(input: ControlInput, logic: number): number {
    if (logic !== 1 && logic !== -1) return 1;
    return -logic * this.eta(input) - this.delta;
  }

  updateLogic(input: ControlInput, logic: number): { logic: number; why: string | null } {
    const eta = this.eta(input);
    if (logic !== 1 && logic !== -1) {
      const h = sgnPos(eta);
      return { logic: h, why: `logic reset to h = ${h} (invalid value ${logic})` };
    }
    if (logic * eta <= -this.delta) {
      const h = sgnPos(eta);
      if (h !== logic) return { logic: h, why: `h·η = ${(logic * eta).toFixed(4)} ≤ −δ = ${(-this.delta).toFixed(4)}: h ${logic} → ${h}` };
    }
    return { logic, why: null };
  }
}
