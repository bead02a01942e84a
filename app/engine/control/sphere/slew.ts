/**
 * The reduced (pointing-only) slew for the planner, and what it saves against a full-attitude slew.
 *
 * Reduced target: from q0, the shortest rotation that carries the body axis b onto the inertial
 * direction r: x0 = R(q0) b, rotation axis n ∝ x0 × r (inertial), angle θ = ∠(x0, r) ∈ [0, π];
 *   q1 = (sin(θ/2) n, cos(θ/2)) ⊗ q0,   so R(q1) b = R_a(θ, n) x0 = r.
 * Seen from the body, q0* ⊗ q1 is a rotation by θ about R(q0)ᵀn, so the eigenaxis planner
 * (plan/segment.ts) times it unchanged, with angle θ. Any rotation that carries x0 onto r turns by
 * at least θ (the angle a rotation moves a unit vector never exceeds its rotation angle: Euler's
 * theorem; standard geometry, no source), so the reduced slew has the smallest angle of every
 * slew with the same final pointing. For θ = π the axis is any unit n ⊥ x0; a fixed choice is made.
 *
 * Smallest ANGLE is not always smallest TIME: the planner's time also depends on the axis through
 * |Je| and the wheel envelopes along Je (references §2), so on a strongly anisotropic vehicle a
 * longer rotation about an easier axis can be faster. `reducedSlewSaving` reports the signed
 * saving as the planner computes it, never an assumed one.
 *
 * control/ may not import plan/ (same rank, layers.config.js): the planner comes in as a function,
 * e.g. `(a, b) => planCheckedSegment(a, b, J, h0, limits)`, whose SegmentVerdict fits `PlannedSlew`.
 */
import type { Issue, Result } from '../../errors';
import { fail, ok } from '../../errors';
import { allFinite } from '../../math/arrays';
import { qMultiply, qRotate } from '../../math/rotation';
import { DEG_PER_RAD } from '../../units';
import { evenWarpDirections, pointingAngle } from './potential';

export interface ReducedSlew {
  /** The reduced target attitude qInertialFromBody [x, y, z, w]. */
  q: Float64Array;
  /** Rotation angle θ = ∠(R(q0) b, r), rad. */
  angleRad: number;
  /** Rotation axis n (inertial, unit). */
  axisInertial: Float64Array;
  /** Rotation axis in the start body frame R(q0)ᵀn (the planner's eigenaxis). */
  axisBody: Float64Array;
}

function readUnit(issues: Issue[], path: string, v: ArrayLike<number> | undefined, n: number, unitTol: number | null): Float64Array | null {
  if (!v || v.length !== n || !allFinite(v)) {
    issues.push({ path, rule: 'finite', message: `${path} must be ${n} finite numbers` });
    return null;
  }
  const a = Float64Array.from({ length: n }, (_, i) => v[i]!);
  const m = Math.hypot(...a);
  if (!(m > 0) || (unitTol !== null && Math.abs(m - 1) > unitTol)) {
    issues.push({
      path,
      rule: unitTol === null ? 'non-zero' : 'unit-norm',
      message: `${path} must be ${unitTol === null ? 'non-zero' : 'a unit quaternion'} (norm ${m})`,
    });
    return null;
  }
  return a.map((x) => x / m);
}

/** The attitude reached from q0 by the shortest rotation carrying body axis b onto inertial r. */
export function reducedTargetAttitude(q0: ArrayLike<number>, b: ArrayLike<number>, r: ArrayLike<number>): Result<ReducedSlew> {
  const issues: Issue[] = [];
  const q = readUnit(issues, 'q0', q0, 4, 1e-6);
  const bb = readUnit(issues, 'axis', b, 3, null);
  const rr = readUnit(issues, 'direction', r, 3, null);
  if (!q || !bb || !rr) return fail(issues);
  const x0 = qRotate(new Float64Array(3), q, bb);
  const c = [x0[1]! * rr[2]! - x0[2]! * rr[1]!, x0[2]! * rr[0]! - x0[0]! * rr[2]!, x0[0]! * rr[1]! - x0[1]! * rr[0]!];
  const s = Math.hypot(c[0]!, c[1]!, c[2]!);
  const theta = pointingAngle(x0, rr);
  let n: Float64Array;
  // below ~1e-12 the cross product's direction is rounding: fall back to a fixed axis ⊥ x0 (any
  // axis ⊥ x0 is exact at θ = π; at θ ≈ 0 the rotation is the identity to rounding anyway)
  if (s > 1e-12) n = Float64Array.from(c, (v) => v / s);
  else n = evenWarpDirections(x0, 1);
  const h = 0.5 * theta;
  const rot = Float64Array.of(Math.sin(h) * n[0]!, Math.sin(h) * n[1]!, Math.sin(h) * n[2]!, Math.cos(h));
  const q1 = qMultiply(new Float64Array(4), rot, q);
  const nb = new Float64Array(3);
  // R(q0)ᵀ n
  const qc = Float64Array.of(-q[0]!, -q[1]!, -q[2]!, q[3]!);
  qRotate(nb, qc, n);
  return ok({ q: q1, angleRad: theta, axisInertial: n, axisBody: nb });
}

