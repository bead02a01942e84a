/**
 * Two-vector (TRIAD) attitude with its body rate and angular acceleration, analytically.
 *
 * Construction (Black, "A passive system for determining the attitude of a satellite", AIAA
 * Journal 2(7), 1964): the inertial triad u1 = P/|P|, u3 = (P × S)/|P × S|, u2 = u3 × u1 and the
 * body triad b1 = p_B, b3 = p_B × s_B/|…|, b2 = b3 × b1 give R = [u1 u2 u3][b1 b2 b3]ᵀ, the
 * qInertialFromBody that puts body axis p_B exactly on P and s_B as close as possible to S.
 *
 * Rates: with P, Ṗ, P̈ and S, Ṡ, S̈ given, each unit vector u = x/|x| has
 *   u̇ = (ẋ − ṅ u)/n,  ü = (ẍ − 2ṅ u̇ − n̈ u)/n,  n = |x|, ṅ = u·ẋ, n̈ = u̇·ẋ + u·ẍ,
 * and c = P × S has ċ = Ṗ × S + P × Ṡ, c̈ = P̈ × S + 2 Ṗ × Ṡ + P × S̈. For a rotating orthonormal
 * triad u̇_k = ω × u_k, so ω_I = ½ Σ u_k × u̇_k and ω̇_I = ½ Σ u_k × ü_k (the u̇_k × u̇_k terms
 * vanish); in body axes ω_B = Rᵀ ω_I and ω̇_B = Rᵀ ω̇_I (since Ṙᵀ ω_I = −ω_B × ω_B = 0).
 * No allocation: scratch vectors live at module load.
 */
import type { Mat3 } from '../math/mat3';
import { qFromMat3 } from '../math/rotation';

export interface AttitudeState {
  /** qInertialFromBody, scalar-last [x, y, z, w] with w ≥ 0. */
  q: Float64Array;
  /** Body rate and its time derivative in body axes (rad/s, rad/s²). */
  omegaBody: Float64Array;
  omegaDotBody: Float64Array;
  /** |P̂ × Ŝ|: the secondary reference degenerates (rates grow without bound) as this → 0. */
  separationSin: number;
}

/**
 * Body triad [b1 b2 b3] (column-major) of a primary and secondary body axis; false when either is
 * zero or they are parallel (sine of their angle below 1e-6).
 */
export function bodyTriad(out: Mat3, primaryBody: ArrayLike<number>, secondaryBody: ArrayLike<number>): boolean {
  const n1 = Math.hypot(primaryBody[0]!, primaryBody[1]!, primaryBody[2]!);
  const n2 = Math.hypot(secondaryBody[0]!, secondaryBody[1]!, secondaryBody[2]!);
  if (!(n1 > 0) || !(n2 > 0) || !Number.isFinite(n1) || !Number.isFinite(n2)) return false;
  const b1x = primaryBody[0]! / n1,
    b1y = primaryBody[1]! / n1,
    b1z = primaryBody[2]! / n1;
  const sx = secondaryBody[0]! / n2,
    sy = secondaryBody[1]! / n2,
    sz = secondaryBody[2]! / n2;
  let b3x = b1y * sz - b1z * sy,
    b3y = b1z * sx - b1x * sz,
    b3z = b1x * sy - b1y * sx;
  const n3 = Math.hypot(b3x, b3y, b3z);
  if (n3 < 1e-6) return false;
  b3x /= n3;
  b3y /= n3;
  b3z /= n3;
  out[0] = b1x;
  out[1] = b1y;
  out[2] = b1z;
  out[3] = b3y * b1z - b3z * b1y;
  out[4] = b3z * b1x - b3x * b1z;
  out[5] = b3x * b1y - b3y * b1x;
  out[6] = b3x;
  out[7] = b3y;
  out[8] = b3z;
  return true;
}

// Scratch: unit vectors and their first and second derivatives (u1, u2, u3), and c = P × S.
const U = new Float64Array(9),
  DU = new Float64Array(9),
  DDU = new Float64Array(9);
const C = new Float64Array(3),
  DC = new Float64Array(3),
  DDC = new Float64Array(3);
const R = new Float64Array(9);

function cross(out: Float64Array, o: number, a: ArrayLike<number>, ao: number, b: ArrayLike<number>, bo: number, k = 1, add = false): void {
  const x = a[ao + 1]! * b[bo + 2]! - a[ao + 2]! * b[bo + 1]!,
    y = a[ao + 2]! * b[bo]! - a[ao]! * b[bo + 2]!,
    z = a[ao]! * b[bo + 1]! - a[ao + 1]! * b[bo]!;
  if (add) {
    out[o] = out[o]! + k * x;
    out[o + 1] = out[o + 1]! + k * y;
    out[o + 2] = out[o + 2]! + k * z;
  } else {
    out[o] = k * x;
    out[o + 1] = k * y;
    out[o + 2] = k * z;
  }
}

