/**
 * Wheel torque and momentum limits that never rotate the delivered body torque.
 *
 * Rule (methods §6 of the project notes): clipping one wheel would turn the body torque −Gτ_w
 * away from the request, which breaks every Lyapunov argument of the attitude laws. So a
 * command τ is replaced by s·τ + Bα with a single scale s ∈ [0, 1] and a null-space term Bα
 * (G B = 0, so the body torque becomes exactly s × the requested one):
 * - torque only: s = min(1, min_i τ_max,i / |τ_i|), α = 0;
 * - momentum: a wheel at or beyond |h_i| ≥ h_max,i may only be torqued to reduce |h_i|. With
 *   redundant wheels the largest s over (s, α) is found by an exact LP (lp.ts) — null-space
 *   help first, so s = 1 whenever some α can satisfy every wheel; among the α reaching that s
 *   the one changing the command least (in max_i |(Bα)_i| / τ_max,i) is taken. Without a
 *   usable null space the whole command is scaled, possibly to zero.
 * - predictive (dt > 0): every wheel must also satisfy |h_i + τ_i dt| ≤ h_max,i after the step
 *   (a wheel already beyond may only come back, without overshooting the opposite limit).
 *
 * Each wheel's admissible torques form an interval [lo_i, hi_i] that always contains 0, so
 * τ = 0 (s = 0) is always feasible and the LPs start at a feasible vertex.
 */
import type { WheelArray } from './array';
import { MAX_WHEELS } from './array';
import { lpMinimize } from './lp';

/**
 * 'none': command unchanged. 'torque': scaled for the motor torque limit. 'momentum': scaled
 * (possibly to 0) because of a momentum limit. 'momentum-null-space': the momentum limit was met
 * by a null-space change alone; the body torque is the full request. 'invalid-input': a
 * non-finite command, momentum or step; zero torque returned.
 */
export type LimitReason = 'none' | 'torque' | 'momentum' | 'momentum-null-space' | 'invalid-input';

/** What the limiter did. `reason` holds a LimitReason. */
export interface LimitInfo {
  /** s ∈ [0, 1]: delivered body torque = s × requested body torque (−G × command). */
  scale: number;
  reason: LimitReason | string;
  /** Wheel whose limit set s (−1 when nothing bound). */
  bindingWheel?: number;
  /** True when a null-space term was added. */
  nullSpaceUsed?: boolean;
}

export function createLimitInfo(): Required<LimitInfo> {
  return { scale: 1, reason: 'none', bindingWheel: -1, nullSpaceUsed: false };
}

const N = MAX_WHEELS;
const K = MAX_WHEELS - 3;
const cmdS = new Float64Array(N);
const lo = new Float64Array(N);
const hi = new Float64Array(N);
const loMom = new Uint8Array(N); // 1 when lo_i comes from a momentum limit (tighter than torque)
const hiMom = new Uint8Array(N);
const nsTerm = new Float64Array(N);
const lpA = new Float64Array(4 * N * (2 * K + 1));
const lpB = new Float64Array(4 * N);
const lpC = new Float64Array(2 * K + 1);
const lpZ = new Float64Array(2 * K + 1);

/**
 * Limit a wheel-torque command `wheelTorqueCmd` (length n, N·m) given the wheel momenta `hWheel`
 * (N·m·s). Writes `outWheelTorque` (may alias the command) and fills and returns `info`.
 * Optional `dt` (s): 0 or omitted = instantaneous momentum rule; > 0 = predictive over the step
 * (see limitWheelTorqueStep).
 */
export function limitWheelTorque(
  outWheelTorque: Float64Array,
  arr: WheelArray,
  wheelTorqueCmd: ArrayLike<number>,
  hWheel: ArrayLike<number>,
  dtOrInfo?: number | LimitInfo,
  info?: LimitInfo,
): LimitInfo {
  const dt = typeof dtOrInfo === 'number' ? dtOrInfo : 0;
  const target = (typeof dtOrInfo === 'object' ? dtOrInfo : info) ?? createLimitInfo();
  return limitCore(outWheelTorque, arr, wheelTorqueCmd, hWheel, dt, target);
}

