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
  const search = new ProfileSearch(g, limits, aHi);
  const scan = search.scanRateCaps();
  if (scan.bestK < 0) return { ok: false, reason: explainNoProfile(g, limits, search.aTop * A_FLOOR, scan.ws[scan.ws.length - 1]!) };
  search.refineGolden(scan);
  return search.verify(scan.bestA, scan.bestW);
}

/** The best (a, w) found so far, and the rate caps the scan tried (4a). */
interface ScanResult {
  /** Index of the best scan point in ws (−1: no rate cap had a feasible acceleration). */
  bestK: number;
  bestT: number;
  bestA: number;
  bestW: number;
  ws: number[];
}

/** One search (steps 1–5 of the file header) for one slew: the bounds and the sampled feasibility test. */
class ProfileSearch {
  private readonly th: number;
  private readonly slew: number | undefined;
  /** Margins less the guard band, for the coarse sampling. */
  private readonly tStop: number;
  private readonly hStop: number;
  /** Largest acceleration searched: a_hi less the guard band (and a hair against rounding). */
  readonly aTop: number;
  /** Largest rate cap searched. */
  readonly wHi: number;
  /** Envelope use of the last profile tested. */
  private readonly use: EnvelopeUse = { torque: 0, momentum: 0 };

  constructor(
    private readonly g: SlewGeometry,
    private readonly limits: PlanLimits,
    aHi: number,
  ) {
    this.th = g.angleRad;
    this.slew = limits.slewRateLimitRadPerS;
    this.tStop = limits.torqueMargin * (1 - SEARCH_GUARD);
    this.hStop = limits.momentumMargin * (1 - SEARCH_GUARD);
    // The start torque is exactly J e a, so a_hi sits on the margin, outside the guard band:
    // search below aTop (a tiny extra factor against rounding at equality).
    this.aTop = aHi * (1 - SEARCH_GUARD) * (1 - 1e-12);
    this.wHi = Math.min(this.slew ?? Infinity, Math.sqrt(this.th * this.aTop));
  }

  private feasible(a: number, w: number, s: Sampling = SEARCH_SAMPLING, tMax = this.tStop, hMax = this.hStop): boolean {
    const use = this.use;
    scanEnvelopeUse(use, this.g, restToRestProfile(this.th, a, w), this.limits, s, tMax, hMax);
    return use.torque <= tMax && use.momentum <= hMax;
  }

  /** Largest feasible a for rate cap w (0 if none); `hint` is a likely feasible lower bracket. */
  private maxAccelFor(w: number, hint = 0): number {
    const aTop = this.aTop;
    if (this.feasible(aTop, w)) return aTop;
    let lo = hint > 0 && hint < aTop && this.feasible(hint, w) ? hint : aTop * A_FLOOR;
    if (lo === aTop * A_FLOOR && !this.feasible(lo, w)) return 0;
    let hi = aTop;
    for (let i = 0; i < MAX_BISECTIONS && hi > lo * (1 + SEARCH_GUARD / 4); i++) {
      const mid = Math.sqrt(lo * hi);
      if (this.feasible(mid, w)) lo = mid;
      else hi = mid;
    }
    return lo;
  }

  /** Which margin the sampled profile (a, w) crosses first, or null when it is feasible. */
  private violated(a: number, w: number): BindingLimit | null {
    if (this.feasible(a, w)) return null;
    const overT = this.use.torque / this.tStop,
      overH = this.use.momentum / this.hStop;
    return overH > 1 && overH >= overT ? 'momentum' : 'torque';
  }

