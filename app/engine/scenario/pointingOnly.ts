/**
 * Pointing-only (roll-free) targets: a target that carries `rollFree: true` (pointingOnlySchema.ts)
 * keeps only its attitude form's PRIMARY pair, body axis b → inertial direction r, and becomes the
 * reduced target: the attitude reached from the previous attitude of the chain by the shortest
 * rotation that carries b onto r (control/sphere/slew.ts reducedTargetAttitude). The planner, the
 * full-attitude laws and the pointing laws all fly that attitude; a pointing law reads only b and
 * r from it (R(q_ref) b = r), so its roll about r never matters.
 *
 * The full attitude the form describes (its secondary pair included) is kept as `qHeldRoll`: the
 * same target with its roll held, which the plan times for comparison.
 *
 * Extension point: PRIMARY_AXIS lists the attitude forms that name a pointed body axis. A new
 * target kind with a body axis (a ground site, a station, the Sun, nadir) becomes usable
 * pointing-only by adding its one line there, e.g. `site: (s) => s.site.bodyAxis`; r is then read
 * from the kind's own resolved attitude (r = R(q_form) b), so nothing else changes.
 */
import type { Issue } from '../errors';
import { EngineInputError, issue } from '../errors';
import type { Vec3 } from '../math/mat3';
import type { Quat } from '../math/rotation';
import { qCopy, qCreate, qRotate } from '../math/rotation';
import { evenWarpDirections } from '../control/sphere/potential';
import { reducedTargetAttitude } from '../control/sphere/slew';
import { attitudeForm, resolveAttitude } from './attitude';
import type { AttitudeForm, AttitudeSpec } from './schema';

/** What a pointing-only target keeps (SI, unit vectors). */
export interface PointingOnlyTarget {
  /** The pointed body axis b (unit, body axes). */
  bodyAxis: Vec3;
  /** Its inertial direction r (unit, inertial frame). */
  inertialDirection: Vec3;
  /** The full attitude the entry's form describes (secondary held): the plan's comparison. */
  qHeldRoll: Quat;
}

type SpecOf<F extends AttitudeForm> = Extract<AttitudeSpec, Record<F, unknown>>;

/** Attitude forms that name a pointed (primary) body axis, and where it is. One line per form. */
export const PRIMARY_AXIS: { [F in AttitudeForm]?: (spec: SpecOf<F>) => readonly number[] } = {
  pointing: (s) => s.pointing.bodyAxis,
};

/** The primary body axis of a spec, or null when its form has none. */
export function primaryAxisOf(spec: AttitudeSpec): readonly number[] | null {
  const f = attitudeForm(spec);
  const get = PRIMARY_AXIS[f] as ((s: AttitudeSpec) => readonly number[]) | undefined;
  return get ? get(spec) : null;
}

function unit(v: readonly number[]): Vec3 {
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  return Float64Array.of(v[0]! / n, v[1]! / n, v[2]! / n);
}

/**
 * Resolve a target's attitude into `out`: the form's attitude, or for a roll-free target the
 * reduced target from `previous`. `index` names the target (`targets[index]`) in issues. Returns
 * the pointing-only data (null for a full-attitude target), or false when the target does not
 * resolve (problems in `errors`; a missing `previous` after an earlier failure is skipped silently,
 * its cause being reported already).
 */
export function resolveTargetAttitude(
  out: Quat,
  spec: AttitudeSpec,
  rollFree: boolean,
  previous: Quat | null,
  index: number,
  errors: Issue[],
  warnings: Issue[],
): PointingOnlyTarget | null | false {
  const base = `targets[${index}]`;
  const qForm = qCreate();
  if (!resolveAttitude(qForm, spec, previous, `${base}.attitude`, errors, warnings)) return false;
  if (!rollFree) {
    qCopy(out, qForm);
    return null;
  }
  const axis = primaryAxisOf(spec);
  if (!axis) {
    const forms = Object.keys(PRIMARY_AXIS).join('", "');
    errors.push(
      issue(
        `${base}.rollFree`,
        'primary-axis',
        `${base}.rollFree needs an attitude form that names a pointed body axis ("${forms}"); a ${attitudeForm(spec)} attitude has none, so nothing says which axis is pointed`,
      ),
    );
    return false;
  }
  if (previous === null) return false;
  const b = unit(axis);
  const r = qRotate(new Float64Array(3), qForm, b);
  const red = reducedTargetAttitude(previous, b, r);
  // reducedTargetAttitude refuses only non-finite or zero input, which validation has excluded
  if (!red.ok) throw new EngineInputError(red.errors.map((e) => ({ ...e, path: `${base}.${e.path}` })));
  qCopy(out, red.value.q);
  return { bodyAxis: b, inertialDirection: r, qHeldRoll: qForm };
}

/**
 * A resolved roll-free target written back as a file entry: the "pointing" form with the primary
 * pair and a secondary pair that reproduces qHeldRoll (a body axis ⊥ b and its image), and
 * `rollFree: true`. Resolving it after the same previous attitude gives the same target.
 */
export function rollFreeTargetToFile(label: string, holdS: number, p: PointingOnlyTarget) {
  const s = evenWarpDirections(p.bodyAxis, 1);
  const sI = qRotate(new Float64Array(3), p.qHeldRoll, s);
  return {
    label,
    rollFree: true,
    attitude: {
      pointing: {
        bodyAxis: Array.from(p.bodyAxis),
        inertialDirection: Array.from(p.inertialDirection),
        bodySecondary: Array.from(s),
        inertialSecondary: Array.from(sI),
      },
    },
    holdS,
  };
}
