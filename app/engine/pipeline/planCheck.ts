/**
 * The plan stage's last check: every quantity of the flyable timeline is a finite number and every
 * slew through a non-zero angle has a positive acceleration and a positive duration. Extreme but
 * valid inputs can break that without any single field being out of range — a torque margin of
 * 5e-324 underflows the planned acceleration to 0 and the slew time to NaN — and a plan with NaN in
 * it must be refused here, naming the fields that drive the bad quantity, not printed as
 * "feasible, total NaN s" or flown.
 */
import type { Issue } from '../errors';
import type { SegmentPlan, SequencePlan } from '../plan/types';
import type { ResolvedScenario } from '../scenario/resolve';

function finitePositive(v: number): boolean {
  return Number.isFinite(v) && v > 0;
}

function show(v: number): string {
  if (Number.isNaN(v)) return 'undefined (not a number)';
  return Number.isFinite(v) ? String(Number(v.toPrecision(6))) : String(v);
}

/** The first thing wrong with one feasible segment's numbers, with the field that drives it. */
function segmentProblem(p: SegmentPlan, s: ResolvedScenario): { path: string; message: string } | null {
  const pr = p.profile;
  const margins = `planning.torqueMargin = ${show(s.planning.torqueMargin)}, planning.momentumMargin = ${show(s.planning.momentumMargin)}`;
  const numbers: [string, number][] = [
    ['slew time', p.durationS],
    ['acceleration', pr.accelRadPerS2],
    ['peak rate', pr.peakRateRadPerS],
    ['acceleration time', pr.accelTimeS],
    ['coast time', pr.coastTimeS],
    ['peak torque fraction', p.peakTorqueFraction],
    ['peak momentum fraction', p.peakMomentumFraction],
  ];
  const bad = numbers.find(([, v]) => !Number.isFinite(v));
  if (!(p.angleRad > 0) && !bad) return null;
  if (!finitePositive(pr.accelRadPerS2))
    return {
      path: 'planning.torqueMargin',
      message: `the planned acceleration is ${show(pr.accelRadPerS2)} rad/s² (slew time ${show(p.durationS)} s): planning.torqueMargin = ${show(s.planning.torqueMargin)} of the wheel torque envelope leaves no usable torque`,
    };
  if (!finitePositive(pr.peakRateRadPerS))
    return {
      path: 'planning.momentumMargin',
      message: `the planned peak rate is ${show(pr.peakRateRadPerS)} rad/s (slew time ${show(p.durationS)} s): ${margins} and the slew-rate limit leave no usable rate`,
    };
  if (bad || !finitePositive(p.durationS))
    return {
      path: 'planning',
      message: `the planned ${bad ? bad[0] : 'slew time'} is ${show(bad ? bad[1] : p.durationS)} (${margins}); every planned quantity must be a finite number`,
    };
  return null;
}

/** Issues for a plan with a non-finite or degenerate quantity; empty when the plan's numbers are sound. */
export function planNumberIssues(plan: SequencePlan, s: ResolvedScenario): Issue[] {
  const issues: Issue[] = [];
  for (const e of plan.timeline) {
    const p = segmentProblem(e.plan, s);
    if (p)
      issues.push({
        path: p.path,
        rule: 'plan-finite',
        message: `targets[${e.target}] ("${e.label}"): ${p.message}`,
      });
  }
  if (issues.length === 0 && !Number.isFinite(plan.totalS))
    issues.push({
      path: 'targets',
      rule: 'plan-finite',
      message: `the plan's total time is ${show(plan.totalS)} s; holds and slews must add up to a finite time`,
    });
  return issues;
}
