/**
 * Per-segment measures against each segment's own TARGET (not the moving reference): settling,
 * rotation travelled against the shortest rotation, and whether the body went the long way
 * round (unwinding). Definitions, stated once here and quoted by every output:
 *
 * - Segment k spans the samples whose `segment` channel is k: from the start of its slew to the
 *   start of the next slew (the last one to the end of the run), so it holds the slew and the hold.
 * - Settle time of a segment: from the segment's first sample (the slew start) until the error
 *   angle to the segment's target and the body rate stay below the settle thresholds through the
 *   segment's last sample (targets are inertial and at rest: the rate error is |ω|). Null when the
 *   last sample is outside them.
 * - Rotation travelled: Σ ‖ω‖ Δt (trapezoidal) from the segment's first sample to the next
 *   segment's first sample (the next slew start; the last segment to the run's last sample), so the
 *   segments tile the run and their sum is ∫‖ω‖ dt over the whole run; shortest: the rotation angle
 *   from the attitude at the segment's start to its target.
 * - Long way: the error quaternion q_target* ⊗ q is continuous along the run; the segment went the
 *   long way when its scalar part η ends with the opposite sign to the one it started with (the
 *   body turned through the 180° error attitude, 2π − θ₀ instead of θ₀; Bhat & Bernstein,
 *   Systems & Control Letters 39(1), 2000; Mayhew, Sanfelice & Teel, IEEE TAC 56(11), 2011).
 * - Unwound: went the long way although the short way was clearly shorter, from a start outside
 *   the worst-case noise band |η₀| < ē (where no law can know which way is short). A law acting on
 *   the quaternion must pick one of ±q (its lift): for it "clearly shorter" is UNWIND_MIN_EXTRA_RAD,
 *   the classic unwinding. A law defined on SO(3) cannot pick a lift; its long way counts as
 *   unwinding only when it adds at least DETOUR_MIN_EXTRA_RAD, a real detour.
 * - Pointing-only segments (a roll-free target with pointed body axis b; scenario/pointingOnly.ts):
 *   only the axis is required, so every error above is the POINTING error ∠(R(q)b, R(q_target)b),
 *   for every law; the shortest is that angle at the segment's start. With the roll free there is
 *   no lift: the long way is measured on the axis' own path, L = Σ |ω × b| Δt (trapezoidal; the
 *   arc the axis sweeps, |d(Rb)/dt| = |ω × b|): long way when L ≥ 2π − θ₀ (as far as going round
 *   the other way), unwound when that other way is also a real detour (2π − 2θ₀ ≥
 *   DETOUR_MIN_EXTRA_RAD; common practice, no source).
 */
import { qAngleBetween, qRotate } from '../math/rotation';
import type { RunTrace } from '../sim/types';
import { RAD_PER_DEG } from '../units';

/**
 * Going the long way counts as unwinding when it is at least this much longer than the short way
 * (2°): a start within 1° of the 180° error attitude has no clearly shorter way (common practice,
 * no source).
 */
export const UNWIND_MIN_EXTRA_RAD = 2 * RAD_PER_DEG;
/** For a law on SO(3): a long way counts as unwinding from 90° more than the short way (common practice, no source). */
export const DETOUR_MIN_EXTRA_RAD = 90 * RAD_PER_DEG;
/** |η| at the segment's end beyond which its lift is decided (the body is within 120° of the target). */
export const LIFT_DECIDED_ETA = 0.5;

export interface SegmentMetrics {
  segment: number;
  /** First and last sample times of the segment (slew start; next slew start or the run's end). */
  tStart: number;
  tEnd: number;
  settleTimeS: number | null;
  /** Error angle to the segment's target at its last sample, rad. */
  finalErrorRad: number;
  shortestRad: number;
  travelledRad: number;
  longWay: boolean;
  unwound: boolean;
}

export interface SegmentOptions {
  settleAngleRad: number;
  settleRateRadPerS: number;
  /** Target attitude of each segment, 4 per segment index ([x, y, z, w]). */
  segmentTargets: Float64Array;
  /** Worst-case bounded noise ē of the run (0: none). */
  boundedNoiseEta: number;
  /** True for a law acting on the quaternion (it picks a lift), false for one defined on SO(3) or S². */
  liftDependent: boolean;
  /**
   * Orbit plans (moving targets): settling, the final error and the long-way test are measured
   * against the reference at each sample (which is the target while tracking) and the rate error is
   * |ω − ω_ref|; the shortest rotation still goes to the segment's target (its attitude when
   * tracking starts).
   */
  movingTargets?: boolean;
  /** Pointed body axis per segment index, 3 each (zeros for a full-attitude segment); absent: none. */
  segmentAxes?: Float64Array;
}