/** Predictive variant: after τ is held for dt > 0, |h_i + τ_i dt| ≤ h_max,i for every wheel. */
export function limitWheelTorqueStep(
  outWheelTorque: Float64Array,
  arr: WheelArray,
  wheelTorqueCmd: ArrayLike<number>,
  hWheel: ArrayLike<number>,
  dt: number,
  info: LimitInfo = createLimitInfo(),
): LimitInfo {
  if (!(dt > 0)) return invalid(outWheelTorque, arr.n, info);
  return limitCore(outWheelTorque, arr, wheelTorqueCmd, hWheel, dt, info);
}

function invalid(out: Float64Array, n: number, info: LimitInfo): LimitInfo {
  out.fill(0, 0, n);
  return setInfo(info, 0, 'invalid-input', -1, false);
}

function setInfo(info: LimitInfo, s: number, reason: LimitReason, wheel: number, ns: boolean): LimitInfo {
  info.scale = s;
  info.reason = reason;
  info.bindingWheel = wheel;
  info.nullSpaceUsed = ns;
  return info;
}

function limitCore(
  out: Float64Array,
  arr: WheelArray,
  cmd: ArrayLike<number>,
  h: ArrayLike<number>,
  dt: number,
  info: LimitInfo,
): LimitInfo {
  const n = arr.n;
  if (!(dt >= 0) || !Number.isFinite(dt)) return invalid(out, n, info);
  for (let i = 0; i < n; i++) if (!Number.isFinite(cmd[i]) || !Number.isFinite(h[i])) return invalid(out, n, info);
  const lT = arr.maxTorqueNm,
    hMax = arr.maxMomentumNms;
  if (insideAllIntervals(cmd, h, lT, hMax, n, dt)) {
    for (let i = 0; i < n; i++) out[i] = cmd[i]!;
    return setInfo(info, 1, 'none', -1, false);
  }
  let anyViolated = false;
  let momViolated = false;
  for (let i = 0; i < n; i++) {
    const c = cmd[i]!;
    cmdS[i] = c;
    let mLo = -Infinity,
      mHi = Infinity;
    if (dt > 0) {
      mLo = (-hMax[i]! - h[i]!) / dt;
      mHi = (hMax[i]! - h[i]!) / dt;
      if (h[i]! > hMax[i]!) mHi = 0;
      if (h[i]! < -hMax[i]!) mLo = 0;
    } else {
      if (h[i]! >= hMax[i]!) mHi = 0;
      if (h[i]! <= -hMax[i]!) mLo = 0;
    }
    loMom[i] = mLo > -lT[i]! ? 1 : 0;
    hiMom[i] = mHi < lT[i]! ? 1 : 0;
    lo[i] = Math.max(-lT[i]!, mLo);
    hi[i] = Math.min(lT[i]!, mHi);
    if (c < mLo || c > mHi) momViolated = true;
    if (c < lo[i]! || c > hi[i]!) anyViolated = true;
  }
  if (!anyViolated) {
    for (let i = 0; i < n; i++) out[i] = cmdS[i]!;
    return setInfo(info, 1, 'none', -1, false);
  }
  // Plain scaling: the largest s with s·c inside every interval.
  let sScale = 1;
  let bind = -1;
  for (let i = 0; i < n; i++) {
    const c = cmdS[i]!;
    const r = c > 0 ? hi[i]! / c : c < 0 ? lo[i]! / c : Infinity;
    if (r < sScale) {
      sScale = r;
      bind = i;
    }
  }
  sScale = Math.max(0, sScale);
  const k = n - 3;
  if (momViolated && k > 0) {
    const sLp = maxScaleLp(arr);
    if (sLp > sScale * (1 + 1e-12) + 1e-15) {
      const s = Math.min(1, sLp);
      readAlphaFromLp1(arr);
      minDeviationLp(arr, s);
      for (let i = 0; i < n; i++) out[i] = s * cmdS[i]! + nsTerm[i]!;
      // An LP answer outside the intervals by more than rounding (possible on nearly dependent
      // null vectors) is discarded for plain scaling, which is always exactly feasible.
      if (worstExcess(out, arr) <= CLAMP) {
        enforceIntervals(out, arr);
        const wheel = activeWheel(out, arr);
        const full = s >= 1 - 1e-9;
        const reason: LimitReason = full ? 'momentum-null-space' : wheel >= 0 && isMomentumBound(out, wheel, arr) ? 'momentum' : 'torque';
        return setInfo(info, s, reason, full ? -1 : wheel, true);
      }
    }
  }
  for (let i = 0; i < n; i++) out[i] = sScale * cmdS[i]!;
  enforceIntervals(out, arr);
  const c = bind >= 0 ? cmdS[bind]! : 0;
  const byMomentum = bind >= 0 && (c > 0 ? hiMom[bind] === 1 : loMom[bind] === 1);
  return setInfo(info, sScale, byMomentum ? 'momentum' : 'torque', bind, false);
}

