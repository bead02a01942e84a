/**
 * Boresight pointing error over a run: for a body axis a (an instrument boresight, an antenna),
 * the angle between where the body points it, R(q) a, and where the reference attitude would
 * point it, R(q_ref) a. Unlike the attitude error angle it ignores rotation about the axis itself,
 * which is what a payload engineer asks ("how far off is the imager?").
 *
 * With the convention of math/rotation.ts (q rotates body vectors into the inertial frame,
 * q_e = q_ref* ⊗ q), R(q_ref)ᵀ R(q) = R(q_e), so the angle is the one between a and R(q_e) a. It is
 * computed as atan2(‖a × b‖, a · b), well conditioned at 0 and π where acos of the dot product is
 * not (common numerical practice, no single source).
 *
 * Bounds used by the tests: 0 ≤ boresight error ≤ attitude error angle, with equality when a is
 * perpendicular to the error's rotation axis, and 0 when a lies along it.
 */
import type { RunTrace } from '../sim/types';

export type Axis3 = readonly [number, number, number];

/** Unit vector of `a`, or null for a zero or non-finite vector. */
export function unitAxis(a: ArrayLike<number>): Axis3 | null {
  const x = a[0],
    y = a[1],
    z = a[2];
  if (typeof x !== 'number' || typeof y !== 'number' || typeof z !== 'number') return null;
  const n = Math.hypot(x, y, z);
  if (!(n > 0) || !Number.isFinite(n)) return null;
  return [x / n, y / n, z / n];
}

/**
 * out[k] = angle (rad) between R(q_k) a and R(q_ref,k) a for every sample of the trace; `a` is a
 * unit body axis (use unitAxis). `out` must hold trace.n values; returns it.
 */
export function boresightErrorAngles(out: Float64Array, trace: RunTrace, a: Axis3): Float64Array {
  const q = trace.q;
  const r = trace.qRef;
  const ax = a[0],
    ay = a[1],
    az = a[2];
  for (let k = 0; k < trace.n; k++) {
    const i = 4 * k;
    // q_e = q_ref* ⊗ q (Hamilton, scalar last), written out to avoid a call per sample.
    const x1 = -r[i]!,
      y1 = -r[i + 1]!,
      z1 = -r[i + 2]!,
      w1 = r[i + 3]!;
    const x2 = q[i]!,
      y2 = q[i + 1]!,
      z2 = q[i + 2]!,
      w2 = q[i + 3]!;
    const ex = w1 * x2 + x1 * w2 + y1 * z2 - z1 * y2;
    const ey = w1 * y2 - x1 * z2 + y1 * w2 + z1 * x2;
    const ez = w1 * z2 + x1 * y2 - y1 * x2 + z1 * w2;
    const ew = w1 * w2 - x1 * x2 - y1 * y2 - z1 * z2;
    const s = 1 / Math.sqrt(ex * ex + ey * ey + ez * ez + ew * ew);
    const qx = ex * s,
      qy = ey * s,
      qz = ez * s,
      qw = ew * s;
    // b = q_e ⊗ a ⊗ q_e*: t = 2 (q_v × a); b = a + w t + q_v × t.
    const tx = 2 * (qy * az - qz * ay);
    const ty = 2 * (qz * ax - qx * az);
    const tz = 2 * (qx * ay - qy * ax);
    const bx = ax + qw * tx + (qy * tz - qz * ty);
    const by = ay + qw * ty + (qz * tx - qx * tz);
    const bz = az + qw * tz + (qx * ty - qy * tx);
    const cx = ay * bz - az * by,
      cy = az * bx - ax * bz,
      cz = ax * by - ay * bx;
    out[k] = Math.atan2(Math.sqrt(cx * cx + cy * cy + cz * cz), ax * bx + ay * by + az * bz);
  }
  return out;
}
