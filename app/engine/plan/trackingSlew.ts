/**
 * A slew onto a moving target (a ground site, a station, the Sun, nadir) or from a moving start:
 * the reference ends on the target's attitude AND body rate and acceleration, not at rest.
 *
 * Design (ours). Write the reference relative to the target T(t) (attitude q_T, body rate ω_T,
 * acceleration ω̇_T, orbit/targets.ts):
 *   q_ref(t) = q_T(t) ⊗ δ(t),   δ(t) = exp(½ ρ(t))   (ρ: rotation vector of the offset, rad),
 * and let ρ follow a quintic in time over the slew s = t − t_s ∈ [0, T], u = s/T:
 *   ρ(s) = ρ₀ H₀(u) + T ρ̇₀ H₁(u),
 *   H₀ = 1 − 10u³ + 15u⁴ − 6u⁵,  H₁ = u − 6u³ + 8u⁴ − 3u⁵,
 * the quintic Hermite polynomials with ρ(0) = ρ₀, ρ̇(0) = ρ̇₀, ρ̈(0) = 0 and ρ = ρ̇ = ρ̈ = 0 at u = 1
 * (fifth-order boundary-value trajectories are the textbook smooth point-to-point profile, e.g.
 * J. J. Craig, Introduction to Robotics, ch. 7, from memory; planned here in exponential
 * coordinates relative to the moving target, as rotation-vector interpolation is done in
 * F. C. Park & B. Ravani, "Smooth invariant interpolation of rotations", ACM TOG 16(3), 1997,
 * from memory). So at the end δ = identity with zero rate and acceleration: q_ref = q_T,
 * ω_ref = ω_T, ω̇_ref = ω̇_T (a tracking handover with continuous torque); at the start
 * q_ref = q_T ⊗ exp(½ρ₀) is the start attitude and ρ̇₀ is chosen so the start body rate is met.
 *
 * Kinematics (derived here; checked against finite differences in test/reference/plan-tracking.test.ts):
 *   R_ref = R_T R_δ ⇒ ω_ref = R_δᵀ ω_T + ω_δ,   ω̇_ref = R_δᵀ ω̇_T − ω_δ × (R_δᵀ ω_T) + ω̇_δ,
 *   ω_δ = 2 vec(δ* ⊗ δ̇),   ω̇_δ = 2 vec(δ* ⊗ δ̈)   (δ̇* ⊗ δ̇ = |δ̇|² is real for a unit δ),
 * with δ = (f(g) ρ, c(g)), g = ρ·ρ, f = sin(√g/2)/√g, c = cos(√g/2) differentiated in g (series
 * below g = 0.25, so ρ → 0 is exact). The start rate: ω_δ = J_r(ρ) ρ̇ with the right Jacobian of
 * SO(3), so ρ̇₀ = J_r⁻¹(ρ₀) ω_δ₀, J_r⁻¹(ρ) = I + ½[ρ]× + (1/θ² − cot(θ/2)/(2θ)) [ρ]×², θ = |ρ|
 * (J. Solà, J. Deray & D. Atchuthan, "A micro Lie theory for state estimation in robotics",
 * arXiv:1812.01537, 2018, SO(3) right Jacobian; from memory, verified numerically in the test).
 * Allocation-free: scratch buffers at module load.
 */
import { qMultiply, qRotateInverse } from '../math/rotation';

/** Series coefficients of f(g) = sin(√g/2)/√g = Σ a_n gⁿ, a_n = (−1)ⁿ / (2^(2n+1) (2n+1)!). */
const F_SERIES = (() => {
  const a: number[] = [];
  let fact = 1;
  for (let n = 0; n < 9; n++) {
    if (n > 0) fact *= 2 * n * (2 * n + 1);
    a.push((n % 2 ? -1 : 1) / (2 ** (2 * n + 1) * fact));
  }
  return a;
})();

const fg = new Float64Array(3);

/** f(g), f′(g), f″(g) into fg (header). */
function fDerivs(g: number): void {
  if (g < 0.25) {
    // Σ a_n gⁿ and its term-by-term derivatives; a_8 g⁸ < 1e-20 here.
    const a = F_SERIES,
      N = a.length;
    let f = 0,
      f1 = 0,
      f2 = 0,
      p = 1;
    for (let n = 0; n < N; n++) {
      f += a[n]! * p;
      if (n + 1 < N) f1 += (n + 1) * a[n + 1]! * p;
      if (n + 2 < N) f2 += (n + 2) * (n + 1) * a[n + 2]! * p;
      p *= g;
    }
    fg[0] = f;
    fg[1] = f1;
    fg[2] = f2;
    return;
  }
  const s = Math.sqrt(g);
  const S = Math.sin(0.5 * s),
    C = Math.cos(0.5 * s);
  const s2 = g,
    s3 = s2 * s,
    s5 = s3 * s2;
  fg[0] = S / s;
  fg[1] = (s * C - 2 * S) / (4 * s3);
  fg[2] = (-0.5 * s2 * S - 3 * s * C + 6 * S) / (8 * s5);
}