/**
 * The common case first: is every command inside its wheel's interval [lo_i, hi_i]? The same
 * bounds, computed the same way, as the general path below (which then returns the command
 * unchanged with reason 'none'), without filling the scratch arrays the scaling and the LPs need.
 */
function insideAllIntervals(
  cmd: ArrayLike<number>,
  h: ArrayLike<number>,
  lT: ArrayLike<number>,
  hMax: ArrayLike<number>,
  n: number,
  dt: number,
): boolean {
  for (let i = 0; i < n; i++) {
    let mLo = -Infinity,
      mHi = Infinity;
    if (dt > 0) {
      mLo = (-hMax[i]! - h[i]!) / dt;
      mHi = (hMax[i]! - h[i]!) / dt;
      if (h[i]! > hMax[i]!) mHi = 0;
      if (h[i]! < -hMax[i]!) mLo = 0;
    } else {
      if (h[i]! >= hMax[i]!) mHi = 0;
      if (h[i]! <= -hMax[i]!) mLo = 0;
    }
    const c = cmd[i]!;
    if (c < Math.max(-lT[i]!, mLo) || c > Math.min(lT[i]!, mHi)) return false;
  }
  return true;
}

/**
 * LP1: maximise s subject to lo_i ≤ s c_i + (Bα)_i ≤ hi_i, s ≤ 1, rows scaled by 1/τ_max,i,
 * α = L(α⁺ − α⁻) with L = max τ_max. Leaves the optimum in lpZ; returns s (0 on failure).
 */
function maxScaleLp(arr: WheelArray): number {
  const n = arr.n,
    k = n - 3,
    l = arr.maxTorqueNm,
    B = arr.nullBasis;
  const nv = 2 * k + 1;
  let lMax = 0;
  for (let i = 0; i < n; i++) lMax = Math.max(lMax, l[i]!);
  for (let i = 0; i < n; i++) {
    const up = 2 * i * nv,
      dn = (2 * i + 1) * nv;
    const ci = cmdS[i]! / l[i]!;
    lpA[up] = ci;
    lpA[dn] = -ci;
    for (let j = 0; j < k; j++) {
      const b = (B[j * n + i]! * lMax) / l[i]!;
      lpA[up + 1 + j] = b;
      lpA[up + 1 + k + j] = -b;
      lpA[dn + 1 + j] = -b;
      lpA[dn + 1 + k + j] = b;
    }
    lpB[2 * i] = hi[i]! / l[i]!;
    lpB[2 * i + 1] = -lo[i]! / l[i]!;
  }
  const last = 2 * n * nv;
  lpA.fill(0, last, last + nv);
  lpA[last] = 1;
  lpB[2 * n] = 1;
  lpC.fill(0, 0, nv);
  lpC[0] = -1;
  if (lpMinimize(lpZ, 2 * n + 1, nv, lpA, lpB, lpC) !== 'optimal') return 0;
  return Math.max(0, Math.min(1, lpZ[0]!));
}

