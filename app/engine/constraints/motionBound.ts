/**
 * Bounds on how fast a constraint's margin can change along a history, for the bisection scan
 * (bisect.ts). Between samples i and k the angle between a body axis and a source, less the
 * source radius, changes by at most
 *   B(i, k) = (Φ_k − Φ_i) + (ω_s + ρ̇) (t_k − t_i),
 * where Φ is a running sum of bounds on the rotation angle between consecutive attitudes (a body
 * vector turns by no more than the attitude does, and rotation angles obey the triangle
 * inequality on SO(3)), ω_s bounds the source's angular rate and ρ̇ its radius rate.
 *
 * Consecutive rotation angle θ without an inverse trigonometric function per sample: with
 * d = |q_i · q_k| / (|q_i||q_k|), s = sin(θ/2) = √(1 − d²) and θ = 2 asin(s). For s ≤ 0.7,
 * asin(s) ≤ s + s³/2 (the ratio (asin s − s)/s³ grows with s and is 0.22 at s = 0.7; Maclaurin
 * series of asin), so θ ≤ 2s + s³; above, θ ≤ π s (sin x ≥ 2x/π on [0, π/2]).
 */
import type { PreparedSource } from './types';

/** Bound on the rotation angle (rad) of an attitude step with sin(θ/2) = s (header). */
export function stepAngleBound(s: number): number {
  return s <= 0.7 ? s * (2 + s * s) : Math.PI * s;
}

/**
 * Running bound Φ over the n samples of q (4 per sample, any non-zero norm): Φ_0 = 0 and
 * Φ_i = Φ_(i−1) + stepAngleBound(sin of half the turn from sample i−1 to i).
 */
export function rotationPrefix(q: Float64Array, n: number): Float64Array {
  const phi = new Float64Array(n);
  if (n === 0) return phi;
  let px = q[0]!,
    py = q[1]!,
    pz = q[2]!,
    pw = q[3]!,
    pn = px * px + py * py + pz * pz + pw * pw,
    sum = 0;
  for (let i = 1; i < n; i++) {
    const x = q[4 * i]!,
      y = q[4 * i + 1]!,
      z = q[4 * i + 2]!,
      w = q[4 * i + 3]!;
    const nn = x * x + y * y + z * z + w * w;
    const d = x * px + y * py + z * pz + w * pw;
    const c2 = (d * d) / (nn * pn);
    if (c2 < 1) sum += stepAngleBound(Math.sqrt(1 - c2));
    phi[i] = sum;
    px = x;
    py = y;
    pz = z;
    pw = w;
    pn = nn;
  }
  return phi;
}

/**
 * Bound on how fast the source's direction (rad/s) plus its radius (rad/s) change. Great circle:
 * Ω_j / Δt_j; linear blend: 2 tan(Ω_j / 2) / Δt_j (its angular speed peaks mid-interval at
 * Ω-weighted sin Ω / |blend|², |blend|² ≥ (1 + cos Ω)/2).
 */
export function sourceRateBound(src: PreparedSource): number {
  const T = src.timesS,
    A = src.arcAngleRad,
    R = src.radiusRad;
  let w = 0;
  for (let j = 0; j + 1 < T.length; j++) {
    const dt = T[j + 1]! - T[j]!;
    const ang = src.greatCircle ? A[j]! : 2 * Math.tan(0.5 * A[j]!);
    const dr = src.radiusVaries ? Math.abs(R[j + 1]! - R[j]!) : 0;
    w = Math.max(w, (ang + dr) / dt);
  }
  return w;
}
