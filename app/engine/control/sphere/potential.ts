/**
 * Pointing potential on the sphere S² and its synergistic family by angular warping, evaluated
 * without allocation.
 *
 * CONVENTION (derived here; rotation.ts for the quaternion rules). A pointing task asks that the
 * body axis b (unit, body axes) point along the inertial direction r. Any reference attitude q_d
 * with R(q_d) b = r serves (its roll about r does not matter). With q_e = q_d* ⊗ q, R_e = R(q_e):
 *   y = R_eᵀ b = R(q)ᵀ r        the target direction as the body sees it (a sun sensor's reading);
 *                                it depends on q and r only, not on the roll of q_d;
 *   y = b                       ⇔ the axis points at the target;  y = −b ⇔ the antipode;
 *   ẏ = y × ω_e                 from Ṙ_e = R_e[ω_e]×, ω_e = ω − R_eᵀω_d (methods §1.1);
 *   V(y) = 1 − bᵀy = 1 − rᵀR b = 1 − cos φ,   φ = the pointing error angle between b and y;
 *   V̇ = (y × b)ᵀω_e            so the body-frame gradient is ∇V = y × b, zero only at y = ±b.
 * ∇V ⊥ b: the potential never asks for torque about the pointed axis (roll is free).
 *
 * Synergistic family (angular warping of Berkane & Tayebi, "Construction of synergistic potential
 * functions on SO(3) via angular warping", IEEE TAC 62(1):495–501, 2017, transplanted to S² here;
 * the synergistic framework on the sphere: Mayhew & Teel, "Global stabilization of spherical
 * orientation by synergistic hybrid feedback with application to reduced-attitude tracking for
 * rigid bodies", Automatica 2013, and Casau, Mayhew, Sanfelice & Silvestre on the n-sphere,
 * Automatica 2019 — venues from memory; the existence of the 2-sphere result is restated in
 * Mayhew, Sanfelice & Teel, arXiv:2009.03815, introduction):
 *   Γ_p(y) = R_a(θ(y), u_p) y,  θ(y) = k V(y),   V_p = V ∘ Γ_p,   p = 1..M, u_p unit.
 * Derived here (checked against finite differences in the tests):
 *   ∇V_p(y) = y × R_a(θ, u_p)ᵀ b + k s_p (y × b),   s_p = u_pᵀ(b × Γ_p)   (V̇_p = ∇V_pᵀω_e);
 *   Jacobian of Γ_p on the tangent plane: det = 1 + k u_pᵀ(b × y) ≥ 1 − k|u_p × b|, so Γ_p is a
 *   local diffeomorphism homotopic to the identity — hence a diffeomorphism of S² — when
 *   k |u_p × b| < 1 (k < 1 for u_p ⊥ b); then crit V_p = Γ_p⁻¹{b, −b}: b itself (θ = 0) and
 *   y_p* = R_a(−θ*, u_p)(−b), where θ* solves θ = k(1 + cos θ + (1 − cos θ)(u_pᵀb)²).
 * Member indices are 0-based here; controllers show them 1-based.
 */
import type { Vec3 } from '../../math/mat3';
import { argminMember } from '../potential';

export interface SphereFamily {
  /** The pointed body axis b (unit, body axes): the pole where every V_p vanishes. */
  readonly axis: Float64Array;
  /** Warp gain k in θ = k V (rad per unit of V). */
  readonly k: number;
  /** Number of members M. */
  readonly members: number;
  /** Unit warp directions u_p in body axes, 3 per member. */
  readonly directions: Float64Array;
}

/**
 * Build a family; the axis and each direction are normalised. No validation here
 * (`sphereFamilyInputIssues` in certificate.ts lists what is wrong with user input).
 */
export function makeSphereFamily(axis: ArrayLike<number>, k: number, directions: ArrayLike<number>): SphereFamily {
  const b = unit(axis, 0);
  const m = Math.floor(directions.length / 3);
  const dirs = new Float64Array(3 * m);
  for (let p = 0; p < m; p++) dirs.set(unit(directions, 3 * p), 3 * p);
  return { axis: b, k, members: m, directions: dirs };
}

function unit(v: ArrayLike<number>, o: number): Float64Array {
  const x = v[o]!,
    y = v[o + 1]!,
    z = v[o + 2]!;
  const n = Math.hypot(x, y, z);
  return n > 0 ? Float64Array.of(x / n, y / n, z / n) : Float64Array.of(x, y, z);
}

/**
 * M directions evenly spaced in the plane ⊥ b (angle 2π/M apart, the first one `phaseRad` from
 * a fixed reference axis of that plane). M = 2 gives u and −u: on S² they are synergistic (their
 * undesired critical points differ), unlike the opposite warps on SO(3) (methods §4.2).
 */