const qa = new Float64Array(4);
const qt = new Float64Array(4);
const axisScratch = new Float64Array(3);
const xa = new Float64Array(3);
const xb = new Float64Array(3);

/** Segment s's pointed axis into `out`, or null for a full-attitude segment. */
export function segmentAxis(out: Float64Array, axes: Float64Array | undefined, s: number): Float64Array | null {
  if (!axes || 3 * s + 2 >= axes.length || s < 0) return null;
  out[0] = axes[3 * s]!;
  out[1] = axes[3 * s + 1]!;
  out[2] = axes[3 * s + 2]!;
  return out[0] !== 0 || out[1] !== 0 || out[2] !== 0 ? out : null;
}

/** ∠(R(qa)b, R(qb)b) for quaternions at offsets ia, ib of a and c (atan2 form, accurate at 0 and π). */
export function pointingErrorBetween(a: ArrayLike<number>, ia: number, c: ArrayLike<number>, ic: number, b: Float64Array): number {
  for (let i = 0; i < 4; i++) qa[i] = a[ia + i]!;
  qRotate(xa, qa, b);
  for (let i = 0; i < 4; i++) qa[i] = c[ic + i]!;
  qRotate(xb, qa, b);
  const cx = xa[1]! * xb[2]! - xa[2]! * xb[1]!,
    cy = xa[2]! * xb[0]! - xa[0]! * xb[2]!,
    cz = xa[0]! * xb[1]! - xa[1]! * xb[0]!;
  return Math.atan2(Math.hypot(cx, cy, cz), xa[0]! * xb[0]! + xa[1]! * xb[1]! + xa[2]! * xb[2]!);
}

/** |ω_k × b|: the rate at which the pointed axis moves, rad/s. */
function axisRate(tr: RunTrace, k: number, b: Float64Array): number {
  const w = tr.omega;
  const x = w[3 * k]!,
    y = w[3 * k + 1]!,
    z = w[3 * k + 2]!;
  return Math.hypot(y * b[2]! - z * b[1]!, z * b[0]! - x * b[2]!, x * b[1]! - y * b[0]!);
}

/** Scalar part of q_target* ⊗ q_k (Hamilton, [x, y, z, w]). */
function etaAt(tr: RunTrace, k: number, target: Float64Array): number {
  const q = tr.q;
  return target[3]! * q[4 * k + 3]! + target[0]! * q[4 * k]! + target[1]! * q[4 * k + 1]! + target[2]! * q[4 * k + 2]!;
}

function loadTarget(o: SegmentOptions, s: number): Float64Array {
  for (let i = 0; i < 4; i++) qt[i] = o.segmentTargets[4 * s + i] ?? (i === 3 ? 1 : 0);
  return qt;
}

function errorToTarget(tr: RunTrace, k: number, target: Float64Array, b: Float64Array | null): number {
  if (b) return pointingErrorBetween(tr.q, 4 * k, target, 0, b);
  for (let i = 0; i < 4; i++) qa[i] = tr.q[4 * k + i]!;
  return qAngleBetween(qa, target);
}

function rateNorm(tr: RunTrace, k: number): number {
  const w = tr.omega;
  const x = w[3 * k]!,
    y = w[3 * k + 1]!,
    z = w[3 * k + 2]!;
  return Math.sqrt(x * x + y * y + z * z);
}

const qr = new Float64Array(4);

function refAt(tr: RunTrace, k: number): Float64Array {
  for (let i = 0; i < 4; i++) qr[i] = tr.qRef[4 * k + i]!;
  return qr;
}

function rateErrorNorm(tr: RunTrace, k: number): number {
  const w = tr.omega,
    r = tr.omegaRef;
  return Math.hypot(w[3 * k]! - r[3 * k]!, w[3 * k + 1]! - r[3 * k + 1]!, w[3 * k + 2]! - r[3 * k + 2]!);
}

/**
 * Settle time of samples a..b: from the segment's first sample to the first sample from which
 * every later sample of the segment is `inside` the thresholds; null when the last one is not.
 */
function settleTimeOf(tr: RunTrace, a: number, b: number, inside: (k: number) => boolean): number | null {
  let lastBad = -1;
  for (let k = b; k >= a; k--)
    if (!inside(k)) {
      lastBad = k;
      break;
    }
  const t = tr.t;
  return lastBad < b ? t[lastBad < a ? a : lastBad + 1]! - t[a]! : null;
}

