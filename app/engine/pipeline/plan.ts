/**
 * Stage 4 of the pipeline, plan: the resolved maneuver on the built vehicle → a slew-then-hold
 * timeline within the wheel envelopes (plan/), with per-segment verdicts, and its summary for
 * tables and exports.
 */
import type { Issue, Result } from '../errors';
import { fail } from '../errors';
import { planSequence } from '../plan/sequence';
import type { PlanLimits, SequencePlan } from '../plan/types';
import { applyAxes } from '../wheels/array';
import { envelopeCapacity } from '../wheels/envelope';
import type { ResolvedScenario, ResolvedTarget } from '../scenario/resolve';
import type { PlanSummary, SegmentSummary, Vehicle } from './types';
import { planNumberIssues } from './planCheck';
import { needsTrackingPlan, planOnOrbit, type OrbitStage } from './orbit';

/** What the planner may use of the vehicle's envelopes. */
export function planLimits(s: ResolvedScenario, v: Vehicle): PlanLimits {
  return {
    torqueCapacity: (d) => envelopeCapacity(v.torqueEnvelope, d),
    momentumCapacity: (d) => envelopeCapacity(v.momentumEnvelope, d),
    torqueMargin: s.planning.torqueMargin,
    momentumMargin: s.planning.momentumMargin,
    slewRateLimitRadPerS: s.planning.slewRateLimitRadPerS > 0 ? s.planning.slewRateLimitRadPerS : undefined,
    family: s.planning.profile,
  };
}

/** Stage 4: the sequence plan from the initial attitude (at rest, with the initial wheel momentum), on the model the flight software has. */
export function planManeuver(s: ResolvedScenario, v: Vehicle, orbit: OrbitStage | null = null): Result<SequencePlan> {
  const hBody = applyAxes(new Float64Array(3), v.wheels, s.initial.hWheelNms);
  if (orbit && needsTrackingPlan(s)) return planOnOrbit(s, orbit, v.design.Jperp, hBody, planLimits(s, v));
  const plan = planSequence(
    {
      qStart: s.initial.qInertialFromBody,
      inertia: v.design.Jperp,
      wheelMomentumBody: hBody,
      targets: s.targets.map((t) => ({ q: t.qInertialFromBody, holdS: t.holdS, label: t.label })),
    },
    planLimits(s, v),
  );
  if (plan.ok) {
    const bad = planNumberIssues(plan.value, s);
    return bad.length ? fail(bad, plan.warnings) : plan;
  }
  const errors: Issue[] = plan.errors.map((e) => ({
    ...e,
    path: e.path.startsWith('targets') || e.path.startsWith('qStart') ? e.path : `planning.${e.path}`,
  }));
  return fail(errors, plan.warnings);
}

export function planSummary(plan: SequencePlan, targets: readonly Pick<ResolvedTarget, 'label' | 'holdS'>[]): PlanSummary {
  if (plan.tracking) return trackingPlanSummary(plan, targets);
  let tCursor = 0;
  const segments = plan.segments.map((seg, i) => {
    const tl = plan.timeline.find((e) => e.target === i);
    const label = targets[i]?.label ?? `target ${i + 1}`;
    const holdS = targets[i]?.holdS ?? 0;
    const axisBody = [seg.axisBody[0]!, seg.axisBody[1]!, seg.axisBody[2]!] as [number, number, number];
    if (seg.feasible && seg.method !== 'tracking') {
      const tStart = tl ? tl.slewStartS : tCursor;
      const tEnd = tl ? tl.holdEndS : tStart + seg.durationS + holdS;
      tCursor = tEnd;
      return {
        index: i,
        label,
        tStart,
        slewTimeS: seg.durationS,
        holdS,
        tEnd,
        angleRad: seg.angleRad,
        axisBody,
        feasible: true,
        binding: seg.binding,
        peakRateRadPerS: seg.peakRateRadPerS,
        accelRadPerS2: seg.profile.accelRadPerS2,
        peakTorqueFraction: seg.peakTorqueFraction,
        peakMomentumFraction: seg.peakMomentumFraction,
        reason: seg.summary,
      };
    }
    return unplannedRow(
      i,
      label,
      tCursor,
      holdS,
      seg.angleRad,
      axisBody,
      'reasons' in seg ? seg.reasons.map((r) => r.message).join('; ') : seg.summary,
    );
  });
  return { feasible: plan.feasible, totalTimeS: plan.totalS, segments };
}

/** A plan row for a target that is not flown (infeasible, or after an infeasible one): no slew, no limits used. */
function unplannedRow(
  index: number,
  label: string,
  tCursor: number,
  holdS: number,
  angleRad: number,
  axisBody: [number, number, number],
  reason: string,
): SegmentSummary {
  return {
    index,
    label,
    tStart: tCursor,
    slewTimeS: 0,
    holdS,
    tEnd: tCursor,
    angleRad,
    axisBody,
    feasible: false,
    binding: 'none',
    peakRateRadPerS: 0,
    accelRadPerS2: 0,
    peakTorqueFraction: 0,
    peakMomentumFraction: 0,
    reason,
  };
}

/** The summary of an orbit plan: slew, tracking start and hold of each planned entry. */
function trackingPlanSummary(plan: SequencePlan, targets: readonly Pick<ResolvedTarget, 'label' | 'holdS'>[]): PlanSummary {
  const entries = plan.tracking!.entries;
  let tCursor = 0;
  const segments = plan.segments.map((seg, i) => {
    const e = entries.find((x) => x.target === i);
    const label = targets[i]?.label ?? `target ${i + 1}`;
    const axisBody = [seg.axisBody[0]!, seg.axisBody[1]!, seg.axisBody[2]!] as [number, number, number];
    if (seg.feasible && seg.method === 'tracking' && e) {
      tCursor = e.requestedHoldEndS;
      return {
        index: i,
        label,
        tStart: e.slewStartS,
        slewTimeS: seg.durationS,
        holdS: e.requestedHoldEndS - e.trackStartS,
        tEnd: e.holdEndS,
        angleRad: seg.angleRad,
        axisBody,
        feasible: true,
        binding: seg.binding,
        peakRateRadPerS: seg.peakRateRadPerS,
        accelRadPerS2: seg.peakAccelRadPerS2,
        peakTorqueFraction: seg.peakTorqueFraction,
        peakMomentumFraction: seg.peakMomentumFraction,
        reason: [seg.summary, ...e.notes].join('; '),
        trackStartS: e.trackStartS,
      };
    }
    return unplannedRow(
      i,
      label,
      tCursor,
      targets[i]?.holdS ?? 0,
      seg.angleRad,
      axisBody,
      seg.feasible ? 'not reached: an earlier target is infeasible' : seg.reasons.map((r) => r.message).join('; '),
    );
  });
  return { feasible: plan.feasible, totalTimeS: plan.totalS, segments };
}