/**
 * δ = exp(½ρ) and its first two time derivatives (quaternions [x, y, z, w]) from ρ, ρ̇, ρ̈.
 * Outputs must not alias the inputs.
 */
export function expWithDerivatives(
  outQ: Float64Array,
  outQd: Float64Array,
  outQdd: Float64Array,
  rho: ArrayLike<number>,
  rhoD: ArrayLike<number>,
  rhoDD: ArrayLike<number>,
): void {
  const r0 = rho[0]!,
    r1 = rho[1]!,
    r2 = rho[2]!;
  const d0 = rhoD[0]!,
    d1 = rhoD[1]!,
    d2 = rhoD[2]!;
  const e0 = rhoDD[0]!,
    e1 = rhoDD[1]!,
    e2 = rhoDD[2]!;
  const g = r0 * r0 + r1 * r1 + r2 * r2;
  const gd = 2 * (r0 * d0 + r1 * d1 + r2 * d2);
  const gdd = 2 * (d0 * d0 + d1 * d1 + d2 * d2 + r0 * e0 + r1 * e1 + r2 * e2);
  fDerivs(g);
  const f = fg[0]!,
    f1 = fg[1]!,
    f2 = fg[2]!;
  outQ[0] = f * r0;
  outQ[1] = f * r1;
  outQ[2] = f * r2;
  outQ[3] = Math.cos(0.5 * Math.sqrt(g));
  // c′ = −f/4, c″ = −f′/4
  const a1 = f1 * gd,
    a2 = f2 * gd * gd + f1 * gdd;
  outQd[0] = a1 * r0 + f * d0;
  outQd[1] = a1 * r1 + f * d1;
  outQd[2] = a1 * r2 + f * d2;
  outQd[3] = -0.25 * f * gd;
  outQdd[0] = a2 * r0 + 2 * a1 * d0 + f * e0;
  outQdd[1] = a2 * r1 + 2 * a1 * d1 + f * e1;
  outQdd[2] = a2 * r2 + 2 * a1 * d2 + f * e2;
  outQdd[3] = -0.25 * (f1 * gd * gd + f * gdd);
}

/** ω = 2 vec(q* ⊗ q̇), ω̇ = 2 vec(q* ⊗ q̈) for a unit quaternion q (body rate and acceleration). */
export function bodyRateOfQuaternion(
  outW: Float64Array,
  outWd: Float64Array | null,
  q: ArrayLike<number>,
  qd: ArrayLike<number>,
  qdd: ArrayLike<number>,
): void {
  const vx = q[0]!,
    vy = q[1]!,
    vz = q[2]!,
    w = q[3]!;
  const ax = qd[0]!,
    ay = qd[1]!,
    az = qd[2]!,
    aw = qd[3]!;
  outW[0] = 2 * (w * ax - aw * vx - (vy * az - vz * ay));
  outW[1] = 2 * (w * ay - aw * vy - (vz * ax - vx * az));
  outW[2] = 2 * (w * az - aw * vz - (vx * ay - vy * ax));
  if (!outWd) return;
  const bx = qdd[0]!,
    by = qdd[1]!,
    bz = qdd[2]!,
    bw = qdd[3]!;
  outWd[0] = 2 * (w * bx - bw * vx - (vy * bz - vz * by));
  outWd[1] = 2 * (w * by - bw * vy - (vz * bx - vx * bz));
  outWd[2] = 2 * (w * bz - bw * vz - (vx * by - vy * bx));
}

/** out = J_r⁻¹(ρ) v (header); |ρ| ≤ π. out may alias v. */
export function rightJacobianInverseMul(out: Float64Array, rho: ArrayLike<number>, v: ArrayLike<number>): Float64Array {
  const r0 = rho[0]!,
    r1 = rho[1]!,
    r2 = rho[2]!;
  const v0 = v[0]!,
    v1 = v[1]!,
    v2 = v[2]!;
  const th2 = r0 * r0 + r1 * r1 + r2 * r2;
  const th = Math.sqrt(th2);
  // k = (1 − (θ/2) cot(θ/2)) / θ², with its series 1/12 + θ²/720 + θ⁴/30240 near 0.
  const k = th < 0.1 ? 1 / 12 + th2 / 720 + (th2 * th2) / 30240 : (1 - (0.5 * th) / Math.tan(0.5 * th)) / th2;
  const c0 = r1 * v2 - r2 * v1,
    c1 = r2 * v0 - r0 * v2,
    c2 = r0 * v1 - r1 * v0;
  const d0 = r1 * c2 - r2 * c1,
    d1 = r2 * c0 - r0 * c2,
    d2 = r0 * c1 - r1 * c0;
  out[0] = v0 + 0.5 * c0 + k * d0;
  out[1] = v1 + 0.5 * c1 + k * d1;
  out[2] = v2 + 0.5 * c2 + k * d2;
  return out;
}

