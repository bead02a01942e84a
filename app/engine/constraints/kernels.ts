/**
 * One-sample forms of the block kernels (blocks.ts), with the same arithmetic in the same order,
 * so that a sample evaluated on its own gives bit for bit the number the block scan gives. The
 * bisection scan (bisect.ts) visits samples out of order and relies on that to report exactly
 * what the dense scan reports.
 */
import { sampleInterval, SMALL_ARC, sourceAtInterval } from './source';
import type { PreparedSource } from './types';

const C6 = 1 / 6,
  C12 = 1 / 12,
  C20 = 1 / 20,
  C30 = 1 / 30,
  C42 = 1 / 42,
  C56 = 1 / 56,
  C72 = 1 / 72,
  C90 = 1 / 90;

/** out[0..2] = R(q_i/|q_i|) a, as rotateBlock computes it. */
export function rotateOne(out: Float64Array, q: Float64Array, i: number, a: Float64Array): void {
  const x = q[4 * i]!,
    y = q[4 * i + 1]!,
    z = q[4 * i + 2]!,
    w = q[4 * i + 3]!;
  const s = 2 / (x * x + y * y + z * z + w * w);
  const xx = s * x * x,
    yy = s * y * y,
    zz = s * z * z,
    xy = s * x * y,
    xz = s * x * z,
    yz = s * y * z,
    wx = s * w * x,
    wy = s * w * y,
    wz = s * w * z;
  const ax = a[0]!,
    ay = a[1]!,
    az = a[2]!;
  out[0] = (1 - yy - zz) * ax + (xy - wz) * ay + (xz + wy) * az;
  out[1] = (xy + wz) * ax + (1 - xx - zz) * ay + (yz - wx) * az;
  out[2] = (xz - wy) * ax + (yz + wx) * ay + (1 - xx - yy) * az;
}

/**
 * Source direction at time ti into out[0..2], as fillFixed / sourceBlock compute it; returns the
 * angular radius (rad).
 */
export function sourceOne(out: Float64Array, src: PreparedSource, ti: number): number {
  const T = src.timesS,
    D = src.directions;
  if (T.length < 2) {
    out[0] = D[0]!;
    out[1] = D[1]!;
    out[2] = D[2]!;
    return src.radiusRad[0]!;
  }
  const j = sampleInterval(T, ti);
  if (src.radiusVaries) return sourceAtInterval(out, 0, src, j, ti);
  const k = 3 * j,
    t0 = T[j]!,
    inv = 1 / (T[j + 1]! - t0);
  const ax = D[k]!,
    ay = D[k + 1]!,
    az = D[k + 2]!;
  let u = (ti - t0) * inv;
  u = u < 0 ? 0 : u > 1 ? 1 : u;
  if (src.greatCircle) {
    const P = src.arcBasis;
    const x = u * src.arcAngleRad[j]!;
    let cu: number, su: number;
    if (x <= SMALL_ARC) {
      const x2 = x * x;
      su = x * (1 - x2 * C6 * (1 - x2 * C20 * (1 - x2 * C42 * (1 - x2 * C72))));
      cu = 1 - x2 * 0.5 * (1 - x2 * C12 * (1 - x2 * C30 * (1 - x2 * C56 * (1 - x2 * C90))));
    } else {
      cu = Math.cos(x);
      su = Math.sin(x);
    }
    out[0] = ax * cu + P[k]! * su;
    out[1] = ay * cu + P[k + 1]! * su;
    out[2] = az * cu + P[k + 2]! * su;
  } else {
    const x = ax + u * (D[k + 3]! - ax),
      y = ay + u * (D[k + 4]! - ay),
      z = az + u * (D[k + 5]! - az);
    const r = 1 / Math.sqrt(x * x + y * y + z * z);
    out[0] = x * r;
    out[1] = y * r;
    out[2] = z * r;
  }
  return src.radiusRad[0]!;
}