  /**
   * The binding limit is the one a slightly more aggressive profile breaks first: raise the rate
   * cap (if the profile coasts), else the acceleration, by four guard bands. At the slew-rate
   * limit itself the answer is 'slew-rate'.
   */
  private classify(p: RestToRestProfile, a: number, w: number): BindingLimit {
    const slew = this.slew;
    const bump = 1 + 4 * SEARCH_GUARD;
    if (p.kind === 'bang-coast-bang') {
      if (slew !== undefined && p.peakRateRadPerS >= slew * (1 - 1e-12)) return 'slew-rate';
      const v = this.violated(a, w * bump);
      if (v) return v;
      if (slew !== undefined && w * bump >= slew) return 'slew-rate';
    }
    return this.violated(a * bump, w) ?? 'torque';
  }

  private timeOf(a: number, w: number): number {
    return a > 0 ? restToRestProfile(this.th, a, w).durationS : Infinity;
  }

  /** 4a. Scan the rate cap downwards. Once a*(w) reaches aTop no slower cap can win. */
  scanRateCaps(): ScanResult {
    const r: ScanResult = { bestK: -1, bestT: Infinity, bestA: 0, bestW: 0, ws: [] };
    let prevA = 0;
    for (let k = 0; k < SCAN_COUNT; k++) {
      const w = this.wHi * Math.pow(SCAN_RATIO, k);
      r.ws.push(w);
      const a = this.maxAccelFor(w, prevA);
      if (a > 0) prevA = a;
      const T = this.timeOf(a, w);
      if (T < r.bestT) {
        r.bestT = T;
        r.bestK = k;
        r.bestA = a;
        r.bestW = w;
      }
      if (a >= this.aTop || T > SCAN_STOP * r.bestT) break;
    }
    return r;
  }

  /** 4b. Golden-section on ln w between the neighbours of the best scan point; updates r when it finds better. */
  refineGolden(r: ScanResult): void {
    if (!(r.bestA < this.aTop || r.bestK > 0)) return;
    const bestA = r.bestA;
    let lo = Math.log(r.ws[r.bestK]! * SCAN_RATIO);
    let hi = Math.log(r.bestK > 0 ? r.ws[r.bestK - 1]! : this.wHi);
    const phi = (Math.sqrt(5) - 1) / 2;
    const at = (x: number): [number, number] => {
      const a = this.maxAccelFor(Math.exp(x), bestA * 0.5);
      return [this.timeOf(a, Math.exp(x)), a];
    };
    let x1 = hi - phi * (hi - lo),
      x2 = lo + phi * (hi - lo);
    let [f1, a1] = at(x1);
    let [f2, a2] = at(x2);
    for (let i = 0; i < GOLDEN_STEPS; i++) {
      if (f1 <= f2) {
        hi = x2;
        x2 = x1;
        f2 = f1;
        a2 = a1;
        x1 = hi - phi * (hi - lo);
        [f1, a1] = at(x1);
      } else {
        lo = x1;
        x1 = x2;
        f1 = f2;
        a1 = a2;
        x2 = lo + phi * (hi - lo);
        [f2, a2] = at(x2);
      }
    }
    // The better golden point (ties: the first), if it beats the scan.
    const [fG, aG, xG] = f2 < f1 ? [f2, a2, x2] : [f1, a1, x1];
    if (fG < r.bestT) [r.bestA, r.bestW] = [aG, Math.exp(xG)];
  }

  /** 5. Dense verification against half the guard band; shrink on a missed peak. */
  verify(bestA: number, bestW: number): SearchOutcome {
    const limits = this.limits;
    const vt = limits.torqueMargin * (1 - SEARCH_GUARD / 2);
    const vh = limits.momentumMargin * (1 - SEARCH_GUARD / 2);
    let a = bestA,
      w = bestW;
    for (let tries = 0; tries < 12; tries++) {
      if (this.feasible(a, w, VERIFY_SAMPLING, vt, vh)) {
        const profile = restToRestProfile(this.th, a, w);
        const finalUse = scanEnvelopeUse({ torque: 0, momentum: 0 }, this.g, profile, limits, VERIFY_SAMPLING);
        return { ok: true, profile, binding: this.classify(profile, a, w), use: finalUse };
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