export function evenWarpDirections(axis: ArrayLike<number>, members: number, phaseRad = 0): Float64Array {
  const b = unit(axis, 0);
  // e1: the body axis least aligned with b, made ⊥ b; e2 = b × e1
  const ax = Math.abs(b[0]!),
    ay = Math.abs(b[1]!),
    az = Math.abs(b[2]!);
  const a = ax <= ay && ax <= az ? [1, 0, 0] : ay <= az ? [0, 1, 0] : [0, 0, 1];
  const d = a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!;
  const e1 = unit([a[0]! - d * b[0]!, a[1]! - d * b[1]!, a[2]! - d * b[2]!], 0);
  const e2 = [b[1]! * e1[2]! - b[2]! * e1[1]!, b[2]! * e1[0]! - b[0]! * e1[2]!, b[0]! * e1[1]! - b[1]! * e1[0]!];
  const out = new Float64Array(3 * members);
  for (let p = 0; p < members; p++) {
    const t = phaseRad + (2 * Math.PI * p) / members;
    const c = Math.cos(t),
      s = Math.sin(t);
    for (let i = 0; i < 3; i++) out[3 * p + i] = c * e1[i]! + s * e2[i]!;
  }
  return out;
}

/** V(y) = 1 − bᵀy. */
export function pointingPotential(b: ArrayLike<number>, y: ArrayLike<number>): number {
  return 1 - (b[0]! * y[0]! + b[1]! * y[1]! + b[2]! * y[2]!);
}

/** out = ∇V = y × b (body axes; V̇ = ∇Vᵀω_e). */
export function pointingGradient(out: Vec3, b: ArrayLike<number>, y: ArrayLike<number>): Vec3 {
  const yx = y[0]!,
    yy = y[1]!,
    yz = y[2]!;
  out[0] = yy * b[2]! - yz * b[1]!;
  out[1] = yz * b[0]! - yx * b[2]!;
  out[2] = yx * b[1]! - yy * b[0]!;
  return out;
}

/** Pointing error angle φ ∈ [0, π] between b and y: atan2(|b × y|, bᵀy) (accurate at 0 and π). */
export function pointingAngle(b: ArrayLike<number>, y: ArrayLike<number>): number {
  const cx = b[1]! * y[2]! - b[2]! * y[1]!,
    cy = b[2]! * y[0]! - b[0]! * y[2]!,
    cz = b[0]! * y[1]! - b[1]! * y[0]!;
  return Math.atan2(Math.hypot(cx, cy, cz), b[0]! * y[0]! + b[1]! * y[1]! + b[2]! * y[2]!);
}

/** Evaluation state for one direction y: V, the warp angle, every Γ_p and every V_p. */
export interface SphereWorkspace {
  /** The direction last evaluated (copied). */
  readonly y: Float64Array;
  /** V(y) = 1 − bᵀy. */
  v: number;
  /** θ = kV and its cosine and sine. */
  theta: number;
  cosTheta: number;
  sinTheta: number;
  /** Γ_p(y), 3 per member. */
  readonly gamma: Float64Array;
  /** V_p(y) = 1 − bᵀΓ_p, one per member. */
  readonly V: Float64Array;
  /** Smallest V_p (lowest index among ties within the tie tolerance of ../potential.ts). */
  minIndex: number;
  minValue: number;
}

export function makeSphereWorkspace(fam: SphereFamily): SphereWorkspace {
  return {
    y: new Float64Array(3),
    v: 0,
    theta: 0,
    cosTheta: 1,
    sinTheta: 0,
    gamma: new Float64Array(3 * fam.members),
    V: new Float64Array(fam.members),
    minIndex: 0,
    minValue: 0,
  };
}

/** Evaluate the family at the unit direction y. Returns ws. */
export function evaluateSphereFamily(ws: SphereWorkspace, fam: SphereFamily, y: ArrayLike<number>): SphereWorkspace {
  const yx = y[0]!,
    yy = y[1]!,
    yz = y[2]!;
  ws.y[0] = yx;
  ws.y[1] = yy;
  ws.y[2] = yz;
  const B = fam.axis;
  const bx = B[0]!,
    by = B[1]!,
    bz = B[2]!;
  const v = 1 - (bx * yx + by * yy + bz * yz);
  const theta = fam.k * v;
  const c = Math.cos(theta),
    s = Math.sin(theta);
  ws.v = v;
  ws.theta = theta;
  ws.cosTheta = c;
  ws.sinTheta = s;
  const U = fam.directions,
    G = ws.gamma,
    V = ws.V;
  const n = fam.members;
  for (let p = 0; p < n; p++) {
    const ux = U[3 * p]!,
      uy = U[3 * p + 1]!,
      uz = U[3 * p + 2]!;
    // Rodrigues: R_a(θ, u) y = c y + s (u × y) + (1 − c)(u·y) u
    const ud = (1 - c) * (ux * yx + uy * yy + uz * yz);
    const gx = c * yx + s * (uy * yz - uz * yy) + ud * ux;
    const gy = c * yy + s * (uz * yx - ux * yz) + ud * uy;
    const gz = c * yz + s * (ux * yy - uy * yx) + ud * uz;
    G[3 * p] = gx;
    G[3 * p + 1] = gy;
    G[3 * p + 2] = gz;
    V[p] = 1 - (bx * gx + by * gy + bz * gz);
  }
  const mi = argminMember(V, n);
  ws.minIndex = mi;
  ws.minValue = V[mi]!;
  return ws;
}

