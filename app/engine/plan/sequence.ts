/**
 * A list of targets with hold times → per-target verdicts and a slew-then-hold timeline.
 *
 * No external torque is modelled, so the total momentum H is fixed in inertial axes: the wheel
 * momentum at rest at attitude q is R(q)ᵀ H_I, whatever path led there. Each segment is planned
 * from the previous target (even after an infeasible one, so the user sees every problem); the
 * flyable timeline stops before the first infeasible segment.
 */
import { fail, IssueList, ok, type Result } from '../errors';
import type { Mat3 } from '../math/mat3';
import { qRotate, qRotateInverse, type Quat } from '../math/rotation';
import { planCheckedSegment } from './segment';
import type { PlanLimits, ReferenceTable, SegmentVerdict, SequencePlan, TimelineEntry } from './types';
import { checkLimits, readInertia, readQuat, readVec3 } from './validate';

export interface SequenceTarget {
  /** Target attitude qInertialFromBody [x, y, z, w]. */
  q: ArrayLike<number>;
  /** Time to hold the target at rest after arriving (s, ≥ 0). */
  holdS: number;
  label?: string;
}

export interface SequenceInput {
  /** Attitude at t = 0, body at rest. */
  qStart: ArrayLike<number>;
  /** Inertia J, 9 numbers column-major (kg·m²). */
  inertia: ArrayLike<number>;
  /** Wheel momentum G h in body axes at t = 0 (N·m·s). */
  wheelMomentumBody: ArrayLike<number>;
  targets: readonly SequenceTarget[];
}

export function planSequence(input: SequenceInput, limits: PlanLimits): Result<SequencePlan> {
  const list = new IssueList();
  const q0 = readQuat(list, 'qStart', input?.qStart);
  const J = readInertia(list, 'inertia', input?.inertia);
  const h0 = readVec3(list, 'wheelMomentumBody', input?.wheelMomentumBody);
  const limitsOk = checkLimits(list, 'limits', limits);
  const targets = input?.targets;
  const qs: (Quat | null)[] = [];
  if (!Array.isArray(targets)) {
    list.add('targets', 'type', 'targets must be a list of {q, holdS}');
  } else {
    targets.forEach((tg: SequenceTarget, k: number) => {
      const path = `targets[${k}]`;
      if (tg === null || typeof tg !== 'object') {
        list.add(path, 'type', `${path} must be an object {q, holdS}`);
        qs.push(null);
        return;
      }
      qs.push(readQuat(list, `${path}.q`, tg.q));
      if (list.finite(`${path}.holdS`, tg.holdS) && tg.holdS < 0) {
        list.add(`${path}.holdS`, 'non-negative', `${path}.holdS must be zero or more seconds (got ${tg.holdS})`);
      }
      if (tg.label !== undefined && typeof tg.label !== 'string') list.add(`${path}.label`, 'type', `${path}.label must be text`);
    });
  }
  if (!list.empty || !q0 || !J || !h0 || !limitsOk) return fail(list.items);

  const hInertial = qRotate(new Float64Array(3), q0, h0);
  const segments: SegmentVerdict[] = [];
  const timeline: TimelineEntry[] = [];
  let firstInfeasible = -1;
  let qPrev: Quat = q0;
  let t = 0;
  for (let k = 0; k < targets.length; k++) {
    const hPrev = qRotateInverse(new Float64Array(3), qPrev, hInertial);
    const v = planCheckedSegment(qPrev, qs[k] as Quat, J, hPrev, limits);
    segments.push(v);
    if (!v.feasible && firstInfeasible < 0) firstInfeasible = k;
    if (v.feasible && firstInfeasible < 0) {
      const slewEnd = t + v.durationS;
      const holdEnd = slewEnd + targets[k].holdS;
      timeline.push({
        target: k,
        label: targets[k].label ?? `target ${k + 1}`,
        slewStartS: t,
        slewEndS: slewEnd,
        holdEndS: holdEnd,
        plan: v,
      });
      t = holdEnd;
    }
    qPrev = v.qEnd;
  }
  return ok({
    feasible: firstInfeasible < 0,
    segments,
    timeline,
    firstInfeasible,
    totalS: t,
    reference: buildReferenceTable(J, q0, h0, timeline),
  });
}

/** Flatten a timeline for allocation-free evaluation (reference.ts). */
export function buildReferenceTable(
  J: Mat3,
  qInitial: Quat,
  hInitial: ArrayLike<number>,
  timeline: readonly TimelineEntry[],
): ReferenceTable {
  const n = timeline.length;
  const tab: ReferenceTable = {
    n,
    inertia: Float64Array.from(J),
    qInitial: Float64Array.from(qInitial),
    wheelMomentumInitialBody: Float64Array.from(hInitial),
    qFinal: Float64Array.from(n ? timeline[n - 1]!.plan.qEnd : qInitial),
    wheelMomentumFinalBody: Float64Array.from(n ? timeline[n - 1]!.plan.wheelMomentumEndBody : hInitial),
    slewStartS: new Float64Array(n),
    slewEndS: new Float64Array(n),
    holdEndS: new Float64Array(n),
    q0: new Float64Array(4 * n),
    axis: new Float64Array(3 * n),
    h0: new Float64Array(3 * n),
    angle: new Float64Array(n),
    accel: new Float64Array(n),
    peakRate: new Float64Array(n),
    accelTime: new Float64Array(n),
    coastTime: new Float64Array(n),
  };
  timeline.forEach((e, k) => {
    const p = e.plan;
    tab.slewStartS[k] = e.slewStartS;
    tab.slewEndS[k] = e.slewEndS;
    tab.holdEndS[k] = e.holdEndS;
    tab.q0.set(p.qStart, 4 * k);
    tab.axis.set(p.axisBody, 3 * k);
    tab.h0.set(p.wheelMomentumStartBody, 3 * k);
    tab.angle[k] = p.profile.angleRad;
    tab.accel[k] = p.profile.accelRadPerS2;
    tab.peakRate[k] = p.profile.peakRateRadPerS;
    tab.accelTime[k] = p.profile.accelTimeS;
    tab.coastTime[k] = p.profile.coastTimeS;
  });
  return tab;
}
