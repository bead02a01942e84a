/**
 * Run metrics: the numbers an attitude engineer compares controllers by. Computed from the stored
 * trace only, so the CLI, the app and the robustness study all report the same thing.
 *
 * Definitions (common practice, no single source; stated here so every output can quote them):
 * - settle time: the earliest sample time after which the error angle stays below
 *   `settleAngleRad` AND the rate error |ω − ω_ref| stays below `settleRateRadPerS` until the end
 *   of the run (null when the run never settles).
 * - rotation travelled: Σ ‖ω‖ Δt (trapezoidal) per maneuver segment, compared with the shortest
 *   rotation from the attitude at the segment's start to its target. A segment "unwinds" when it
 *   travels more than π beyond the shortest rotation (the extra full turn of Bhat & Bernstein,
 *   Systems & Control Letters 39(1), 2000).
 * - chatter: the largest number of logic jumps plus body-torque sign reversals (any axis, ignoring
 *   torques below 2 % of the run's peak) inside any sliding window of `chatterWindowS`, divided by
 *   the window — events per second.
 * - peak wheel torque / momentum: max over wheels and samples of |τ_i| / τ_max,i and |h_i| / h_max,i.
 * - control effort: ∫ ‖τ_body‖ dt of the delivered torque (trapezoidal), N·m·s.
 */
import type { JumpEvent, RunTrace } from '../sim/types';
import { qAngleBetween } from '../math/rotation';

export interface MetricOptions {
  settleAngleRad: number;
  settleRateRadPerS: number;
  chatterWindowS: number;
  maxTorqueNm: ArrayLike<number>;
  maxMomentumNms: ArrayLike<number>;
  /** Target attitude of each segment, 4 per segment ([x,y,z,w]). */
  segmentTargets: Float64Array;
}

export interface SegmentMetrics {
  segment: number;
  tStart: number;
  tEnd: number;
  shortestRad: number;
  travelledRad: number;
  unwound: boolean;
}

export interface RunMetrics {
  settleTimeS: number | null;
  settled: boolean;
  rotationTravelledRad: number;
  shortestRotationRad: number;
  unwound: boolean;
  jumps: number;
  chatterPerS: number;
  torqueReversals: number;
  peakWheelTorqueFraction: number;
  peakWheelMomentumFraction: number;
  controlEffortNms: number;
  finalErrorRad: number;
  finalRateErrorRadPerS: number;
  segments: SegmentMetrics[];
}

