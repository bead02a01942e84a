/**
 * Constrained planning in the pipeline: when the shortest (eigenaxis) slew to a target violates an
 * attitude constraint, plan around it with constraints/slew.ts planConstrainedSlew (geodesic-grid
 * A* for the constrained axis and a whole-attitude lattice, Kjellberg & Lightsey, JGCD 36(5), 2013
 * and 39(3), 2016; each leg timed within the wheel envelopes by plan/segment.ts) and fly its legs
 * as consecutive entries of the sequence's timeline, all flying the same target (ReferenceTable
 * segmentOf), with the hold after the last leg. The controllers track it with feedforward in
 * follow-plan mode exactly as they track a direct slew (plan/reference.ts).
 *
 * Each constrained segment reports the search used, its legs, the extra time against the direct
 * slew and, when there is no path at the grid's resolution (or an end attitude is inside a cone),
 * says so plainly and keeps the direct slew (which the plan check then reports as violating).
 * Directions that move (Sun, Moon) are frozen at the slew start for the search; the whole plan is
 * checked again afterwards with the moving directions (constraints.ts checkPlan).
 */
import { planConstrainedSlew } from '../constraints/slew';
import type { AttitudeConstraint } from '../constraints/types';
import { qRotate, qRotateInverse } from '../math/rotation';
import { buildReferenceTable } from '../plan/sequence';
import type { PlanLimits, SequencePlan, TimelineEntry } from '../plan/types';
import type { ConstraintReport } from './constraints';

/** What the constrained planner did for one target's slew. */
export interface ConstrainedSegment {
  /** Target index. */
  index: number;
  status: 'planned' | 'no-path' | 'endpoint-violation' | 'leg-infeasible';
  /** 'axis' or 'lattice' search (null when nothing was planned). */
  search: 'direct' | 'axis' | 'lattice' | null;
  legs: number;
  /** Slew time of the constrained path and of the direct slew (s); extra = difference. */
  slewTimeS: number;
  directSlewTimeS: number;
  extraTimeS: number;
  /** Smallest margin of the planned legs (rad; the planner's own check), NaN when not planned. */
  minimumMarginRad: number;
  gridLevel: number;
  gridSpacingRad: number;
  message: string;
}

export interface ConstrainedSequence {
  plan: SequencePlan;
  segments: ConstrainedSegment[];
}

/**
 * The leg with its start quaternion on the same sign as the previous end (q and −q are one
 * attitude; the reference must not jump between them at a leg boundary, or a law that acts on the
 * quaternion's sign would see a 360° error and unwind).
 */
function signContinuous(p: TimelineEntry['plan'], prevEnd: ArrayLike<number>): TimelineEntry['plan'] {
  const q = p.qStart;
  if (q[0]! * prevEnd[0]! + q[1]! * prevEnd[1]! + q[2]! * prevEnd[2]! + q[3]! * prevEnd[3]! >= 0) return p;
  const neg = (v: ArrayLike<number>) => Float64Array.from({ length: 4 }, (_, i) => -v[i]!);
  return { ...p, qStart: neg(p.qStart), qEnd: neg(p.qEnd) };
}

/** Whether the check shows a violation during [t0, t1]. */
function violatedDuring(r: ConstraintReport, t0: number, t1: number): boolean {
  return r.constraints.some((c) => c.intervals.some((iv) => iv.endS > t0 && iv.startS < t1));
}

/**
 * Replan every slew of the timeline whose direct path violates a constraint (per `check` of the
 * direct plan). Returns null when no slew needed it. Later slews keep their attitudes and are
 * shifted in time by the extra time of earlier ones.
 */
export function planAroundConstraints(
  plan: SequencePlan,
  check: ConstraintReport,
  constraints: readonly AttitudeConstraint[],
  holds: readonly number[],
  limits: PlanLimits,
): ConstrainedSequence | null {
  const tab = plan.reference;
  const bad = plan.timeline.filter((e) => violatedDuring(check, e.slewStartS, e.slewEndS));
  if (!bad.length) return null;
  const hInertial = qRotate(new Float64Array(3), tab.qInitial, tab.wheelMomentumInitialBody);
  const timeline: TimelineEntry[] = [];
  const segmentOf: number[] = [];
  const segments: ConstrainedSegment[] = [];
  let t = 0;
  let prevEnd: ArrayLike<number> = tab.qInitial;
  for (const e of plan.timeline) {
    const hold = holds[e.target] ?? e.holdEndS - e.slewEndS;
    const direct = e.plan;
    const push = (pIn: TimelineEntry['plan'], start: number, holdS: number) => {
      const p = signContinuous(pIn, prevEnd);
      prevEnd = p.qEnd;
      timeline.push({
        target: e.target,
        label: e.label,
        slewStartS: start,
        slewEndS: start + p.durationS,
        holdEndS: start + p.durationS + holdS,
        plan: p,
      });
      segmentOf.push(e.target);
    };
    if (!bad.includes(e)) {
      push(direct, t, hold);
      t += direct.durationS + hold;
      continue;
    }
    const hBody = qRotateInverse(new Float64Array(3), direct.qStart, hInertial);
    const r = planConstrainedSlew(
      { qStart: direct.qStart, qTarget: direct.qEnd, inertia: tab.inertia, wheelMomentumBody: hBody, constraints, startTimeS: t },
      limits,
    );
    const v = r.ok ? r.value : null;
    if (v && v.status === 'planned') {
      v.legs.forEach((leg, k) => push(leg.plan, t + leg.startS, k === v.legs.length - 1 ? hold : 0));
      segments.push({
        index: e.target,
        status: 'planned',
        search: v.search,
        legs: v.legs.length,
        slewTimeS: v.totalTimeS,
        directSlewTimeS: direct.durationS,
        extraTimeS: v.totalTimeS - direct.durationS,
        minimumMarginRad: v.minimumMarginRad,
        gridLevel: v.gridLevel,
        gridSpacingRad: v.gridSpacingRad,
        message: `planned around the constraints (${v.search} search, ${v.legs.length} legs): ${v.totalTimeS.toFixed(2)} s against ${direct.durationS.toFixed(2)} s for the shortest slew (+${(v.totalTimeS - direct.durationS).toFixed(2)} s)`,
      });
      t += v.totalTimeS + hold;
      continue;
    }
    const why = v ? v.message : r.ok ? '' : r.errors.map((x) => x.message).join('; ');
    segments.push({
      index: e.target,
      status: v ? (v.status as ConstrainedSegment['status']) : 'no-path',
      search: null,
      legs: 1,
      slewTimeS: direct.durationS,
      directSlewTimeS: direct.durationS,
      extraTimeS: 0,
      minimumMarginRad: NaN,
      gridLevel: v && v.status === 'no-path' ? v.gridLevel : 0,
      gridSpacingRad: v && v.status === 'no-path' ? v.gridSpacingRad : NaN,
      message: `no constrained path: ${why}; the shortest slew is kept and violates`,
    });
    push(direct, t, hold);
    t += direct.durationS + hold;
  }
  const reference = buildReferenceTable(tab.inertia, tab.qInitial, tab.wheelMomentumInitialBody, timeline);
  reference.segmentOf = Int32Array.from(segmentOf);
  return { plan: { ...plan, timeline, totalS: t, reference }, segments };
}
