/**
 * One attitude entry of a scenario → a unit quaternion qInertialFromBody ([x, y, z, w]).
 *
 * - quaternion: normalised with a warning when its norm is within 1e-6 of 1, rejected otherwise
 *   (the zero quaternion gets its own message). The sign is kept: quaternion PD treats q and −q
 *   differently, and the user may have chosen the lift on purpose.
 * - euler: intrinsic sequence via qFromEuler (degrees in the file, radians here).
 * - pointing: TRIAD two-vector attitude via qFromTwoVectors; zero or parallel vectors are errors
 *   naming the field.
 * - relative: q_k = q_(k−1) ⊗ q_rel, q_rel a rotation about an axis of the previous body frame.
 */
import type { Issue } from '../errors';
import { issue } from '../errors';
import type { Quat } from '../math/rotation';
import { qCopy, qCreate, qFromAxisAngle, qFromEuler, qFromTwoVectors, qMultiply, qNorm } from '../math/rotation';
import type { AttitudeForm, AttitudeSpec } from './schema';
import { RAD_PER_DEG } from '../units';

/** A quaternion within this of unit norm is normalised (with a warning); beyond it, rejected. */
export const QUATERNION_NORM_TOLERANCE = 1e-6;
/** Below this departure from unit norm nothing is said (round-off of a correctly written value). */
const SILENT_NORM_DEPARTURE = 1e-12;
/** |a × b| / (|a||b|) below this counts as parallel (same tolerance qFromTwoVectors uses). */
const PARALLEL_TOL = 1e-9;

export function attitudeForm(spec: AttitudeSpec): AttitudeForm {
  if ('quaternion' in spec) return 'quaternion';
  if ('euler' in spec) return 'euler';
  if ('pointing' in spec) return 'pointing';
  return 'relative';
}

function norm3(v: readonly number[]): number {
  return Math.hypot(v[0]!, v[1]!, v[2]!);
}

/**
 * The direction of `v` divided by its largest component magnitude, so that later products neither
 * underflow (a component of 5e-324 squared is 0, and normalising then divides by zero) nor
 * overflow (three components of 1e308): any non-zero finite vector gives a finite direction.
 * Vectors of ordinary length are used as given, so their results stay bit for bit the same.
 */
function scaled(v: readonly number[]): number[] {
  const n = norm3(v);
  if (n > 1e-150 && n < 1e150) return [v[0]!, v[1]!, v[2]!]; // ordinary lengths: as given
  const m = Math.max(Math.abs(v[0]!), Math.abs(v[1]!), Math.abs(v[2]!));
  return [v[0]! / m, v[1]! / m, v[2]! / m];
}

function sinAngle(a: readonly number[], b: readonly number[]): number {
  const cx = a[1]! * b[2]! - a[2]! * b[1]!,
    cy = a[2]! * b[0]! - a[0]! * b[2]!,
    cz = a[0]! * b[1]! - a[1]! * b[0]!;
  return Math.hypot(cx, cy, cz) / (norm3(a) * norm3(b));
}

/**
 * Resolve `spec` into `out`. `previous` is the attitude a relative entry composes on (null for
 * the initial attitude, or when the previous entry could not be resolved: then a relative entry
 * is skipped silently, since its cause is already reported). Returns true when `out` holds a unit
 * quaternion.
 */
export function resolveAttitude(
  out: Quat,
  spec: AttitudeSpec,
  previous: Quat | null,
  path: string,
  errors: Issue[],
  warnings: Issue[],
  isInitial = false,
): boolean {
  if ('quaternion' in spec) {
    const p = `${path}.quaternion`;
    const q = spec.quaternion;
    const n = qNorm(q);
    if (n === 0) {
      errors.push(
        issue(
          p,
          'non-zero',
          `${p} is the zero quaternion, which is not a rotation; give a unit quaternion [x, y, z, w] (identity: [0, 0, 0, 1])`,
        ),
      );
      return false;
    }
    if (Math.abs(n - 1) > QUATERNION_NORM_TOLERANCE) {
      errors.push(
        issue(
          p,
          'unit-norm',
          `${p} has norm ${n.toPrecision(9)}; an attitude quaternion must have unit norm (within ${QUATERNION_NORM_TOLERANCE})`,
        ),
      );
      return false;
    }
    if (Math.abs(n - 1) > SILENT_NORM_DEPARTURE) {
      warnings.push(issue(p, 'normalised', `${p} had norm ${n.toPrecision(12)} and was normalised to 1`));
    }
    out[0] = q[0]! / n;
    out[1] = q[1]! / n;
    out[2] = q[2]! / n;
    out[3] = q[3]! / n;
    return true;
  }
  if ('euler' in spec) {
    const a = spec.euler.anglesDeg;
    qFromEuler(out, spec.euler.sequence, a[0]! * RAD_PER_DEG, a[1]! * RAD_PER_DEG, a[2]! * RAD_PER_DEG);
    return true;
  }
  if ('pointing' in spec) {
    const pt = spec.pointing;
    const base = `${path}.pointing`;
    let good = true;
    for (const k of ['bodyAxis', 'inertialDirection', 'bodySecondary', 'inertialSecondary'] as const) {
      if (!(norm3(pt[k]) > 0)) {
        errors.push(issue(`${base}.${k}`, 'non-zero', `${base}.${k} is the zero vector; a direction needs a non-zero length`));
        good = false;
      }
    }
    if (!good) return false;
    const v = {
      bodyAxis: scaled(pt.bodyAxis),
      inertialDirection: scaled(pt.inertialDirection),
      bodySecondary: scaled(pt.bodySecondary),
      inertialSecondary: scaled(pt.inertialSecondary),
    };
    if (sinAngle(v.bodyAxis, v.bodySecondary) < PARALLEL_TOL) {
      errors.push(
        issue(
          `${base}.bodySecondary`,
          'not-parallel',
          `${base}.bodySecondary is parallel to ${base}.bodyAxis, so it cannot fix the rotation about that axis; choose a secondary axis at an angle to it`,
        ),
      );
      good = false;
    }
    if (sinAngle(v.inertialDirection, v.inertialSecondary) < PARALLEL_TOL) {
      errors.push(
        issue(
          `${base}.inertialSecondary`,
          'not-parallel',
          `${base}.inertialSecondary is parallel to ${base}.inertialDirection, so it cannot fix the rotation about that direction; choose a secondary direction at an angle to it`,
        ),
      );
      good = false;
    }
    if (!good) return false;
    if (!qFromTwoVectors(out, v.bodyAxis, v.inertialDirection, v.bodySecondary, v.inertialSecondary, PARALLEL_TOL)) {
      errors.push(issue(base, 'not-parallel', `${base}: the primary and secondary vectors do not define an attitude`));
      return false;
    }
    return true;
  }
  const rel = spec.relative;
  const p = `${path}.relative`;
  if (isInitial) {
    errors.push(
      issue(
        p,
        'no-previous',
        `${p}: the initial attitude has no previous attitude to be relative to; use a quaternion, Euler or pointing attitude`,
      ),
    );
    return false;
  }
  if (!(norm3(rel.axis) > 0)) {
    errors.push(issue(`${p}.axis`, 'non-zero', `${p}.axis is the zero vector; a rotation axis needs a non-zero length`));
    return false;
  }
  if (previous === null) return false;
  const qRel = qFromAxisAngle(qCreate(), scaled(rel.axis), rel.angleDeg * RAD_PER_DEG);
  const prev = qCopy(qCreate(), previous);
  qMultiply(out, prev, qRel);
  return true;
}
