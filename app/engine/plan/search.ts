/**
 * Fastest feasible rest-to-rest eigenaxis profile when the system holds momentum (H ≠ 0).
 *
 * Then the wheels must also supply the gyroscopic torque ω_s e × H_B and store H_B − ω_s J e,
 * both depending on the attitude reached (loads.ts), so the closed forms of the H = 0 case are
 * only upper bounds. The search is our own (common practice, no source): a profile is two
 * numbers, the acceleration a and the rate cap w; feasibility is tested on a sampled profile.
 *  1. a ≤ a_hi, the closed-form torque bound: at the start and end ω = 0, so τ = J e a exactly.
 *  2. w ≤ w_hi = min(slew-rate limit, √(θ a_hi)) (above √(θ a) the profile is bang-bang anyway).
 *  3. For a rate cap w, the largest feasible a by bisection (geometric, a ∈ [1e-6 a_hi, a_hi]).
 *  4. Over w, minimise T(a*(w), w): a geometric scan, then golden-section refinement around
 *     the best scan point.
 *  5. Verify the result on a 16× denser sampling; shrink a and w slightly if a peak was missed.
 * A guard band GUARD keeps the coarse-sampled peaks below (1 − GUARD)·margin, so peaks between
 * samples (second order in the spacing) stay inside the margin; the price is at most ~0.1% of
 * acceleration or rate. The result is the best found within the profile family, not a proof of
 * global optimality over (a, w).
 */
import { issue, type Issue } from '../errors';
import { restToRestProfile } from './profile';
import { scanEnvelopeUse, type EnvelopeUse, type SlewGeometry } from './loads';
import type { BindingLimit, PlanLimits, RestToRestProfile } from './types';

/** Relative guard band below the margins for the sampled search. */
export const SEARCH_GUARD = 1e-3;
/** Samples per profile phase during the search, and in the final verification. */
export const SEARCH_SAMPLES_PER_PHASE = 128;
export const VERIFY_SAMPLES_PER_PHASE = 2048;

const SCAN_COUNT = 24;
const SCAN_RATIO = 0.75;
const BISECTION_STEPS = 34;
const GOLDEN_STEPS = 24;
const A_FLOOR = 1e-6;

export type SearchOutcome =
  | { ok: true; profile: RestToRestProfile; binding: BindingLimit; use: EnvelopeUse }
  | { ok: false; reason: Issue };