/** Null-space term from LP1's solution (lpZ), into nsTerm. */
function readAlphaFromLp1(arr: WheelArray): void {
  const n = arr.n,
    k = n - 3,
    B = arr.nullBasis;
  let lMax = 0;
  for (let i = 0; i < n; i++) lMax = Math.max(lMax, arr.maxTorqueNm[i]!);
  nsTerm.fill(0, 0, n);
  for (let j = 0; j < k; j++) {
    const a = (lpZ[1 + j]! - lpZ[1 + k + j]!) * lMax;
    for (let i = 0; i < n; i++) nsTerm[i]! += B[j * n + i]! * a;
  }
}

/**
 * LP2: at the scale s, the null-space term Bα with the smallest max_i |(Bα)_i|/τ_max,i that
 * keeps every wheel in its interval. Written as a step δ from LP1's feasible α₁ (so the origin
 * is feasible and no phase 1 is needed, which would accept ~1e-9 infeasibility):
 *   maximise u  s.t.  lo_i ≤ base_i + (Bδ)_i ≤ hi_i,  ±((Bα₁)_i + (Bδ)_i)/l_i + u ≤ T₁,
 * with base = s c + Bα₁, T₁ = max_i |(Bα₁)_i|/l_i, and the peak ratio t = T₁ − u.
 * Adds Bδ to nsTerm on success; leaves nsTerm (= Bα₁) when the LP fails.
 */
function minDeviationLp(arr: WheelArray, s: number): void {
  const n = arr.n,
    k = n - 3,
    l = arr.maxTorqueNm,
    B = arr.nullBasis;
  const nv = 2 * k + 1;
  let lMax = 0,
    t1 = 0;
  for (let i = 0; i < n; i++) {
    lMax = Math.max(lMax, l[i]!);
    t1 = Math.max(t1, Math.abs(nsTerm[i]!) / l[i]!);
  }
  if (t1 === 0) return; // α₁ = 0 is already the smallest change
  for (let i = 0; i < n; i++) {
    const r0 = 4 * i * nv,
      r1 = r0 + nv,
      r2 = r1 + nv,
      r3 = r2 + nv;
    for (let j = 0; j < k; j++) {
      const b = (B[j * n + i]! * lMax) / l[i]!;
      lpA[r0 + j] = b;
      lpA[r0 + k + j] = -b;
      lpA[r1 + j] = -b;
      lpA[r1 + k + j] = b;
      lpA[r2 + j] = b;
      lpA[r2 + k + j] = -b;
      lpA[r3 + j] = -b;
      lpA[r3 + k + j] = b;
    }
    lpA[r0 + 2 * k] = 0;
    lpA[r1 + 2 * k] = 0;
    lpA[r2 + 2 * k] = 1;
    lpA[r3 + 2 * k] = 1;
    const base = s * cmdS[i]! + nsTerm[i]!;
    const d = nsTerm[i]! / l[i]!;
    // LP1's point is feasible up to rounding; a hair below zero is zero.
    lpB[4 * i] = Math.max(0, (hi[i]! - base) / l[i]!);
    lpB[4 * i + 1] = Math.max(0, (base - lo[i]!) / l[i]!);
    lpB[4 * i + 2] = Math.max(0, t1 - d);
    lpB[4 * i + 3] = Math.max(0, t1 + d);
  }
  lpC.fill(0, 0, nv);
  lpC[2 * k] = -1;
  if (lpMinimize(lpZ, 4 * n, nv, lpA, lpB, lpC) !== 'optimal') return;
  for (let j = 0; j < k; j++) {
    const a = (lpZ[j]! - lpZ[k + j]!) * lMax;
    if (a === 0) continue;
    for (let i = 0; i < n; i++) nsTerm[i]! += B[j * n + i]! * a;
  }
}

