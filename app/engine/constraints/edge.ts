/**
 * Whole-attitude edge tests: an eigenaxis rotation between two attitudes checked against cones
 * on several body axes at once, exactly (cone.ts closed form for each axis), plus the small
 * quaternion helpers the searches share.
 *
 * Conventions: qInertialFromBody, scalar-last; the rotation from attitude qa to qb is the
 * inertial-frame rotation Δ = qb ⊗ qa* (shorter way, angle ≤ π) about a fixed inertial axis, the
 * same motion as the body-frame eigenaxis slew qa ⊗ exp(½ φ e_B) that plan/segment.ts flies.
 */
import type { PlanningCone } from './cone';
import { pointClear, rotationClear } from './cone';

const dq = new Float64Array(4);
const us = new Float64Array(3 * 16);

/** out = R(q) v for a unit quaternion q (scalar-last), written at out[o..o+2]. */
export function rotateInto(out: Float64Array, o: number, q: ArrayLike<number>, v: ArrayLike<number>): void {
  const x = q[0]!,
    y = q[1]!,
    z = q[2]!,
    w = q[3]!;
  const tx = 2 * (y * v[2]! - z * v[1]!),
    ty = 2 * (z * v[0]! - x * v[2]!),
    tz = 2 * (x * v[1]! - y * v[0]!);
  out[o] = v[0]! + w * tx + (y * tz - z * ty);
  out[o + 1] = v[1]! + w * ty + (z * tx - x * tz);
  out[o + 2] = v[2]! + w * tz + (x * ty - y * tx);
}

/** out = a ⊗ b* (Hamilton, scalar-last); out may alias neither input. */
function mulConj(out: Float64Array, a: ArrayLike<number>, b: ArrayLike<number>): Float64Array {
  const ax = a[0]!,
    ay = a[1]!,
    az = a[2]!,
    aw = a[3]!;
  const bx = -b[0]!,
    by = -b[1]!,
    bz = -b[2]!,
    bw = b[3]!;
  out[0] = aw * bx + ax * bw + ay * bz - az * by;
  out[1] = aw * by - ax * bz + ay * bw + az * bx;
  out[2] = aw * bz + ax * by - ay * bx + az * bw;
  out[3] = aw * bw - ax * bx - ay * by - az * bz;
  return out;
}

/** Rotation angle (rad, [0, π]) from attitude qa to qb. */
export function rotationAngle(qa: ArrayLike<number>, qb: ArrayLike<number>): number {
  mulConj(dq, qb, qa);
  return 2 * Math.atan2(Math.hypot(dq[0]!, dq[1]!, dq[2]!), Math.abs(dq[3]!));
}

/**
 * Whether the eigenaxis rotation from qa to qb keeps every cone clear: for each cone, its body
 * axis `axes[cone.axis]` is carried along the rotation and tested in closed form.
 */
export function rotationEdgeClear(
  qa: ArrayLike<number>,
  qb: ArrayLike<number>,
  axes: readonly Float64Array[],
  cones: readonly PlanningCone[],
): boolean {
  for (let k = 0; k < axes.length; k++) rotateInto(us, 3 * k, qa, axes[k]!);
  mulConj(dq, qb, qa);
  const sg = dq[3]! < 0 ? -1 : 1;
  let ex = sg * dq[0]!,
    ey = sg * dq[1]!,
    ez = sg * dq[2]!;
  const w = sg * dq[3]!;
  const s = Math.sqrt(ex * ex + ey * ey + ez * ez);
  if (s < 1e-14) {
    for (const c of cones) if (!pointClear(c, us[3 * c.axis]!, us[3 * c.axis + 1]!, us[3 * c.axis + 2]!)) return false;
    return true;
  }
  ex /= s;
  ey /= s;
  ez /= s;
  const th = 2 * Math.atan2(s, w);
  const cosT = Math.cos(th),
    sinT = Math.sin(th);
  for (const c of cones) {
    const o = 3 * c.axis;
    if (!rotationClear(c, us[o]!, us[o + 1]!, us[o + 2]!, ex, ey, ez, cosT, sinT)) return false;
  }
  return true;
}

/** Maximum number of distinct body axes the edge test handles (scratch size). */
export const MAX_AXES = 16;

/**
 * out = the shortest rotation taking unit a to unit b, as a quaternion (scalar-last); for
 * opposite vectors, a half-turn about an axis perpendicular to a.
 */
export function shortestArc(out: Float64Array, a: ArrayLike<number>, b: ArrayLike<number>): Float64Array {
  const c = a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!;
  let x = a[1]! * b[2]! - a[2]! * b[1]!,
    y = a[2]! * b[0]! - a[0]! * b[2]!,
    z = a[0]! * b[1]! - a[1]! * b[0]!,
    w = 1 + c;
  if (w < 1e-12) {
    // Opposite: any axis ⊥ a. Take a × (the coordinate axis least aligned with a).
    const ax = Math.abs(a[0]!),
      ay = Math.abs(a[1]!),
      az = Math.abs(a[2]!);
    const k = ax <= ay && ax <= az ? 0 : ay <= az ? 1 : 2;
    const e = [0, 0, 0];
    e[k] = 1;
    x = a[1]! * e[2]! - a[2]! * e[1]!;
    y = a[2]! * e[0]! - a[0]! * e[2]!;
    z = a[0]! * e[1]! - a[1]! * e[0]!;
    w = 0;
  }
  const n = Math.hypot(x, y, z, w);
  out[0] = x / n;
  out[1] = y / n;
  out[2] = z / n;
  out[3] = w / n;
  return out;
}

/**
 * Greedy shortening of a chain of attitudes: from each kept attitude, jump to the farthest later
 * one whose eigenaxis rotation keeps every cone clear (consecutive ones are clear by assumption).
 */
export function shortcutChain(
  chain: readonly Float64Array[],
  axes: readonly Float64Array[],
  cones: readonly PlanningCone[],
): Float64Array[] {
  const out = [chain[0]!];
  let i = 0;
  while (i < chain.length - 1) {
    let j = chain.length - 1;
    while (j > i + 1 && !rotationEdgeClear(chain[i]!, chain[j]!, axes, cones)) j--;
    out.push(chain[j]!);
    i = j;
  }
  return out;
}
