/**
 * The plan of pointing-only (roll-free) targets: each one's slew is the reduced slew (the shortest
 * rotation that carries its body axis onto its direction, control/sphere/slew.ts), timed by the
 * planner within the wheel envelopes like every other segment; this module adds to the plan
 * summary what that saves against the full-attitude slew to the same pointing — the target's
 * held-roll attitude (its form's secondary pair; scenario/pointingOnly.ts), planned by the same
 * planner from the same start state (attitude and stored wheel momentum).
 *
 * The saving is reported signed, never assumed: the reduced slew has the smallest ANGLE of all
 * slews with the same final pointing, but on an anisotropic vehicle a longer rotation about an
 * easier axis can be faster (control/sphere/slew.ts), and the summary then says it COSTS time.
 */
import { reducedSlewSaving } from '../control/sphere/slew';
import { planCheckedSegment } from '../plan/segment';
import type { SequencePlan } from '../plan/types';
import type { ResolvedTarget } from '../scenario/resolve';
import { DEG_PER_RAD } from '../units';
import { planLimits, planSummary } from './plan';
import type { Prepared } from './run';
import type { PlanSummary, RollFreeSaving } from './types';

const v3 = (v: ArrayLike<number>): [number, number, number] => [v[0]!, v[1]!, v[2]!];

/** The saving of segment k's reduced slew, or null when its target is a full attitude. */
export function rollFreeSaving(p: Pick<Prepared, 'scenario' | 'vehicle' | 'plan'>, k: number): RollFreeSaving | null {
  const target: ResolvedTarget | undefined = p.scenario.targets[k];
  const seg = p.plan.segments[k];
  const po = target?.pointingOnly;
  if (!po || !seg) return null;
  const limits = planLimits(p.scenario, p.vehicle);
  const J = p.plan.reference.inertia;
  const h0 = seg.wheelMomentumStartBody;
  const r = reducedSlewSaving(seg.qStart, po.bodyAxis, po.qHeldRoll, (a, b) => planCheckedSegment(a, b, J, h0, limits));
  if (!r.ok) return null; // the plan's own attitudes and the resolved axis are unit vectors: cannot fail
  const s = r.value;
  const red = s.reduced,
    full = s.full;
  const fullText = full.feasible
    ? `${(full.angleRad * DEG_PER_RAD).toFixed(2)}° in ${full.durationS!.toFixed(2)} s, peak momentum ${(100 * full.peakMomentumFraction!).toFixed(1)}%`
    : `${(full.angleRad * DEG_PER_RAD).toFixed(2)}°, infeasible`;
  const saved =
    s.timeSavedS === null
      ? 'no time comparison'
      : `${s.timeSavedS >= 0 ? 'saves' : 'COSTS'} ${Math.abs(s.timeSavedS).toFixed(2)} s` +
        (s.peakMomentumFractionSaved === null
          ? ''
          : ` and ${s.peakMomentumFractionSaved >= 0 ? 'saves' : 'COSTS'} ${Math.abs(100 * s.peakMomentumFractionSaved).toFixed(1)} points of peak momentum`);
  return {
    bodyAxis: v3(po.bodyAxis),
    inertialDirection: v3(po.inertialDirection),
    angleRad: s.reducedTarget.angleRad,
    slewTimeS: red.feasible ? red.durationS! : null,
    peakMomentumFraction: red.feasible ? red.peakMomentumFraction! : null,
    heldRollAngleRad: full.angleRad,
    heldRollFeasible: full.feasible,
    heldRollTimeS: full.feasible ? full.durationS! : null,
    heldRollPeakMomentumFraction: full.feasible ? full.peakMomentumFraction! : null,
    timeSavedS: s.timeSavedS,
    peakMomentumFractionSaved: s.peakMomentumFractionSaved,
    summary: `Pointing only: ${(s.reducedTarget.angleRad * DEG_PER_RAD).toFixed(2)}°${red.feasible ? ` in ${red.durationS!.toFixed(2)} s` : ', infeasible'}; with the roll held ${fullText}: ${saved}.`,
  };
}

/** The plan summary with the saving of every pointing-only segment. */
export function planSummaryWithSavings(p: Pick<Prepared, 'scenario' | 'vehicle' | 'plan'>): PlanSummary {
  const sum = planSummary(p.plan as SequencePlan, p.scenario.targets);
  sum.segments.forEach((g, k) => {
    const r = rollFreeSaving(p, k);
    if (r) g.rollFree = r;
  });
  return sum;
}