export function searchProfile(g: SlewGeometry, limits: PlanLimits, aHi: number): SearchOutcome {
  const th = g.angleRad;
  const slew = limits.slewRateLimitRadPerS;
  const wHi = Math.min(slew ?? Infinity, Math.sqrt(th * aHi * (1 - SEARCH_GUARD)));
  const tStop = limits.torqueMargin * (1 - SEARCH_GUARD);
  const hStop = limits.momentumMargin * (1 - SEARCH_GUARD);
  const use: EnvelopeUse = { torque: 0, momentum: 0 };

  const feasible = (a: number, w: number, n = SEARCH_SAMPLES_PER_PHASE, tMax = tStop, hMax = hStop): boolean => {
    scanEnvelopeUse(use, g, restToRestProfile(th, a, w), limits, n, tMax, hMax);
    return use.torque <= tMax && use.momentum <= hMax;
  };

  // The start torque is exactly J e a, so a_hi itself always sits on the margin, outside the
  // guard band: search below aTop (tiny extra factor against rounding at equality).
  const aTop = aHi * (1 - SEARCH_GUARD) * (1 - 1e-12);
  const maxAccelFor = (w: number): number => {
    if (feasible(aTop, w)) return aTop;
    let lo = aTop * A_FLOOR, hi = aTop;
    if (!feasible(lo, w)) return 0;
    for (let i = 0; i < BISECTION_STEPS; i++) {
      const mid = Math.sqrt(lo * hi);
      if (feasible(mid, w)) lo = mid;
      else hi = mid;
    }
    return lo;
  };

  /** Which margin the sampled profile (a, w) crosses first, or null when it is feasible. */
  const violated = (a: number, w: number): BindingLimit | null => {
    if (feasible(a, w)) return null;
    const overT = use.torque / tStop, overH = use.momentum / hStop;
    return overH > 1 && overH >= overT ? 'momentum' : 'torque';
  };

  /**
   * The binding limit is the one a slightly more aggressive profile breaks first: raise the rate
   * cap (if the profile coasts), else the acceleration, by four guard bands. At the slew-rate
   * limit itself the answer is 'slew-rate'.
   */
  const classify = (p: RestToRestProfile, a: number, w: number): BindingLimit => {
    const bump = 1 + 4 * SEARCH_GUARD;
    if (p.kind === 'bang-coast-bang') {
      if (slew !== undefined && p.peakRateRadPerS >= slew * (1 - 1e-12)) return 'slew-rate';
      const v = violated(a, w * bump);
      if (v) return v;
      if (slew !== undefined && w * bump >= slew) return 'slew-rate';
    }
    return violated(a * bump, w) ?? 'torque';
  };

  const timeOf = (a: number, w: number): number => (a > 0 ? restToRestProfile(th, a, w).durationS : Infinity);

  // Geometric scan over the rate cap, fastest first. Once a*(w) reaches a_hi no slower cap can win.
  let bestK = -1, bestT = Infinity, bestA = 0, bestW = 0;
  const ws: number[] = [];
  for (let k = 0; k < SCAN_COUNT; k++) {
    const w = wHi * Math.pow(SCAN_RATIO, k);
    ws.push(w);
    const a = maxAccelFor(w);
    const T = timeOf(a, w);
    if (T < bestT) {
      bestT = T;
      bestK = k;
      bestA = a;
      bestW = w;
    }
    if (a >= aTop) break;
  }
  if (bestK < 0) return { ok: false, reason: explainNoProfile(g, limits, aTop * A_FLOOR, ws[ws.length - 1]) };

  // Golden-section on ln w between the neighbours of the best scan point.
  if (bestA < aTop || bestK > 0) {
    let lo = Math.log(bestK + 1 < ws.length ? ws[bestK + 1] : ws[bestK] * SCAN_RATIO);
    let hi = Math.log(bestK > 0 ? ws[bestK - 1] : wHi);
    const r = (Math.sqrt(5) - 1) / 2;
    let x1 = hi - r * (hi - lo), x2 = lo + r * (hi - lo);
    let a1 = maxAccelFor(Math.exp(x1)), a2 = maxAccelFor(Math.exp(x2));
    let f1 = timeOf(a1, Math.exp(x1)), f2 = timeOf(a2, Math.exp(x2));
    for (let i = 0; i < GOLDEN_STEPS; i++) {
      if (f1 <= f2) {
        hi = x2;
        x2 = x1;
        f2 = f1;
        a2 = a1;
        x1 = hi - r * (hi - lo);
        a1 = maxAccelFor(Math.exp(x1));
        f1 = timeOf(a1, Math.exp(x1));
      } else {
        lo = x1;
        x1 = x2;
        f1 = f2;
        a1 = a2;
        x2 = lo + r * (hi - lo);
        a2 = maxAccelFor(Math.exp(x2));
        f2 = timeOf(a2, Math.exp(x2));
      }
    }
    const cands: [number, number, number][] = [[f1, a1, Math.exp(x1)], [f2, a2, Math.exp(x2)]];
    for (const [T, a, w] of cands) {
      if (T < bestT) {
        bestT = T;
        bestA = a;
        bestW = w;
      }
    }
  }

  // Dense verification against half the guard band; shrink on a missed peak.
  const vt = limits.torqueMargin * (1 - SEARCH_GUARD / 2);
  const vh = limits.momentumMargin * (1 - SEARCH_GUARD / 2);
  let a = bestA, w = bestW;
  for (let tries = 0; tries < 12; tries++) {
    if (feasible(a, w, VERIFY_SAMPLES_PER_PHASE, vt, vh)) {
      const profile = restToRestProfile(th, a, w);
      const finalUse = scanEnvelopeUse({ torque: 0, momentum: 0 }, g, profile, limits, VERIFY_SAMPLES_PER_PHASE);
      return { ok: true, profile, binding: classify(profile, a, w), use: finalUse };
    }
    a *= 1 - SEARCH_GUARD;
    w *= 1 - SEARCH_GUARD;
  }
  return {
    ok: false,
    reason: issue('segment', 'no-feasible-profile', 'No rest-to-rest eigenaxis profile passed the dense check of the torque and momentum margins.'),
  };
}

function explainNoProfile(g: SlewGeometry, limits: PlanLimits, a: number, w: number): Issue {
  const use = scanEnvelopeUse({ torque: 0, momentum: 0 }, g, restToRestProfile(g.angleRad, a, w), limits, SEARCH_SAMPLES_PER_PHASE);
  const mom = use.momentum / limits.momentumMargin >= use.torque / limits.torqueMargin;
  return mom
    ? issue(
        'segment',
        'stored-momentum-path',
        `The momentum stored in the wheels, carried through this rotation, leaves the usable momentum envelope: even the slowest profile tried uses ${pct(use.momentum)} of the envelope (margin ${pct(limits.momentumMargin)}).`,
      )
    : issue(
        'segment',
        'gyroscopic-torque',
        `The gyroscopic torque of the stored momentum exceeds the usable torque envelope even on the slowest profile tried (${pct(use.torque)} of the envelope, margin ${pct(limits.torqueMargin)}).`,
      );
}

export function pct(x: number): string {
  return Number.isFinite(x) ? `${(100 * x).toPrecision(4)}%` : 'an unbounded share';
}
