/**
 * Synergistic hybrid pointing-only law on the sphere S² (Mayhew & Teel, "Global stabilization of
 * spherical orientation by synergistic hybrid feedback with application to reduced-attitude
 * tracking for rigid bodies", Automatica 2013; Casau, Mayhew, Sanfelice & Silvestre on the
 * n-sphere, Automatica 2019 — venues from memory): logic q ∈ {1..M}, flow set μ ≤ δ, jump set
 * μ ≥ δ, q⁺ ∈ argmin_p V_p, τ = τ_ff − k_p ∇V_q(y) − K_d ω_e, over the angularly warped family
 * V_p = V ∘ Γ_p, Γ_p(y) = R_a(k V(y), u_p) y (Berkane & Tayebi's warping, IEEE TAC 62(1), 2017,
 * carried to S²). The law itself: control/sphere/laws.ts ReducedSynergistic.
 *
 * Here: the family of a controller's parameters. Its warp directions are ⊥ the pointed axis and
 * given as azimuths about it, so the family's geometry (and its certificate) is the same for every
 * axis a target names: it is built about BUILD_AXIS = +Z with u_p = (cos a_p, sin a_p, 0).
 */
import { makeSphereFamily, type SphereFamily } from '../../sphere/potential';
import type { ParamsOf } from '../../definition';
import { BUILD_AXIS } from '../pointing-pd/law';

export { ReducedSynergistic as PointingSynergistic } from '../../sphere/laws';

/** The warped family of a pointing-synergistic controller, about the build axis +Z. */
export function pointingFamilyOf(p: Pick<ParamsOf<'pointing-synergistic'>, 'warpGain' | 'warpAzimuthsRad'>): SphereFamily {
  const dirs = new Float64Array(3 * p.warpAzimuthsRad.length);
  p.warpAzimuthsRad.forEach((a, k) => dirs.set([Math.cos(a), Math.sin(a), 0], 3 * k));
  return makeSphereFamily(BUILD_AXIS, p.warpGain, dirs);
}
