/**
 * The no-coast profile family ('bang-bang'): accelerate at a for half the angle, decelerate for
 * the other half, T = 2√(θ/a), peak rate √(θ a) (profile.ts; standard rest-to-rest kinematics).
 * A rate cap w — the slew-rate limit or the momentum envelope — cannot be met by coasting, so
 * it lowers the acceleration to a = w²/θ instead. That is slower than bang-coast-bang under the
 * same cap (T = 2θ/w against θ/w + w/a) but has one switch and no plateau, which some pointing
 * laws and flexible structures prefer.
 *
 * With no stored momentum the answer is closed-form: a = min(a_τ, w²/θ) with a_τ the torque
 * envelope's acceleration along Je and w = min(slew-rate limit, momentum envelope rate) as in
 * segment.ts. With stored momentum the peak loads depend on the attitude reached (loads.ts), so
 * the largest feasible a is found by geometric bisection on a sampled profile, as search.ts does
 * for its rate caps (our own search, common practice, no source).
 */
import type { Issue } from '../errors';
import { scanEnvelopeUse, type SlewGeometry } from './loads';
import { restToRestProfile } from './profile';
import { explainNoProfile, SEARCH_GUARD, SEARCH_SAMPLING, VERIFY_SAMPLING } from './search';
import type { BindingLimit, PlanLimits, RestToRestProfile } from './types';

const A_FLOOR = 1e-6;
const MAX_BISECTIONS = 60;
const MAX_SHRINKS = 20;

export interface NoCoastPlan {
  profile: RestToRestProfile;
  binding: BindingLimit;
}

/** Closed form for an empty system: `aTorque` from the torque envelope, `wMomentum` the momentum-envelope rate. */
export function noCoastClosedForm(angleRad: number, aTorque: number, wMomentum: number, slew: number | undefined): NoCoastPlan {
  const w = Math.min(slew ?? Infinity, wMomentum);
  const aRate = (w * w) / angleRad;
  if (aTorque <= aRate) return { profile: restToRestProfile(angleRad, aTorque, Infinity), binding: 'torque' };
  const binding: BindingLimit = slew !== undefined && slew <= wMomentum ? 'slew-rate' : 'momentum';
  return { profile: restToRestProfile(angleRad, aRate, Infinity), binding };
}

/** Largest feasible no-coast acceleration with stored momentum; `aHi` is the torque bound at rest. */
export function noCoastSearch(
  g: SlewGeometry,
  limits: PlanLimits,
  aHi: number,
): { ok: true; plan: NoCoastPlan } | { ok: false; reason: Issue } {
  const th = g.angleRad;
  const slew = limits.slewRateLimitRadPerS;
  const tStop = limits.torqueMargin * (1 - SEARCH_GUARD);
  const hStop = limits.momentumMargin * (1 - SEARCH_GUARD);
  const aTorque = aHi * (1 - SEARCH_GUARD) * (1 - 1e-12);
  const aSlew = slew !== undefined ? (slew * slew) / th : Infinity;
  const aTop = Math.min(aTorque, aSlew);
  const use = { torque: 0, momentum: 0 };
  const profileAt = (a: number) => restToRestProfile(th, a, Infinity);
  const feasible = (a: number, sampling = SEARCH_SAMPLING, tMax = tStop, hMax = hStop): boolean => {
    scanEnvelopeUse(use, g, profileAt(a), limits, sampling, tMax, hMax);
    return use.torque <= tMax && use.momentum <= hMax;
  };

  let a: number;
  let binding: BindingLimit;
  if (feasible(aTop)) {
    a = aTop;
    binding = aSlew < aTorque ? 'slew-rate' : 'torque';
  } else {
    let lo = aTop * A_FLOOR;
    if (!feasible(lo)) return { ok: false, reason: explainNoProfile(g, limits, lo, Infinity) };
    let hi = aTop;
    for (let i = 0; i < MAX_BISECTIONS && hi > lo * (1 + SEARCH_GUARD / 4); i++) {
      const mid = Math.sqrt(lo * hi);
      if (feasible(mid)) lo = mid;
      else hi = mid;
    }
    a = lo;
    // What a slightly faster profile breaks first.
    feasible(a * (1 + 4 * SEARCH_GUARD));
    binding = use.momentum / hStop > 1 && use.momentum / hStop >= use.torque / tStop ? 'momentum' : 'torque';
  }
  // Verify on the dense sampling against the margins themselves; shrink if a peak was missed.
  for (let k = 0; k < MAX_SHRINKS && !feasible(a, VERIFY_SAMPLING, limits.torqueMargin, limits.momentumMargin); k++) a *= 1 - SEARCH_GUARD;
  return { ok: true, plan: { profile: profileAt(a), binding } };
}