/** Unit vector of x and its first two derivatives into U/DU/DDU at offset o. */
function unitDerivs(o: number, x: ArrayLike<number>, dx: ArrayLike<number>, ddx: ArrayLike<number>): number {
  const n = Math.hypot(x[0]!, x[1]!, x[2]!);
  for (let i = 0; i < 3; i++) U[o + i] = x[i]! / n;
  const nd = U[o]! * dx[0]! + U[o + 1]! * dx[1]! + U[o + 2]! * dx[2]!;
  for (let i = 0; i < 3; i++) DU[o + i] = (dx[i]! - nd * U[o + i]!) / n;
  const ndd = DU[o]! * dx[0]! + DU[o + 1]! * dx[1]! + DU[o + 2]! * dx[2]! + U[o]! * ddx[0]! + U[o + 1]! * ddx[1]! + U[o + 2]! * ddx[2]!;
  for (let i = 0; i < 3; i++) DDU[o + i] = (ddx[i]! - 2 * nd * DU[o + i]! - ndd * U[o + i]!) / n;
  return n;
}

/**
 * Attitude, body rate and angular acceleration of the two-vector target (header) into out.
 * `body` is the body triad from `bodyTriad`. Returns false (out untouched) when P or P × S vanish.
 */
export function twoVectorAttitude(
  out: AttitudeState,
  body: ArrayLike<number>,
  P: ArrayLike<number>,
  dP: ArrayLike<number>,
  ddP: ArrayLike<number>,
  S: ArrayLike<number>,
  dS: ArrayLike<number>,
  ddS: ArrayLike<number>,
): boolean {
  const np = Math.hypot(P[0]!, P[1]!, P[2]!),
    ns = Math.hypot(S[0]!, S[1]!, S[2]!);
  cross(C, 0, P, 0, S, 0);
  const nc = Math.hypot(C[0]!, C[1]!, C[2]!);
  if (!(np > 0) || !(ns > 0) || !(nc > 0)) return false;
  cross(DC, 0, dP, 0, S, 0);
  cross(DC, 0, P, 0, dS, 0, 1, true);
  cross(DDC, 0, ddP, 0, S, 0);
  cross(DDC, 0, dP, 0, dS, 0, 2, true);
  cross(DDC, 0, P, 0, ddS, 0, 1, true);
  unitDerivs(0, P, dP, ddP);
  unitDerivs(6, C, DC, DDC);
  // u2 = u3 × u1 and its derivatives.
  cross(U, 3, U, 6, U, 0);
  cross(DU, 3, DU, 6, U, 0);
  cross(DU, 3, U, 6, DU, 0, 1, true);
  cross(DDU, 3, DDU, 6, U, 0);
  cross(DDU, 3, DU, 6, DU, 0, 2, true);
  cross(DDU, 3, U, 6, DDU, 0, 1, true);
  // R = T Bᵀ (T columns u1, u2, u3; B columns b1, b2, b3).
  for (let r = 0; r < 3; r++)
    for (let c = 0; c < 3; c++) R[3 * c + r] = U[r]! * body[c]! + U[3 + r]! * body[3 + c]! + U[6 + r]! * body[6 + c]!;
  qFromMat3(out.q, R);
  // ω_I = ½ Σ u_k × u̇_k, ω̇_I = ½ Σ u_k × ü_k, then body axes: Rᵀ.
  let wx = 0,
    wy = 0,
    wz = 0,
    ax = 0,
    ay = 0,
    az = 0;
  for (let k = 0; k < 9; k += 3) {
    wx += U[k + 1]! * DU[k + 2]! - U[k + 2]! * DU[k + 1]!;
    wy += U[k + 2]! * DU[k]! - U[k]! * DU[k + 2]!;
    wz += U[k]! * DU[k + 1]! - U[k + 1]! * DU[k]!;
    ax += U[k + 1]! * DDU[k + 2]! - U[k + 2]! * DDU[k + 1]!;
    ay += U[k + 2]! * DDU[k]! - U[k]! * DDU[k + 2]!;
    az += U[k]! * DDU[k + 1]! - U[k + 1]! * DDU[k]!;
  }
  for (let c = 0; c < 3; c++) {
    out.omegaBody[c] = 0.5 * (R[3 * c]! * wx + R[3 * c + 1]! * wy + R[3 * c + 2]! * wz);
    out.omegaDotBody[c] = 0.5 * (R[3 * c]! * ax + R[3 * c + 1]! * ay + R[3 * c + 2]! * az);
  }
  out.separationSin = nc / (np * ns);
  return true;
}
