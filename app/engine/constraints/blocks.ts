/**
 * Block kernels of the history check (check.ts): body axes rotated into inertial axes and source
 * directions interpolated for a block of samples, written into scratch blocks made per call.
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

/**
 * Body axes rotated into inertial axes for samples [b0, b1): out[k][3(i−b0)..] = R(q_i/|q_i|) a_k,
 * R = I + (2/|q|²)(w [q_v]× + [q_v]×²), one matrix per sample shared by the axes marked needed.
 */
export function rotateBlock(
  out: readonly Float64Array[],
  q: Float64Array,
  b0: number,
  b1: number,
  axes: readonly Float64Array[],
  needed: Uint8Array,
): void {
  const m = axes.length;
  for (let i = b0, o = 0; i < b1; i++, o += 3) {
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
    const r00 = 1 - yy - zz,
      r01 = xy - wz,
      r02 = xz + wy,
      r10 = xy + wz,
      r11 = 1 - xx - zz,
      r12 = yz - wx,
      r20 = xz - wy,
      r21 = yz + wx,
      r22 = 1 - xx - yy;
    for (let k = 0; k < m; k++) {
      if (!needed[k]) continue;
      const a = axes[k]!,
        v = out[k]!;
      const ax = a[0]!,
        ay = a[1]!,
        az = a[2]!;
      v[o] = r00 * ax + r01 * ay + r02 * az;
      v[o + 1] = r10 * ax + r11 * ay + r12 * az;
      v[o + 2] = r20 * ax + r21 * ay + r22 * az;
    }
  }
}

export function fillFixed(dir: Float64Array, rad: Float64Array, src: PreparedSource): void {
  for (let o = 0; o < dir.length; o += 3) dir.set(src.directions.subarray(0, 3), o);
  rad.fill(src.radiusRad[0]!);
}

/**
 * Interpolated source directions (and radii) for samples [b0, b1); j is the running interval
 * cursor. The same formulas as source.ts sourceAtInterval, written out in one loop per kind.
 */
export function sourceBlock(
  dir: Float64Array,
  rad: Float64Array,
  src: PreparedSource,
  t: Float64Array,
  b0: number,
  b1: number,
  j: number,
): number {
  const T = src.timesS,
    D = src.directions,
    A = src.arcAngleRad,
    P = src.arcBasis,
    last = T.length - 2;
  if (b0 === 0) j = sampleInterval(T, t[0]!);
  if (src.radiusVaries) {
    for (let i = b0, o = 0; i < b1; i++, o += 3) {
      const ti = t[i]!;
      while (j < last && T[j + 1]! <= ti) j++;
      rad[i - b0] = sourceAtInterval(dir, o, src, j, ti);
    }
    return j;
  }
  const gc = src.greatCircle;
  // Per-interval values, reloaded only when the interval changes.
  let t0 = 0,
    t1 = -Infinity,
    inv = 0,
    ax = 0,
    ay = 0,
    az = 0,
    bx = 0,
    by = 0,
    bz = 0,
    om = 0;
  for (let i = b0, o = 0; i < b1; i++, o += 3) {
    const ti = t[i]!;
    if (ti >= t1 || t1 === -Infinity) {
      while (j < last && T[j + 1]! <= ti) j++;
      const k = 3 * j;
      t0 = T[j]!;
      t1 = j < last ? T[j + 1]! : Infinity;
      inv = 1 / (T[j + 1]! - t0);
      ax = D[k]!;
      ay = D[k + 1]!;
      az = D[k + 2]!;
      // Great circle: b holds the unit p_j of the arc; linear: b holds the next sample.
      bx = gc ? P[k]! : D[k + 3]!;
      by = gc ? P[k + 1]! : D[k + 4]!;
      bz = gc ? P[k + 2]! : D[k + 5]!;
      om = A[j]!;
    }
    let u = (ti - t0) * inv;
    u = u < 0 ? 0 : u > 1 ? 1 : u;
    if (gc) {
      const x = u * om;
      let cu: number, su: number;
      if (x <= SMALL_ARC) {
        // Taylor series of sin and cos to x⁹ and x¹⁰ (multiplications by reciprocal constants).
        const x2 = x * x;
        su = x * (1 - x2 * C6 * (1 - x2 * C20 * (1 - x2 * C42 * (1 - x2 * C72))));
        cu = 1 - x2 * 0.5 * (1 - x2 * C12 * (1 - x2 * C30 * (1 - x2 * C56 * (1 - x2 * C90))));
      } else {
        cu = Math.cos(x);
        su = Math.sin(x);
      }
      dir[o] = ax * cu + bx * su;
      dir[o + 1] = ay * cu + by * su;
      dir[o + 2] = az * cu + bz * su;
    } else {
      const x = ax + u * (bx - ax),
        y = ay + u * (by - ay),
        z = az + u * (bz - az);
      const r = 1 / Math.sqrt(x * x + y * y + z * z);
      dir[o] = x * r;
      dir[o + 1] = y * r;
      dir[o + 2] = z * r;
    }
  }
  rad.fill(src.radiusRad[0]!, 0, b1 - b0);
  return j;
}
