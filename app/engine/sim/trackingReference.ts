/**
 * Where a flight's reference comes from in an orbit plan (plan/trackingSequence.ts):
 *  - follow-plan: each entry's slew onto its target's attitude and rate, then tracking with the
 *    target's ω and ω̇ as feedforward (entryReferenceAt);
 *  - step-target: the target itself (moving, with its ω and ω̇) from each planned slew start.
 * Before the first slew: the initial attitude at rest. The active entry is found by a binary
 * search over the slew starts; evaluation allocates nothing.
 */
import { entryReferenceAt, liftedTargetAt } from '../plan/trackingSequence';
import type { TrackingPlan } from '../plan/trackingTypes';
import type { RunMode } from './types';
import type { ReferenceSource } from './closedLoop';

/** Slew starts (and, in follow-plan, tracking starts) of an orbit plan, ascending (s). */
export function trackingSwitchTimes(plan: TrackingPlan, slewStartsOnly: boolean): Float64Array {
  const out: number[] = [];
  for (const e of plan.entries) {
    out.push(e.slewStartS);
    if (!slewStartsOnly) out.push(e.trackStartS);
  }
  return Float64Array.from(out);
}

/** The reference of an orbit plan for a run mode. */
export function trackingReference(plan: TrackingPlan, mode: RunMode): ReferenceSource {
  const entries = plan.entries;
  const m = entries.length;
  const starts = Float64Array.from(entries, (e) => e.slewStartS);
  const q0 = plan.qInitial;
  const follow = mode === 'follow-plan';
  return {
    switchTimes: trackingSwitchTimes(plan, !follow),
    at: (t, q, w, wd) => {
      if (m === 0 || !(t >= starts[0]!)) {
        q.set(q0);
        w.fill(0);
        wd.fill(0);
        return 0;
      }
      let lo = 0,
        hi = m - 1;
      while (lo < hi) {
        const mid = (lo + hi + 1) >> 1;
        if (starts[mid]! <= t) lo = mid;
        else hi = mid - 1;
      }
      const e = entries[lo]!;
      if (follow) entryReferenceAt(e, plan, t, q, w, wd);
      else liftedTargetAt(e, plan, t, q, w, wd);
      return e.target;
    },
  };
}
