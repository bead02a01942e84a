/**
 * Exact cone tests along a rotation, used by the path searches instead of sampling.
 *
 * A vector u turned about the unit axis e by φ ∈ [0, θ] (θ ≤ π, Rodrigues' formula) has, against
 * a fixed unit direction c,
 *   c · u(φ) = A + B cos φ + C sin φ,  A = (c·e)(u·e),  B = c·u − A,  C = c · (e × u),
 * whose largest value on [0, θ] is A + √(B² + C²) when the phase φ* = atan2(C, B) lies in [0, θ]
 * and an end value otherwise (likewise the smallest, at φ* + π). The phase test uses signs only:
 * an angle α lies in [0, θ] iff sin α ≥ 0 and sin(θ − α) ≥ 0. So a whole edge — a great-circle
 * arc of the constrained axis (u ⊥ e), or a general eigenaxis rotation of any body axis — is
 * cleared against a cone with a few dot products and no trigonometry (cos θ, sin θ given).
 *
 * A planning cone is {centre c, cosine limit}: a keep-out is clear when the largest c·u stays at or
 * below cos(threshold); a keep-in when the smallest c·u stays at or above cos(threshold).
 */

export interface PlanningCone {
  keepOut: boolean;
  /** Unit centre (inertial), frozen at the slew start. */
  cx: number;
  cy: number;
  cz: number;
  /** Index of the body axis the cone sits on (into the search's list of distinct axes). */
  axis: number;
  /** Threshold angle with margin, source radius and the planner's clearance (rad). */
  thresholdRad: number;
  /** cos(thresholdRad); −2 for thresholds ≥ π and 2 for thresholds ≤ 0 (makeCone). */
  cosLimit: number;
}

/**
 * Whether vector (ux, uy, uz) (unit), turned about unit axis (ex, ey, ez) through [0, θ] with
 * cosT = cos θ, sinT = sin θ, stays clear of the cone.
 */
export function rotationClear(
  cone: PlanningCone,
  ux: number,
  uy: number,
  uz: number,
  ex: number,
  ey: number,
  ez: number,
  cosT: number,
  sinT: number,
): boolean {
  const cx = cone.cx,
    cy = cone.cy,
    cz = cone.cz;
  const ce = cx * ex + cy * ey + cz * ez,
    ue = ux * ex + uy * ey + uz * ez;
  const A = ce * ue;
  const B = cx * ux + cy * uy + cz * uz - A;
  const C = cx * (ey * uz - ez * uy) + cy * (ez * ux - ex * uz) + cz * (ex * uy - ey * ux);
  const f0 = A + B,
    f1 = A + B * cosT + C * sinT;
  if (cone.keepOut) {
    // Largest value: at φ* (direction (B, C)) when inside [0, θ].
    const inside = C >= 0 && B * sinT - C * cosT >= 0;
    const top = inside ? A + Math.sqrt(B * B + C * C) : Math.max(f0, f1);
    return top <= cone.cosLimit;
  }
  // Smallest value: at φ* + π (direction (−B, −C)).
  const inside = C <= 0 && C * cosT - B * sinT >= 0;
  const bottom = inside ? A - Math.sqrt(B * B + C * C) : Math.min(f0, f1);
  return bottom >= cone.cosLimit;
}

/** Whether the unit vector u itself is clear of the cone. */
export function pointClear(cone: PlanningCone, ux: number, uy: number, uz: number): boolean {
  const c = cone.cx * ux + cone.cy * uy + cone.cz * uz;
  return cone.keepOut ? c <= cone.cosLimit : c >= cone.cosLimit;
}

/** A planning cone from a centre and a threshold angle (rad). */
export function makeCone(keepOut: boolean, centre: ArrayLike<number>, axis: number, thresholdRad: number): PlanningCone {
  let cosLimit: number;
  // Beyond π every angle is inside the threshold (keep-out never clear, keep-in always); at or
  // below 0 none is (keep-out always clear, keep-in never).
  if (thresholdRad >= Math.PI) cosLimit = -2;
  else if (thresholdRad <= 0) cosLimit = 2;
  else cosLimit = Math.cos(thresholdRad);
  return { keepOut, cx: centre[0]!, cy: centre[1]!, cz: centre[2]!, axis, thresholdRad, cosLimit };
}
