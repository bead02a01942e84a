/**
 * Block kernels of the history check (check.ts): body axes rotated into inertial axes and source
 * directions interpolated for a block of samples, written into scratch blocks made per call.
 */
import { sampleInterval, SMALL_ARC, sourceAtInterval } from './source';
import type { PreparedSource } from './types';

/** Body axis a rotated into inertial axes for samples [b0, b1): out[3(i−b0)..] = R(q_i) a. */
export function rotateBlock(out: Float64Array, q: Float64Array, b0: number, b1: number, a: Float64Array): void {
  const ax = a[0]!,
    ay = a[1]!,
    az = a[2]!;
  for (let i = b0, o = 0; i < b1; i++, o += 3) {
    const x = q[4 * i]!,
      y = q[4 * i + 1]!,
      z = q[4 * i + 2]!,
      w = q[4 * i + 3]!;
    const k = 2 / (x * x + y * y + z * z + w * w);
    const tx = k * (y * az - z * ay),
      ty = k * (z * ax - x * az),
      tz = k * (x * ay - y * ax);
    out[o] = ax + w * tx + (y * tz - z * ty);
    out[o + 1] = ay + w * ty + (z * tx - x * tz);
    out[o + 2] = az + w * tz + (x * ty - y * tx);
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
  let t0 = T[j]!,
    t1 = T[j + 1]!,
    inv = 1 / (t1 - t0),
    k = 3 * j;
  for (let i = b0, o = 0; i < b1; i++, o += 3) {
    const ti = t[i]!;
    if (ti >= t1 && j < last) {
      while (j < last && T[j + 1]! <= ti) j++;
      t0 = T[j]!;
      t1 = T[j + 1]!;
      inv = 1 / (t1 - t0);
      k = 3 * j;
    }
    let u = (ti - t0) * inv;
    u = u < 0 ? 0 : u > 1 ? 1 : u;
    const ax = D[k]!,
      ay = D[k + 1]!,
      az = D[k + 2]!;
    if (src.greatCircle) {
      const x = u * A[j]!;
      let cu: number, su: number;
      if (x <= SMALL_ARC) {
        const x2 = x * x;
        su = x * (1 - (x2 / 6) * (1 - (x2 / 20) * (1 - (x2 / 42) * (1 - x2 / 72))));
        cu = 1 - (x2 / 2) * (1 - (x2 / 12) * (1 - (x2 / 30) * (1 - (x2 / 56) * (1 - x2 / 90))));
      } else {
        cu = Math.cos(x);
        su = Math.sin(x);
      }
      dir[o] = ax * cu + P[k]! * su;
      dir[o + 1] = ay * cu + P[k + 1]! * su;
      dir[o + 2] = az * cu + P[k + 2]! * su;
    } else {
      const x = ax + u * (D[k + 3]! - ax),
        y = ay + u * (D[k + 4]! - ay),
        z = az + u * (D[k + 5]! - az);
      const r = 1 / Math.sqrt(x * x + y * y + z * z);
      dir[o] = x * r;
      dir[o + 1] = y * r;
      dir[o + 2] = z * r;
    }
  }
  rad.fill(src.radiusRad[0]!, 0, b1 - b0);
  return j;
}