/**
 * Excess over an interval, relative to τ_max, that counts as rounding of the LP (1e-9 τ_max is
 * 2 nN·m on a 2 mN·m wheel); such a wheel is set onto its bound.
 */
const CLAMP = 1e-9;

function worstExcess(out: Float64Array, arr: WheelArray): number {
  let w = 0;
  for (let i = 0; i < arr.n; i++) w = Math.max(w, (out[i]! - hi[i]!) / arr.maxTorqueNm[i]!, (lo[i]! - out[i]!) / arr.maxTorqueNm[i]!);
  return w;
}

/**
 * Rounding guard: a wheel past its interval by ≤ CLAMP τ_max is set onto the bound (a change
 * far below any physical meaning); a larger excess shrinks the whole vector, which keeps the
 * direction. Returns the shrink factor applied (1 normally).
 */
function enforceIntervals(out: Float64Array, arr: WheelArray): number {
  const n = arr.n;
  let lam = 1;
  for (let i = 0; i < n; i++) {
    const tiny = CLAMP * arr.maxTorqueNm[i]!;
    if (out[i]! > hi[i]!) {
      if (out[i]! - hi[i]! <= tiny) out[i] = hi[i]!;
      else lam = Math.min(lam, hi[i]! / out[i]!);
    } else if (out[i]! < lo[i]!) {
      if (lo[i]! - out[i]! <= tiny) out[i] = lo[i]!;
      else lam = Math.min(lam, lo[i]! / out[i]!);
    }
  }
  if (lam < 1) for (let i = 0; i < n; i++) out[i]! *= lam;
  return lam;
}

/** First wheel sitting on a momentum-derived bound, else on a torque bound, else −1. */
function activeWheel(out: Float64Array, arr: WheelArray): number {
  let torqueWheel = -1;
  for (let i = 0; i < arr.n; i++) {
    const tol = 1e-9 * arr.maxTorqueNm[i]!;
    const atHi = Math.abs(out[i]! - hi[i]!) <= tol;
    const atLo = Math.abs(out[i]! - lo[i]!) <= tol;
    if ((atHi && hiMom[i]) || (atLo && loMom[i])) return i;
    if ((atHi || atLo) && torqueWheel < 0) torqueWheel = i;
  }
  return torqueWheel;
}

function isMomentumBound(out: Float64Array, i: number, arr: WheelArray): boolean {
  const tol = 1e-9 * arr.maxTorqueNm[i]!;
  return (Math.abs(out[i]! - hi[i]!) <= tol && hiMom[i] === 1) || (Math.abs(out[i]! - lo[i]!) <= tol && loMom[i] === 1);
}

/**
 * Null-space momentum management (methods §6): for each null vector ν_j,
 * α_j = −k ν_jᵀh / ‖ν_j‖², out = Σ_j α_j ν_j (length n, N·m). Adding it to a wheel-torque
 * command leaves the body torque unchanged and drives the null-space part of h to zero at rate
 * k (1/s). Zero for three wheels or non-finite input.
 */
export function nullSpaceMomentumBleed(out: Float64Array, arr: WheelArray, hWheel: ArrayLike<number>, gain: number): Float64Array {
  const n = arr.n,
    k = n - 3,
    B = arr.nullBasis;
  out.fill(0, 0, n);
  if (!Number.isFinite(gain)) return out;
  for (let i = 0; i < n; i++) if (!Number.isFinite(hWheel[i])) return out;
  for (let j = 0; j < k; j++) {
    let dot = 0,
      nn = 0;
    for (let i = 0; i < n; i++) {
      dot += B[j * n + i]! * hWheel[i]!;
      nn += B[j * n + i]! * B[j * n + i]!;
    }
    const a = (-gain * dot) / nn;
    for (let i = 0; i < n; i++) out[i]! += a * B[j * n + i]!;
  }
  return out;
}
