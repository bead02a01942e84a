/**
 * Where a flight's reference comes from (ReferenceSource, closedLoop.ts):
 *  - follow-plan: the planned slew profile (attitude, rate, acceleration), plan/reference.ts;
 *  - step-target: the target of the active segment, at rest, switched at the planned slew starts;
 *  - a fixed attitude at rest (regulation, e.g. a study case).
 */
import { evaluateReference } from '../plan/reference';
import type { SequencePlan } from '../plan/types';
import type { ReferenceSource } from './closedLoop';

/** Slew start times of the flyable timeline (where the reference changes segment). */
function slewStarts(plan: SequencePlan): Float64Array {
  return Float64Array.from(plan.timeline, (e) => e.slewStartS);
}

/** follow-plan: the planned eigenaxis reference (`pointingAxes`: ReferenceSource.pointingAxes). */
export function followPlanReference(plan: SequencePlan, pointingAxes?: Float64Array): ReferenceSource {
  return {
    at: (t, q, w, wd) => Math.max(0, evaluateReference(plan, t, q, w, wd)),
    switchTimes: slewStarts(plan),
    ...(pointingAxes ? { pointingAxes } : {}),
  };
}

/**
 * step-target: the target of the active segment, at rest (no profile), switched at the planned
 * slew starts. Target quaternions are copied into one flat table up front, so a call allocates
 * nothing (it runs at every sample, and at every flow evaluation in the ideal mode).
 */
export function stepTargetReference(
  plan: SequencePlan,
  targets: Float64Array,
  qInitial: ArrayLike<number>,
  pointingAxes?: Float64Array,
): ReferenceSource {
  const starts = slewStarts(plan);
  const m = starts.length;
  const table = new Float64Array(4 * (m + 1)); // entry 0: the initial attitude, k + 1: segment k's target
  const segOf = new Int32Array(m + 1);
  for (let i = 0; i < 4; i++) table[i] = qInitial[i]!;
  for (let k = 0; k < m; k++) {
    const tg = plan.timeline[k]!.target;
    for (let i = 0; i < 4; i++) table[4 * (k + 1) + i] = targets[4 * tg + i]!;
    segOf[k + 1] = Math.max(0, tg);
  }
  return {
    switchTimes: starts,
    ...(pointingAxes ? { pointingAxes } : {}),
    at: (t, q, w, wd) => {
      let k = 0;
      while (k < m && t >= starts[k]! - 1e-12) k++;
      const o = 4 * k;
      q[0] = table[o]!;
      q[1] = table[o + 1]!;
      q[2] = table[o + 2]!;
      q[3] = table[o + 3]!;
      w[0] = w[1] = w[2] = 0;
      wd[0] = wd[1] = wd[2] = 0;
      return segOf[k]!;
    },
  };
}

/** Regulation to a fixed attitude at rest, one segment. */
export function fixedAttitudeReference(q: ArrayLike<number>): ReferenceSource {
  const q0 = q[0]!,
    q1 = q[1]!,
    q2 = q[2]!,
    q3 = q[3]!;
  return {
    at: (_t, qo, w, wd) => {
      qo[0] = q0;
      qo[1] = q1;
      qo[2] = q2;
      qo[3] = q3;
      w[0] = w[1] = w[2] = 0;
      wd[0] = wd[1] = wd[2] = 0;
      return 0;
    },
  };
}
