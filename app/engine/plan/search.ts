/**
 * Fastest feasible rest-to-rest eigenaxis profile when the system holds momentum (H ≠ 0).
 *
 * Then the wheels must also supply the gyroscopic torque ω_s e × H_B and store H_B − ω_s J e,
 * both depending on the attitude reached (loads.ts), so the closed forms of the H = 0 case are
 * only upper bounds. The search is our own (common practice, no source): a profile is two
 * numbers, the acceleration a and the rate cap w; feasibility is tested on a sampled profile.
 *  1. a ≤ a_hi, the closed-form torque bound: at the start and end ω = 0, so τ = J e a exactly.
 *  2. w ≤ w_hi = min(slew-rate limit, √(θ a_hi)) (above √(θ a) the profile is bang-bang anyway).
 *  3. For a rate cap w, the largest feasible a by geometric bisection in [1e-6 a_hi, a_hi],
 *     to a relative width of GUARD/4.
 *  4. Over w, minimise T(a*(w), w): a geometric scan downwards from w_hi, stopped once T has
 *     grown well past its best (T grows like θ/w for small w), then golden-section refinement
 *     of ln w around the best scan point. This assumes T(a*(w), w) has one minimum near the
 *     best scan point; the result is the best profile found, not a proof of optimality.
 *  5. Verify the result on a denser sampling; shrink a and w slightly if a peak was missed.
 * A guard band GUARD keeps the coarse-sampled peaks below (1 − GUARD)·margin so that peaks
 * between samples stay inside the margin; the price is about GUARD of the usable envelope.
 */
import { issue, type Issue } from '../errors';
import { restToRestProfile } from './profile';
import { scanEnvelopeUse, type EnvelopeUse, type Sampling, type SlewGeometry } from './loads';
import type { BindingLimit, PlanLimits, RestToRestProfile } from './types';

/** Relative guard band below the margins for the sampled search. */
export const SEARCH_GUARD = 1e-3;
/** Sampling during the search (missed peaks ≲ step²/8 ≈ 5e-5 relative) and for verification/reporting. */
export const SEARCH_SAMPLING: Sampling = { stepRad: 0.02, maxPerPhase: 128 };
export const VERIFY_SAMPLING: Sampling = { stepRad: 0.002, maxPerPhase: 2048 };

const SCAN_COUNT = 20;
const SCAN_RATIO = 0.7;
const SCAN_STOP = 1.25; // stop scanning once T exceeds 1.25 × the best T
const GOLDEN_STEPS = 16;
const A_FLOOR = 1e-6;
const MAX_BISECTIONS = 40;

export type SearchOutcome =
  { ok: true; profile: RestToRestProfile; binding: BindingLimit; use: EnvelopeUse } | { ok: false; reason: Issue };

