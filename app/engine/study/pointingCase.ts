/**
 * Study cases with a pointing-only (roll-free) first target (scenario/pointingOnly.ts):
 *  - the case's target is the reduced target FROM THE CASE'S START (the shortest rotation that
 *    carries the pointed axis b onto its direction r), not the nominal one: every case flies the
 *    pointing-only slew from where it starts;
 *  - 'near-antipode' starts: the pointed axis uniform over the spherical cap of half-angle w about
 *    −r (area-uniform: cos ψ uniform in [cos w, 1], ψ the angle from −r, azimuth uniform; Archimedes'
 *    hat-box theorem — the area of a spherical zone is proportional to its height, from memory),
 *    and a uniform roll about the axis (a rotation by a uniform angle about the inertial axis).
 * A uniform start over SO(3) (Haar) already makes the pointed axis uniform over S² (the image of
 * the Haar measure under q ↦ R(q)b is rotation invariant, hence the uniform measure on S²).
 */
import type { Rng } from '../math/prng';
import type { Quat } from '../math/rotation';
import { qFromAxisAngle, qMultiply, qNormalize, qRotate } from '../math/rotation';
import { evenWarpDirections } from '../control/sphere/potential';
import { reducedTargetAttitude } from '../control/sphere/slew';
import type { PointingOnlyTarget } from '../scenario/pointingOnly';
import type { ResolvedTarget } from '../scenario/resolve';

const tmp = new Float64Array(4);
const x0 = new Float64Array(3);

/**
 * Write into `out` a start attitude whose pointed axis b lies within `withinRad` of −r (uniform
 * over the cap) with a uniform roll about it. `qBase` seeds the construction (any unit quaternion).
 */
export function drawNearAntipode(
  out: Quat,
  rng: Rng,
  p: Pick<PointingOnlyTarget, 'bodyAxis' | 'inertialDirection'>,
  withinRad: number,
  qBase: ArrayLike<number>,
): Quat {
  const r = p.inertialDirection;
  const e = evenWarpDirections(r, 2, 2 * Math.PI * rng.next());
  const cosPsi = 1 - rng.next() * (1 - Math.cos(withinRad));
  const sinPsi = Math.sqrt(Math.max(0, 1 - cosPsi * cosPsi));
  for (let i = 0; i < 3; i++) x0[i] = -cosPsi * r[i]! + sinPsi * e[i]!;
  const onAxis = reducedTargetAttitude(qBase, p.bodyAxis, x0);
  if (!onAxis.ok) throw new Error(`near-antipode draw: ${onAxis.errors[0]!.message}`); // inputs are unit vectors here
  qFromAxisAngle(tmp, x0, 2 * Math.PI * rng.next());
  qMultiply(out, tmp, onAxis.value.q);
  qNormalize(out, out);
  return out;
}

/** The case's first target: the reduced target from the case start for a roll-free target, else the nominal one. */
export function caseTarget(nominal: ResolvedTarget, q0: ArrayLike<number>): ResolvedTarget {
  const p = nominal.pointingOnly;
  if (!p)
    return {
      label: nominal.label,
      form: 'quaternion',
      qInertialFromBody: Float64Array.from(nominal.qInertialFromBody),
      holdS: nominal.holdS,
    };
  const red = reducedTargetAttitude(q0, p.bodyAxis, p.inertialDirection);
  if (!red.ok) throw new Error(`case target: ${red.errors[0]!.message}`); // q0 is a unit quaternion, b and r unit vectors
  return {
    label: nominal.label,
    form: nominal.form,
    qInertialFromBody: red.value.q,
    holdS: nominal.holdS,
    pointingOnly: {
      bodyAxis: Float64Array.from(p.bodyAxis),
      inertialDirection: Float64Array.from(p.inertialDirection),
      qHeldRoll: Float64Array.from(p.qHeldRoll),
    },
  };
}

/** The pointing error angle ∠(R(q) b, r), rad (atan2 form, accurate at 0 and π). */
export function pointingErrorOf(q: ArrayLike<number>, p: Pick<PointingOnlyTarget, 'bodyAxis' | 'inertialDirection'>): number {
  qRotate(x0, q, p.bodyAxis);
  const r = p.inertialDirection;
  const cx = x0[1]! * r[2]! - x0[2]! * r[1]!,
    cy = x0[2]! * r[0]! - x0[0]! * r[2]!,
    cz = x0[0]! * r[1]! - x0[1]! * r[0]!;
  return Math.atan2(Math.hypot(cx, cy, cz), x0[0]! * r[0]! + x0[1]! * r[1]! + x0[2]! * r[2]!);
}