export function computeMetrics(trace: RunTrace, jumps: readonly JumpEvent[], o: MetricOptions): RunMetrics {
  const n = trace.n;
  const N = trace.nWheels;
  const t = trace.t;
  if (n === 0) {
    return {
      settleTimeS: null,
      settled: false,
      rotationTravelledRad: 0,
      shortestRotationRad: 0,
      unwound: false,
      jumps: 0,
      chatterPerS: 0,
      torqueReversals: 0,
      peakWheelTorqueFraction: 0,
      peakWheelMomentumFraction: 0,
      controlEffortNms: 0,
      finalErrorRad: 0,
      finalRateErrorRadPerS: 0,
      segments: [],
    };
  }

  // Rate error per sample: ω − R_eᵀ ω_ref ≈ ω − ω_ref near the reference; use the plain difference
  // of body components, which equals the body-frame rate error when the attitude error is small
  // (where settling is judged). (Math.sqrt of a sum rather than Math.hypot: hypot is not inlined
  // and returns a boxed number per call.)
  const w = trace.omega,
    wr = trace.omegaRef;
  const rateErr = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const dx = w[3 * k]! - wr[3 * k]!,
      dy = w[3 * k + 1]! - wr[3 * k + 1]!,
      dz = w[3 * k + 2]! - wr[3 * k + 2]!;
    rateErr[k] = Math.sqrt(dx * dx + dy * dy + dz * dz);
  }

  // Settle time: scan backwards for the last sample outside the thresholds.
  let lastBad = -1;
  for (let k = n - 1; k >= 0; k--) {
    if (!(trace.errorAngle[k]! < o.settleAngleRad && rateErr[k]! < o.settleRateRadPerS)) {
      lastBad = k;
      break;
    }
  }
  const settled = lastBad < n - 1;
  const settleTimeS = settled ? t[lastBad + 1]! : null;

  // Rotation travelled per segment.
  const segments: SegmentMetrics[] = [];
  const qStart = new Float64Array(4);
  const qTgt = new Float64Array(4);
  const closeSegment = (k0: number, kEnd: number, travelled: number) => {
    const s = trace.segment[k0]!;
    for (let i = 0; i < 4; i++) {
      qStart[i] = trace.q[4 * k0 + i]!;
      qTgt[i] = o.segmentTargets[4 * s + i] ?? 0;
    }
    const shortest = qAngleBetween(qStart, qTgt);
    segments.push({
      segment: s,
      tStart: t[k0]!,
      tEnd: t[kEnd]!,
      shortestRad: shortest,
      travelledRad: travelled,
      unwound: travelled - shortest > Math.PI,
    });
  };
  let k0 = 0;
  let travelled = 0;
  let wPrev = Math.sqrt(w[0]! * w[0]! + w[1]! * w[1]! + w[2]! * w[2]!);
  for (let k = 1; k < n; k++) {
    const wx = w[3 * k]!,
      wy = w[3 * k + 1]!,
      wz = w[3 * k + 2]!;
    const wk = Math.sqrt(wx * wx + wy * wy + wz * wz);
    if (trace.segment[k] !== trace.segment[k0]) {
      closeSegment(k0, k - 1, travelled);
      k0 = k;
      travelled = 0;
    } else travelled += 0.5 * (wPrev + wk) * (t[k]! - t[k - 1]!);
    wPrev = wk;
  }
  closeSegment(k0, n - 1, travelled);

  // Peaks, effort, torque reversals.
  const tb = trace.torqueBody,
    tc = trace.torqueCmdBody;
  let peakTau = 0,
    peakH = 0,
    effort = 0,
    peakBody = 0,
    tbPrev = 0;
  for (let k = 0; k < n; k++) {
    for (let i = 0; i < N; i++) {
      peakTau = Math.max(peakTau, Math.abs(trace.wheelTorque[N * k + i]!) / o.maxTorqueNm[i]!);
      peakH = Math.max(peakH, Math.abs(trace.hWheel[N * k + i]!) / o.maxMomentumNms[i]!);
    }
    const bx = tb[3 * k]!,
      by = tb[3 * k + 1]!,
      bz = tb[3 * k + 2]!;
    const tbk = Math.sqrt(bx * bx + by * by + bz * bz);
    peakBody = Math.max(peakBody, Math.abs(tc[3 * k]!), Math.abs(tc[3 * k + 1]!), Math.abs(tc[3 * k + 2]!));
    if (k > 0) effort += 0.5 * (tbk + tbPrev) * (t[k]! - t[k - 1]!);
    tbPrev = tbk;
  }
  const floor = 0.02 * peakBody;
  const eventTimes: number[] = [];
  const lastSign = [0, 0, 0];
  for (let k = 0; k < n; k++) {
    for (let a = 0; a < 3; a++) {
      const v = trace.torqueCmdBody[3 * k + a]!;
      if (Math.abs(v) <= floor) continue;
      const s = v > 0 ? 1 : -1;
      if (lastSign[a] !== 0 && s !== lastSign[a]) eventTimes.push(t[k]!);
      lastSign[a] = s;
    }
  }
  const torqueReversals = eventTimes.length;
  for (const j of jumps) eventTimes.push(j.t);
  eventTimes.sort((a, b) => a - b);
  let maxInWindow = 0;
  for (let lo = 0, hi = 0; hi < eventTimes.length; hi++) {
    while (eventTimes[hi]! - eventTimes[lo]! > o.chatterWindowS) lo++;
    maxInWindow = Math.max(maxInWindow, hi - lo + 1);
  }

  const shortestRotationRad = segments.reduce((s, g) => s + g.shortestRad, 0);
  const rotationTravelledRad = segments.reduce((s, g) => s + g.travelledRad, 0);
  return {
    settleTimeS,
    settled,
    rotationTravelledRad,
    shortestRotationRad,
    unwound: segments.some((g) => g.unwound),
    jumps: jumps.length,
    chatterPerS: maxInWindow / o.chatterWindowS,
    torqueReversals,
    peakWheelTorqueFraction: peakTau,
    peakWheelMomentumFraction: peakH,
    controlEffortNms: effort,
    finalErrorRad: trace.errorAngle[n - 1]!,
    finalRateErrorRadPerS: rateErr[n - 1]!,
    segments,
  };
}