export function searchProfile(g: SlewGeometry, limits: PlanLimits, aHi: number): SearchOutcome {
  const th = g.angleRad;
  const slew = limits.slewRateLimitRadPerS;
  const tStop = limits.torqueMargin * (1 - SEARCH_GUARD);
  const hStop = limits.momentumMargin * (1 - SEARCH_GUARD);
  // The start torque is exactly J e a, so a_hi sits on the margin, outside the guard band:
  // search below aTop (a tiny extra factor against rounding at equality).
  const aTop = aHi * (1 - SEARCH_GUARD) * (1 - 1e-12);
  const wHi = Math.min(slew ?? Infinity, Math.sqrt(th * aTop));
  const use: EnvelopeUse = { torque: 0, momentum: 0 };

  const feasible = (a: number, w: number, s: Sampling = SEARCH_SAMPLING, tMax = tStop, hMax = hStop): boolean => {
    scanEnvelopeUse(use, g, restToRestProfile(th, a, w), limits, s, tMax, hMax);
    return use.torque <= tMax && use.momentum <= hMax;
  };

  /** Largest feasible a for rate cap w (0 if none); `hint` is a likely feasible lower bracket. */
  const maxAccelFor = (w: number, hint = 0): number => {
    if (feasible(aTop, w)) return aTop;
    let lo = hint > 0 && hint < aTop && feasible(hint, w) ? hint : aTop * A_FLOOR;
    if (lo === aTop * A_FLOOR && !feasible(lo, w)) return 0;
    let hi = aTop;
    for (let i = 0; i < MAX_BISECTIONS && hi > lo * (1 + SEARCH_GUARD / 4); i++) {
      const mid = Math.sqrt(lo * hi);
      if (feasible(mid, w)) lo = mid;
      else hi = mid;
    }
    return lo;
  };

  /** Which margin the sampled profile (a, w) crosses first, or null when it is feasible. */
  const violated = (a: number, w: number): BindingLimit | null => {
    if (feasible(a, w)) return null;
    const overT = use.torque / tStop,
      overH = use.momentum / hStop;
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

  // 4a. Scan the rate cap downwards. Once a*(w) reaches aTop no slower cap can win.
  let bestK = -1,
    bestT = Infinity,
    bestA = 0,
    bestW = 0,
    prevA = 0;
  const ws: number[] = [];
  for (let k = 0; k < SCAN_COUNT; k++) {
    const w = wHi * Math.pow(SCAN_RATIO, k);
    ws.push(w);
    const a = maxAccelFor(w, prevA);
    if (a > 0) prevA = a;
    const T = timeOf(a, w);
    if (T < bestT) {
      bestT = T;
      bestK = k;
      bestA = a;
      bestW = w;
    }
    if (a >= aTop || T > SCAN_STOP * bestT) break;
  }
  if (bestK < 0) return { ok: false, reason: explainNoProfile(g, limits, aTop * A_FLOOR, ws[ws.length - 1]!) };

  // 4b. Golden-section on ln w between the neighbours of the best scan point.
  if (bestA < aTop || bestK > 0) {
    let lo = Math.log(ws[bestK]! * SCAN_RATIO);
    let hi = Math.log(bestK > 0 ? ws[bestK - 1]! : wHi);
    const r = (Math.sqrt(5) - 1) / 2;
    const at = (x: number): [number, number] => {
      const a = maxAccelFor(Math.exp(x), bestA * 0.5);
      return [timeOf(a, Math.exp(x)), a];
    };
    let x1 = hi - r * (hi - lo),
      x2 = lo + r * (hi - lo);
    let [f1, a1] = at(x1);
    let [f2, a2] = at(x2);
    for (let i = 0; i < GOLDEN_STEPS; i++) {
      if (f1 <= f2) {
        hi = x2;
        x2 = x1;
        f2 = f1;
        a2 = a1;
        x1 = hi - r * (hi - lo);
        [f1, a1] = at(x1);
      } else {
        lo = x1;
        x1 = x2;
        f1 = f2;
        a1 = a2;
        x2 = lo + r * (hi - lo);
        [f2, a2] = at(x2);
      }
    }
    // The better golden point (ties: the first), if it beats the scan.
    const [fG, aG, xG] = f2 < f1 ? [f2, a2, x2] : [f1, a1, x1];
    if (fG < bestT) [bestA, bestW] = [aG, Math.exp(xG)];
  }

  // 5. Dense verification against half the guard band; shrink on a missed peak.
  const vt = limits.torqueMargin * (1 - SEARCH_GUARD / 2);
  const vh = limits.momentumMargin * (1 - SEARCH_GUARD / 2);
  let a = bestA,
    w = bestW;
  for (let tries = 0; tries < 12; tries++) {
    if (feasible(a, w, VERIFY_SAMPLING, vt, vh)) {
      const profile = restToRestProfile(th, a, w);
      const finalUse = scanEnvelopeUse({ torque: 0, momentum: 0 }, g, profile, limits, VERIFY_SAMPLING);
      return { ok: true, profile, binding: classify(profile, a, w), use: finalUse };
    }
    a *= 1 - SEARCH_GUARD;
    w *= 1 - SEARCH_GUARD;
  }
  return {
    ok: false,
    reason: issue(
      'segment',
      'no-feasible-profile',
      'No rest-to-rest eigenaxis profile passed the dense check of the torque and momentum margins.',
    ),
  };
}

export function explainNoProfile(g: SlewGeometry, limits: PlanLimits, a: number, w: number): Issue {
  const use = scanEnvelopeUse({ torque: 0, momentum: 0 }, g, restToRestProfile(g.angleRad, a, w), limits, SEARCH_SAMPLING);
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