/**
 * out = ∇V_p = y × R_a(θ, u_p)ᵀ b + k s_p (y × b), s_p = u_pᵀ(b × Γ_p), at the direction last
 * passed to `evaluateSphereFamily(ws, …)`.
 */
export function sphereMemberGradient(out: Vec3, fam: SphereFamily, ws: SphereWorkspace, p: number): Vec3 {
  const B = fam.axis,
    U = fam.directions,
    Y = ws.y,
    G = ws.gamma;
  const bx = B[0]!,
    by = B[1]!,
    bz = B[2]!;
  const ux = U[3 * p]!,
    uy = U[3 * p + 1]!,
    uz = U[3 * p + 2]!;
  const yx = Y[0]!,
    yy = Y[1]!,
    yz = Y[2]!;
  const gx = G[3 * p]!,
    gy = G[3 * p + 1]!,
    gz = G[3 * p + 2]!;
  const c = ws.cosTheta,
    s = ws.sinTheta;
  // w = R_a(−θ, u) b = c b − s (u × b) + (1 − c)(u·b) u
  const ub = (1 - c) * (ux * bx + uy * by + uz * bz);
  const wx = c * bx - s * (uy * bz - uz * by) + ub * ux;
  const wy = c * by - s * (uz * bx - ux * bz) + ub * uy;
  const wz = c * bz - s * (ux * by - uy * bx) + ub * uz;
  // s_p = u·(b × Γ)
  const sp = ux * (by * gz - bz * gy) + uy * (bz * gx - bx * gz) + uz * (bx * gy - by * gx);
  const f = fam.k * sp;
  out[0] = yy * wz - yz * wy + f * (yy * bz - yz * by);
  out[1] = yz * wx - yx * wz + f * (yz * bx - yx * bz);
  out[2] = yx * wy - yy * wx + f * (yx * by - yy * bx);
  return out;
}

/** Tangent-plane Jacobian determinant of Γ_p at y: 1 + k u_pᵀ(b × y). */
export function sphereWarpJacobianDet(fam: SphereFamily, y: ArrayLike<number>, p: number): number {
  const B = fam.axis,
    U = fam.directions;
  const cx = B[1]! * y[2]! - B[2]! * y[1]!,
    cy = B[2]! * y[0]! - B[0]! * y[2]!,
    cz = B[0]! * y[1]! - B[1]! * y[0]!;
  return 1 + fam.k * (U[3 * p]! * cx + U[3 * p + 1]! * cy + U[3 * p + 2]! * cz);
}

/**
 * Closed-form minimum over S² of the Jacobian determinant: 1 − k|u_p × b| (u_pᵀ(b × y) = yᵀ(u_p × b)
 * ranges over ±|u_p × b| on the unit sphere).
 */
export function sphereWarpMarginClosedForm(fam: SphereFamily, p: number): number {
  const B = fam.axis,
    U = fam.directions;
  const ux = U[3 * p]!,
    uy = U[3 * p + 1]!,
    uz = U[3 * p + 2]!;
  return 1 - fam.k * Math.hypot(uy * B[2]! - uz * B[1]!, uz * B[0]! - ux * B[2]!, ux * B[1]! - uy * B[0]!);
}

/**
 * out = R_a(−θ, u_p)(σ b), σ = ±1: the preimage candidate of ±b under Γ_p for the warp angle θ
 * (a point y with Γ_p(y) = σb exactly when θ = kV(y)).
 */
export function spherePreimage(out: Vec3, fam: SphereFamily, p: number, sigma: number, theta: number): Vec3 {
  const B = fam.axis,
    U = fam.directions;
  const bx = sigma * B[0]!,
    by = sigma * B[1]!,
    bz = sigma * B[2]!;
  const ux = U[3 * p]!,
    uy = U[3 * p + 1]!,
    uz = U[3 * p + 2]!;
  const c = Math.cos(theta),
    s = Math.sin(theta);
  const ub = (1 - c) * (ux * bx + uy * by + uz * bz);
  out[0] = c * bx - s * (uy * bz - uz * by) + ub * ux;
  out[1] = c * by - s * (uz * bx - ux * bz) + ub * uy;
  out[2] = c * bz - s * (ux * by - uy * bx) + ub * uz;
  return out;
}