/** What the planner returns for one slew (plan/types.ts SegmentVerdict fits this shape). */
export interface PlannedSlew {
  feasible: boolean;
  angleRad: number;
  durationS?: number;
  peakRateRadPerS?: number;
  /** max |h_w| / momentum capacity along h_w over the profile (unmargined). */
  peakMomentumFraction?: number;
  peakTorqueFraction?: number;
  binding?: string;
  reasons?: readonly { rule: string; message: string }[];
}

/** Plans one rest-to-rest slew between two attitudes (unit quaternions). */
export type SlewPlanner = (qStart: Float64Array, qTarget: Float64Array) => PlannedSlew;

export interface ReducedSlewSaving {
  /** The inertial direction r = R(qFull) b both slews end on. */
  direction: Float64Array;
  reducedTarget: ReducedSlew;
  reduced: PlannedSlew;
  full: PlannedSlew;
  /** Full angle − reduced angle, rad (≥ 0 by geometry). */
  angleSavedRad: number;
  /** Full time − reduced time, s (signed; null when either slew is infeasible). */
  timeSavedS: number | null;
  /** timeSavedS / full time (null when undefined). */
  timeSavedFraction: number | null;
  /** Full peak momentum fraction − reduced (signed; null when either is missing). */
  peakMomentumFractionSaved: number | null;
  /** Pointing mismatch ∠(R(q_reduced) b, r), rad: rounding only. */
  pointingResidualRad: number;
  summary: string;
}

/**
 * The saving of the reduced slew against the full-attitude slew to qFull, which has the same
 * pointing of b (r = R(qFull) b): both timed by the same planner.
 */
export function reducedSlewSaving(
  q0: ArrayLike<number>,
  b: ArrayLike<number>,
  qFull: ArrayLike<number>,
  plan: SlewPlanner,
): Result<ReducedSlewSaving> {
  const issues: Issue[] = [];
  const qs = readUnit(issues, 'q0', q0, 4, 1e-6);
  const qf = readUnit(issues, 'qFull', qFull, 4, 1e-6);
  const bb = readUnit(issues, 'axis', b, 3, null);
  if (!qs || !qf || !bb) return fail(issues);
  const r = qRotate(new Float64Array(3), qf, bb);
  const red = reducedTargetAttitude(qs, bb, r);
  if (!red.ok) return red;
  const target = red.value;
  const reduced = plan(qs, target.q);
  const full = plan(qs, qf);
  const both = reduced.feasible && full.feasible && reduced.durationS !== undefined && full.durationS !== undefined;
  const timeSaved = both ? full.durationS! - reduced.durationS! : null;
  const frac = timeSaved !== null && full.durationS! > 0 ? timeSaved / full.durationS! : null;
  const mom =
    reduced.peakMomentumFraction !== undefined && full.peakMomentumFraction !== undefined
      ? full.peakMomentumFraction - reduced.peakMomentumFraction
      : null;
  const xr = qRotate(new Float64Array(3), target.q, bb);
  const deg = (x: number) => (x * DEG_PER_RAD).toFixed(2);
  const summary = both
    ? `Pointing-only slew: ${deg(target.angleRad)}° in ${reduced.durationS!.toFixed(2)} s against ${deg(full.angleRad)}° in ${full.durationS!.toFixed(2)} s for the full attitude (${timeSaved! >= 0 ? 'saves' : 'COSTS'} ${Math.abs(timeSaved!).toFixed(2)} s).`
    : `Pointing-only slew ${deg(target.angleRad)}° (${reduced.feasible ? 'feasible' : 'infeasible'}); full-attitude slew ${deg(full.angleRad)}° (${full.feasible ? 'feasible' : 'infeasible'}): no time comparison.`;
  return ok({
    direction: r,
    reducedTarget: target,
    reduced,
    full,
    angleSavedRad: full.angleRad - reduced.angleRad,
    timeSavedS: timeSaved,
    timeSavedFraction: frac,
    peakMomentumFractionSaved: mom,
    pointingResidualRad: pointingAngle(xr, r),
    summary,
  });
}
