/**
 * Smooth pointing-only PD on the sphere S², τ = τ_ff − k_p (y × b) − K_d ω_e with y = R(q_e)ᵀ b
 * (control/sphere/laws.ts ReducedPd, where the law and its sources are written out; PD on the
 * sphere with the obstruction of Bhat & Bernstein, Systems & Control Letters 39(1):63–70, 2000).
 * Here: the gains of a GainSetting for both pointing laws, and the build axis.
 */
import type { Mat3 } from '../../../math/mat3';
import { MILLI_PER_SI } from '../../../units';
import { dampingMatrix, dampingScalar } from '../../lawSupport';
import type { GainSetting } from '../../params';
import { reducedGainsFromBandwidth } from '../../sphere/laws';

export { ReducedPd as PointingPd } from '../../sphere/laws';

/**
 * The axis a pointing law is built with (body +Z). In a scenario every segment it flies hands it
 * the target's own axis (ControlInput.pointingAxis), and the law retargets.
 */
export const BUILD_AXIS: readonly number[] = [0, 0, 1];

/** k_p (N·m per unit of V) and K_d (N·m·s) of a pointing law for the design inertia. */
export function pointingGains(g: GainSetting, Jperp: Mat3): { kp: number; Kd: Mat3 } {
  if (g.form === 'explicit') return { kp: g.stiffness, Kd: dampingMatrix(g.damping) };
  const b = reducedGainsFromBandwidth(Jperp, g.bandwidthRadPerS, g.dampingRatio);
  return { kp: b.kp, Kd: dampingMatrix(b.kd) };
}

/** "k_p = …, k_d = …; asks … mN·m at a 90° pointing error" (|∇V| = sin φ = 1 there). */
export function pointingGainNote(g: GainSetting, Jperp: Mat3): string {
  const kp = pointingGains(g, Jperp).kp;
  const kd = g.form === 'explicit' ? dampingScalar(g.damping) : reducedGainsFromBandwidth(Jperp, g.bandwidthRadPerS, g.dampingRatio).kd;
  return `k_p = ${kp.toPrecision(3)} N·m, k_d = ${kd.toPrecision(3)} N·m·s; asks ${(kp * MILLI_PER_SI).toPrecision(3)} mN·m at a 90° pointing error`;
}
