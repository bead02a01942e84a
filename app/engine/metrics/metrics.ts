/**
 * Run metrics: the numbers an attitude engineer compares controllers by, each with ONE meaning
 * for the CLI, the app, the study and the exports (the definitions live beside their code and
 * are quoted by the UI's metric help):
 * - settling, rotation travelled and unwinding per segment, against each segment's target
 *   (segments.ts); the run settles when every segment does, and its settle time is the longest;
 * - tracking error: peak and RMS of the angle between the attitude and the reference (the planned
 *   profile while following the plan; the target when stepping to it), over the whole run;
 * - chatter: reversals of the commanded torque direction per second in the busiest window,
 *   planned switches excluded (chatter.ts);
 * - wheel peaks, saturation and control effort (wheels.ts);
 * - jumps: logic jumps of a hybrid law;
 * - final error: the angle to the last segment's target at the end of the run.
 * On pointing-only segments (segmentAxes) every error angle is the POINTING error of the axis,
 * ∠(R(q)b, R(q_ref)b) against the reference and ∠(R(q)b, r) against the target (segments.ts), for
 * every law: only the axis is required there (a pointing law's own error-angle channel is that
 * angle already; a full-attitude law's channel keeps its full error, which these metrics do not use).
 * Computed from the stored trace only.
 */
import type { JumpEvent, RunTrace } from '../sim/types';
import { CHATTER_FLOOR_FRACTION, chatterOf } from './chatter';
import { pointingErrorBetween, segmentAxis, segmentMetrics, type SegmentMetrics } from './segments';
import { wheelUse, type WheelPeak, type WheelSaturation } from './wheels';

export type { SegmentMetrics } from './segments';
export type { WheelPeak, WheelSaturation } from './wheels';

export interface MetricOptions {
  settleAngleRad: number;
  settleRateRadPerS: number;
  chatterWindowS: number;
  maxTorqueNm: ArrayLike<number>;
  maxMomentumNms: ArrayLike<number>;
  /** Target attitude of each segment, 4 per segment index ([x, y, z, w]). */
  segmentTargets: Float64Array;
  /** Planned switch instants of the reference (s); torque reversals there belong to the plan. */
  plannedSwitchTimes?: ArrayLike<number>;
  /** Chatter floor, N·m (default CHATTER_FLOOR_FRACTION of the smallest wheel torque limit). */
  chatterFloorNm?: number;
  /** Worst-case bounded noise ē of the run, for the unwinding test (default 0). */
  boundedNoiseEta?: number;
  /** Whether the law acts on the quaternion, picking a lift (default true; segments.ts). */
  liftDependent?: boolean;
  /** Orbit plans: measure segments against the moving reference (segments.ts movingTargets). */
  movingTargets?: boolean;
  /** Pointed body axis per segment index, 3 each (zeros: full attitude); absent: every segment is a full attitude. */
  segmentAxes?: Float64Array;
}

export interface RunMetrics {
  /** Longest segment settle time, s (null when any segment does not settle). */
  settleTimeS: number | null;
  settled: boolean;
  trackingErrorPeakRad: number;
  trackingErrorRmsRad: number;
  rotationTravelledRad: number;
  shortestRotationRad: number;
  longWay: boolean;
  unwound: boolean;
  jumps: number;
  chatterPerS: number;
  /** Commanded-torque direction reversals outside the plan's own switches. */
  torqueReversals: number;
  peakWheelTorqueFraction: number;
  peakWheelMomentumFraction: number;
  peakTorque: WheelPeak;
  peakMomentum: WheelPeak;
  saturation: WheelSaturation[];
  controlEffortNms: number;
  finalErrorRad: number;
  finalRateRadPerS: number;
  segments: SegmentMetrics[];
}

const axisScratch = new Float64Array(3);

/** The error angle at sample k: the law's, or on a pointing-only segment the pointing error to the reference. */
function errorAt(tr: RunTrace, k: number, axes: Float64Array | undefined): number {
  const b = axes ? segmentAxis(axisScratch, axes, tr.segment[k]!) : null;
  return b ? pointingErrorBetween(tr.q, 4 * k, tr.qRef, 4 * k, b) : tr.errorAngle[k]!;
}

function trackingError(tr: RunTrace, axes: Float64Array | undefined): { peak: number; rms: number } {
  let peak = 0,
    sum = 0,
    span = 0,
    p = 0;
  for (let k = 0; k < tr.n; k++) {
    const e = errorAt(tr, k, axes);
    if (e > peak) peak = e;
    if (k > 0) {
      const dt = tr.t[k]! - tr.t[k - 1]!;
      sum += 0.5 * (p * p + e * e) * dt;
      span += dt;
    }
    p = e;
  }
  return { peak, rms: span > 0 ? Math.sqrt(sum / span) : peak };
}

function smallest(a: ArrayLike<number>): number {
  let m = Infinity;
  for (let i = 0; i < a.length; i++) m = Math.min(m, a[i]!);
  return Number.isFinite(m) ? m : 0;
}

export function computeMetrics(tr: RunTrace, jumps: readonly JumpEvent[], o: MetricOptions): RunMetrics {
  const segments = segmentMetrics(tr, {
    settleAngleRad: o.settleAngleRad,
    settleRateRadPerS: o.settleRateRadPerS,
    segmentTargets: o.segmentTargets,
    boundedNoiseEta: o.boundedNoiseEta ?? 0,
    liftDependent: o.liftDependent ?? true,
    movingTargets: o.movingTargets ?? false,
    ...(o.segmentAxes ? { segmentAxes: o.segmentAxes } : {}),
  });
  const settled = segments.length > 0 && segments.every((s) => s.settleTimeS !== null);
  const chatter = chatterOf(tr, {
    windowS: o.chatterWindowS,
    floorNm: o.chatterFloorNm ?? CHATTER_FLOOR_FRACTION * smallest(o.maxTorqueNm),
    plannedSwitchTimes: o.plannedSwitchTimes ?? [],
  });
  const wheels = wheelUse(tr, o.maxTorqueNm, o.maxMomentumNms);
  const tracking = trackingError(tr, o.segmentAxes);
  const last = segments[segments.length - 1];
  const n = tr.n;
  const w = tr.omega;
  const finalRate = n > 0 ? Math.hypot(w[3 * n - 3]!, w[3 * n - 2]!, w[3 * n - 1]!) : 0;
  return {
    settleTimeS: settled ? Math.max(...segments.map((s) => s.settleTimeS!)) : null,
    settled,
    trackingErrorPeakRad: tracking.peak,
    trackingErrorRmsRad: tracking.rms,
    rotationTravelledRad: segments.reduce((s, g) => s + g.travelledRad, 0),
    shortestRotationRad: segments.reduce((s, g) => s + g.shortestRad, 0),
    longWay: segments.some((g) => g.longWay),
    unwound: segments.some((g) => g.unwound),
    jumps: jumps.length,
    chatterPerS: chatter.perS,
    torqueReversals: chatter.reversals,
    peakWheelTorqueFraction: wheels.torque.fraction,
    peakWheelMomentumFraction: wheels.momentum.fraction,
    peakTorque: wheels.torque,
    peakMomentum: wheels.momentum,
    saturation: wheels.saturation,
    controlEffortNms: wheels.effortNms,
    finalErrorRad: last ? last.finalErrorRad : 0,
    finalRateRadPerS: finalRate,
    segments,
  };
}