/** A segment's measures against the moving reference (SegmentOptions.movingTargets). */
function measureMovingSegment(tr: RunTrace, a: number, b: number, o: SegmentOptions): SegmentMetrics {
  const s = tr.segment[a]!;
  const settleTimeS = settleTimeOf(
    tr,
    a,
    b,
    (k) => errorToTarget(tr, k, refAt(tr, k), null) < o.settleAngleRad && rateErrorNorm(tr, k) < o.settleRateRadPerS,
  );
  const t = tr.t;
  const travelled = travelledFrom(tr, a, b);
  const eta0 = etaAt(tr, a, refAt(tr, a));
  const etaEnd = etaAt(tr, b, refAt(tr, b));
  const finalErrorRad = errorToTarget(tr, b, refAt(tr, b), null);
  const shortest = errorToTarget(tr, a, loadTarget(o, s), null);
  const longWay = Math.abs(etaEnd) >= LIFT_DECIDED_ETA && etaEnd * eta0 < 0;
  return {
    segment: s,
    tStart: t[a]!,
    tEnd: t[b]!,
    settleTimeS,
    finalErrorRad,
    shortestRad: shortest,
    travelledRad: travelled,
    longWay,
    unwound: longWay && Math.abs(eta0) >= o.boundedNoiseEta,
  };
}

/**
 * ∫‖ω‖ dt (trapezoid) from sample a on to the next segment's first sample b + 1 when the run has
 * one, so the segments tile the run and their sum is the whole run's rotation travelled.
 */
function travelledFrom(tr: RunTrace, a: number, b: number): number {
  const t = tr.t;
  let travelled = 0;
  let wPrev = rateNorm(tr, a);
  for (let k = a + 1; k <= Math.min(b + 1, tr.n - 1); k++) {
    const wk = rateNorm(tr, k);
    travelled += 0.5 * (wPrev + wk) * (t[k]! - t[k - 1]!);
    wPrev = wk;
  }
  return travelled;
}

/** Measures of the samples a..b (inclusive) of one segment; the travelled rotation runs on to b + 1 when the run does. */
function measureSegment(tr: RunTrace, a: number, b: number, o: SegmentOptions): SegmentMetrics {
  if (o.movingTargets) return measureMovingSegment(tr, a, b, o);
  const s = tr.segment[a]!;
  const target = loadTarget(o, s);
  const axis = segmentAxis(axisScratch, o.segmentAxes, s);
  const settleTimeS = settleTimeOf(
    tr,
    a,
    b,
    (k) => errorToTarget(tr, k, target, axis) < o.settleAngleRad && rateNorm(tr, k) < o.settleRateRadPerS,
  );
  const t = tr.t;
  const travelled = travelledFrom(tr, a, b);
  const shortest = errorToTarget(tr, a, target, axis);
  const extra = 2 * Math.PI - 2 * shortest;
  const finalErrorRad = errorToTarget(tr, b, target, axis);
  if (axis) {
    let path = 0;
    let vPrev = axisRate(tr, a, axis);
    for (let k = a + 1; k <= b; k++) {
      const vk = axisRate(tr, k, axis);
      path += 0.5 * (vPrev + vk) * (t[k]! - t[k - 1]!);
      vPrev = vk;
    }
    const longWay = path >= 2 * Math.PI - shortest;
    const unwound = longWay && extra >= DETOUR_MIN_EXTRA_RAD;
    return {
      segment: s,
      tStart: t[a]!,
      tEnd: t[b]!,
      settleTimeS,
      finalErrorRad,
      shortestRad: shortest,
      travelledRad: travelled,
      longWay,
      unwound,
    };
  }
  const eta0 = etaAt(tr, a, target);
  const etaEnd = etaAt(tr, b, target);
  const longWay = Math.abs(etaEnd) >= LIFT_DECIDED_ETA && etaEnd * eta0 < 0;
  return {
    segment: s,
    tStart: t[a]!,
    tEnd: t[b]!,
    settleTimeS,
    finalErrorRad,
    shortestRad: shortest,
    travelledRad: travelled,
    longWay,
    unwound: longWay && extra >= (o.liftDependent ? UNWIND_MIN_EXTRA_RAD : DETOUR_MIN_EXTRA_RAD) && Math.abs(eta0) >= o.boundedNoiseEta,
  };
}

/** Every segment of a run, in trace order. */
export function segmentMetrics(tr: RunTrace, o: SegmentOptions): SegmentMetrics[] {
  const out: SegmentMetrics[] = [];
  let a = 0;
  for (let k = 1; k <= tr.n; k++)
    if (k === tr.n || tr.segment[k] !== tr.segment[a]) {
      out.push(measureSegment(tr, a, k - 1, o));
      a = k;
    }
  return out;
}