/** A planned tracking slew's relative motion: duration and the quintic's start data (header). */
export interface QuinticOffset {
  durationS: number;
  /** ρ₀ (rad) and ρ̇₀ (rad/s), target body axes at the slew start. */
  rho0: Float64Array;
  rhoDot0: Float64Array;
}

/** ρ, ρ̇, ρ̈ at s ∈ [0, T] of the quintic (clamped outside). */
export function quinticStateAt(outRho: Float64Array, outRhoD: Float64Array, outRhoDD: Float64Array, p: QuinticOffset, s: number): void {
  const T = p.durationS;
  const u = T > 0 ? Math.min(1, Math.max(0, s / T)) : 1;
  const u2 = u * u,
    u3 = u2 * u,
    u4 = u3 * u,
    u5 = u4 * u;
  const h0 = 1 - 10 * u3 + 15 * u4 - 6 * u5;
  const h0d = (-30 * u2 + 60 * u3 - 30 * u4) / T;
  const h0dd = (-60 * u + 180 * u2 - 120 * u3) / (T * T);
  const h1 = T * (u - 6 * u3 + 8 * u4 - 3 * u5);
  const h1d = 1 - 18 * u2 + 32 * u3 - 15 * u4;
  const h1dd = (-36 * u + 96 * u2 - 60 * u3) / T;
  const r = p.rho0,
    d = p.rhoDot0;
  for (let i = 0; i < 3; i++) {
    outRho[i] = r[i]! * h0 + d[i]! * h1;
    outRhoD[i] = r[i]! * h0d + d[i]! * h1d;
    outRhoDD[i] = r[i]! * h0dd + d[i]! * h1dd;
  }
  if (!(T > 0) || u >= 1) {
    outRho.fill(0);
    outRhoD.fill(0);
    outRhoDD.fill(0);
  }
}

const rho = new Float64Array(3),
  rhoD = new Float64Array(3),
  rhoDD = new Float64Array(3),
  dq = new Float64Array(4),
  dqd = new Float64Array(4),
  dqdd = new Float64Array(4),
  wd = new Float64Array(3),
  wdd = new Float64Array(3),
  wt = new Float64Array(3),
  at = new Float64Array(3);

/**
 * The reference at s ∈ [0, T] into the slew from the target's state (q_T, ω_T, ω̇_T at that
 * time): q_ref, ω_ref, ω̇_ref (header), and optionally the offset's own rate ω_δ (the motion
 * relative to the target). outQ may not alias qT.
 */
export function trackingSlewReference(
  outQ: Float64Array,
  outW: Float64Array,
  outWd: Float64Array,
  qT: ArrayLike<number>,
  omegaT: ArrayLike<number>,
  omegaDotT: ArrayLike<number>,
  p: QuinticOffset,
  s: number,
  outRelW: Float64Array | null = null,
): void {
  quinticStateAt(rho, rhoD, rhoDD, p, s);
  expWithDerivatives(dq, dqd, dqdd, rho, rhoD, rhoDD);
  bodyRateOfQuaternion(wd, wdd, dq, dqd, dqdd);
  qMultiply(outQ, qT, dq);
  qRotateInverse(wt, dq, omegaT);
  qRotateInverse(at, dq, omegaDotT);
  const x = wd[0]!,
    y = wd[1]!,
    z = wd[2]!;
  outW[0] = wt[0]! + x;
  outW[1] = wt[1]! + y;
  outW[2] = wt[2]! + z;
  // ω̇_ref = R_δᵀω̇_T − ω_δ × (R_δᵀω_T) + ω̇_δ
  outWd[0] = at[0]! - (y * wt[2]! - z * wt[1]!) + wdd[0]!;
  outWd[1] = at[1]! - (z * wt[0]! - x * wt[2]!) + wdd[1]!;
  outWd[2] = at[2]! - (x * wt[1]! - y * wt[0]!) + wdd[2]!;
  if (outRelW) {
    outRelW[0] = x;
    outRelW[1] = y;
    outRelW[2] = z;
  }
}
