/**
 * Simple capacity functions for PlanLimits: an axis-aligned box. An orthogonal triad of
 * identical wheels (spin axes = body axes, W = I) has a cube as its torque and momentum envelope
 * (references §3, after Markley, Reynolds, Liu & Lebsock, "Maximum Torque and Momentum Envelopes
 * for Reaction-Wheel Arrays", JGCD 33(5), 2010: the envelope is the cube of wheel limits mapped
 * through the axis matrix). General arrays take their zonotope envelopes from the wheels module.
 */
import type { Vec3 } from '../math/mat3';

/**
 * Capacity along a direction d of the box |x_i| ≤ l_i: the largest r with |r d_i| ≤ l_i for all
 * i, i.e. min over d_i ≠ 0 of l_i / |d_i| — for a unit d, the distance from the centre to the
 * box surface along d. A zero d gives 0.
 */
export function boxCapacity(halfWidths: ArrayLike<number>): (d: Vec3) => number {
  const l0 = halfWidths[0]!,
    l1 = halfWidths[1]!,
    l2 = halfWidths[2]!;
  return (d: Vec3): number => {
    let r = Infinity;
    const a0 = Math.abs(d[0]!),
      a1 = Math.abs(d[1]!),
      a2 = Math.abs(d[2]!);
    if (a0 > 0) r = Math.min(r, l0 / a0);
    if (a1 > 0) r = Math.min(r, l1 / a1);
    if (a2 > 0) r = Math.min(r, l2 / a2);
    return r === Infinity ? 0 : r;
  };
}

/** The cube |x_i| ≤ l: capacity along unit d is l / max|d_i|. */
export function cubeCapacity(l: number): (d: Vec3) => number {
  return boxCapacity([l, l, l]);
}
