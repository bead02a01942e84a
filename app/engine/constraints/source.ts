/**
 * Direction sources at a time, and the exact margin of one attitude against one constraint.
 *
 * Interpolation between samples a (t_j) and b (t_j+1), u = (t − t_j)/(t_j+1 − t_j):
 *   linear:       s = normalise((1 − u) a + u b)
 *   great-circle: s = a cos(uΩ) + p sin(uΩ), Ω = ∠(a, b), p = unit(b − (a·b) a)
 * (the second is slerp on the unit sphere; Shoemake, "Animating rotation with quaternion
 * curves", SIGGRAPH 1985, for the formula). Outside the sampled span the end sample is held.
 * The source's angular radius is interpolated linearly in time.
 *
 * Angles between unit vectors use atan2(|a × b|, a · b), accurate near 0 and π (no acos there).
 */
import type { PreparedConstraint, PreparedSource } from './types';

/** Index j of the interval [t_j, t_j+1) holding t (clamped to [0, n − 2]); 0 for a single sample. */
export function sampleInterval(times: Float64Array, t: number): number {
  const n = times.length;
  if (n < 2 || !(t > times[0]!)) return 0;
  if (t >= times[n - 1]!) return n - 2;
  let lo = 0,
    hi = n - 2;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (times[mid]! <= t) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/** Per-interval arc angles Ω_j and unit vectors p_j = unit(b − (a·b) a) of unit directions (3 per sample). */
export function arcTables(dirs: Float64Array): { arcAngleRad: Float64Array; arcBasis: Float64Array } {
  const m = Math.max(0, dirs.length / 3 - 1);
  const ang = new Float64Array(m),
    basis = new Float64Array(3 * m);
  for (let j = 0; j < m; j++) {
    const ax = dirs[3 * j]!,
      ay = dirs[3 * j + 1]!,
      az = dirs[3 * j + 2]!,
      bx = dirs[3 * j + 3]!,
      by = dirs[3 * j + 4]!,
      bz = dirs[3 * j + 5]!;
    const c = ax * bx + ay * by + az * bz;
    const px = bx - c * ax,
      py = by - c * ay,
      pz = bz - c * az;
    const s = Math.sqrt(px * px + py * py + pz * pz);
    ang[j] = Math.atan2(s, c);
    if (s > 0) {
      basis[3 * j] = px / s;
      basis[3 * j + 1] = py / s;
      basis[3 * j + 2] = pz / s;
    }
  }
  return { arcAngleRad: ang, arcBasis: basis };
}

/**
 * Source direction at time t into out[o..o+2] (unit), using interval j (sampleInterval). Returns
 * the angular radius at t (rad).
 */
export function sourceAtInterval(out: Float64Array, o: number, src: PreparedSource, j: number, t: number): number {
  const T = src.timesS,
    D = src.directions;
  if (T.length < 2) {
    out[o] = D[0]!;
    out[o + 1] = D[1]!;
    out[o + 2] = D[2]!;
    return src.radiusRad[0]!;
  }
  let u = (t - T[j]!) / (T[j + 1]! - T[j]!);
  u = u < 0 ? 0 : u > 1 ? 1 : u;
  const k = 3 * j,
    ax = D[k]!,
    ay = D[k + 1]!,
    az = D[k + 2]!;
  if (src.greatCircle) {
    const x = u * src.arcAngleRad[j]!,
      P = src.arcBasis;
    let cu: number, su: number;
    if (x <= SMALL_ARC) {
      // Taylor series to x⁹ and x¹⁰: truncation below 1e-14 for x ≤ 0.25.
      const x2 = x * x;
      su = x * (1 - (x2 / 6) * (1 - (x2 / 20) * (1 - (x2 / 42) * (1 - x2 / 72))));
      cu = 1 - (x2 / 2) * (1 - (x2 / 12) * (1 - (x2 / 30) * (1 - (x2 / 56) * (1 - x2 / 90))));
    } else {
      cu = Math.cos(x);
      su = Math.sin(x);
    }
    out[o] = ax * cu + P[k]! * su;
    out[o + 1] = ay * cu + P[k + 1]! * su;
    out[o + 2] = az * cu + P[k + 2]! * su;
  } else {
    const x = ax + u * (D[k + 3]! - ax),
      y = ay + u * (D[k + 4]! - ay),
      z = az + u * (D[k + 5]! - az);
    const inv = 1 / Math.sqrt(x * x + y * y + z * z);
    out[o] = x * inv;
    out[o + 1] = y * inv;
    out[o + 2] = z * inv;
  }
  const R = src.radiusRad;
  return src.radiusVaries ? R[j]! + u * (R[j + 1]! - R[j]!) : R[0]!;
}

/** Arc angle below which sin and cos come from their Taylor series (rad). */
export const SMALL_ARC = 0.25;

/** Source direction at time t into out (unit); returns the angular radius at t (rad). */
export function sourceAt(out: Float64Array, src: PreparedSource, t: number): number {
  return sourceAtInterval(out, 0, src, sampleInterval(src.timesS, t), t);
}

/** Angle between two unit vectors (rad, [0, π]), accurate near 0 and π. */
function unitAngle(ax: number, ay: number, az: number, bx: number, by: number, bz: number): number {
  const cx = ay * bz - az * by,
    cy = az * bx - ax * bz,
    cz = ax * by - ay * bx;
  return Math.atan2(Math.sqrt(cx * cx + cy * cy + cz * cz), ax * bx + ay * by + az * bz);
}

/**
 * The angle threshold of a constraint at source radius r: violation is θ < threshold for a
 * keep-out, θ > threshold for a keep-in (types.ts header).
 */
export function thresholdAngle(c: PreparedConstraint, radiusRad: number): number {
  return c.kind === 'keep-out' ? c.halfAngleRad + c.marginRad + radiusRad : c.halfAngleRad - c.marginRad + radiusRad;
}

/** Margin (rad) for angle θ between the axis and the source centre, at source radius r. */
export function marginFromAngle(c: PreparedConstraint, angleRad: number, radiusRad: number): number {
  const thr = thresholdAngle(c, radiusRad);
  return c.kind === 'keep-out' ? angleRad - thr : thr - angleRad;
}

const sDir = new Float64Array(3);

/**
 * Exact margin (rad) of attitude q[offset..offset+3] (qInertialFromBody, normalised here) against
 * constraint c at time t; windows are NOT applied here. A zero quaternion gives NaN.
 */
export function attitudeMargin(q: ArrayLike<number>, c: PreparedConstraint, t: number, offset = 0): number {
  const r = sourceAt(sDir, c.source, t);
  const x = q[offset]!,
    y = q[offset + 1]!,
    z = q[offset + 2]!,
    w = q[offset + 3]!;
  const n2 = x * x + y * y + z * z + w * w;
  const b = c.axisBody;
  // v = R(q) b for q of any non-zero norm: R = I + (2/|q|²)(w [q_v]× + [q_v]×²).
  const k = 2 / n2;
  const tx = k * (y * b[2]! - z * b[1]!),
    ty = k * (z * b[0]! - x * b[2]!),
    tz = k * (x * b[1]! - y * b[0]!);
  const vx = b[0]! + w * tx + (y * tz - z * ty),
    vy = b[1]! + w * ty + (z * tx - x * tz),
    vz = b[2]! + w * tz + (x * ty - y * tx);
  return marginFromAngle(c, unitAngle(vx, vy, vz, sDir[0]!, sDir[1]!, sDir[2]!), r);
}
