/**
 * Shapes of the orbit-aware sequence planner (trackingSequence.ts): moving targets, windows, the
 * timeline that follows them, and the per-target verdict of a slew onto a moving target.
 *
 * Conventions as plan/types.ts: qInertialFromBody scalar-last, body rates in body axes, SI units,
 * times in seconds from the plan start (the scenario epoch). The inertial frame is EME2000.
 */
import type { Issue } from '../errors';
import type { Vec3 } from '../math/mat3';
import type { Quat } from '../math/rotation';
import type { Ephemeris } from '../orbit/ephemeris';
import type { PointingTarget } from '../orbit/targets';
import type { VisibilityWindow } from '../orbit/windows';
import type { BindingLimit, SegmentPlan } from './types';
import type { QuinticOffset } from './trackingSlew';

/** What a target points at: a fixed attitude, or a moving target from the orbit (orbit/targets.ts). */
export type TrackingSource = { kind: 'fixed'; q: Quat } | { kind: 'moving'; target: PointingTarget };

/** When a target is due: at a plan time, or at the start of one of its site's passes. */
export type TrackingWindowInput =
  { kind: 'time'; atS: number } | { kind: 'pass'; passes: readonly VisibilityWindow[]; untilPassEnd: boolean };

export interface TrackingTargetInput {
  label: string;
  /** Hold after tracking starts, s (not used when a pass window holds to the pass end). */
  holdS: number;
  source: TrackingSource;
  window: TrackingWindowInput | null;
}

export interface TrackingSequenceInput {
  /** Attitude at t = 0, body at rest. */
  qStart: ArrayLike<number>;
  /** Design inertia J⊥, column-major (kg·m²). */
  inertia: ArrayLike<number>;
  /** Wheel momentum G h in body axes at t = 0 (N·m·s). */
  wheelMomentumBody: ArrayLike<number>;
  /** The ephemeris moving targets are evaluated on; it must cover [0, horizonS]. */
  ephemeris: Ephemeris;
  /** The plan must end by this plan time, s. */
  horizonS: number;
  targets: readonly TrackingTargetInput[];
}

/** The window a target was scheduled into. */
export interface ScheduledWindow {
  kind: 'pass' | 'time';
  /** Tracking starts here (the pass start, or the given time), s. */
  startS: number;
  /** The pass end (null for a time window), s. */
  endS: number | null;
  /** Index of the pass among its site's passes over the horizon (null for a time window). */
  passIndex: number | null;
  /** Peak elevation of the pass, rad (null for a time window). */
  maxElevationRad: number | null;
}

/**
 * A feasible slew onto (or from) a moving target: the same summary fields as an eigenaxis
 * SegmentPlan, without a scalar rest-to-rest profile (the motion is the quintic offset of
 * trackingSlew.ts). angleRad and axisBody describe the offset ρ₀ from the target at the slew start.
 */
export interface TrackingSegmentPlan {
  feasible: true;
  method: 'tracking';
  qStart: Quat;
  /** The target's attitude when tracking starts (same hemisphere as the reference reaching it). */
  qEnd: Quat;
  axisBody: Vec3;
  angleRad: number;
  wheelMomentumStartBody: Vec3;
  wheelMomentumEndBody: Vec3;
  durationS: number;
  /** Largest |ω_ref| over the slew, rad/s. */
  peakRateRadPerS: number;
  /** Largest |ω̇_ref| over the slew, rad/s². */
  peakAccelRadPerS2: number;
  binding: BindingLimit;
  /** Over the slew and the hold that follows (the hold tracks a moving target), unmargined fractions. */
  peakTorqueFraction: number;
  peakMomentumFraction: number;
  /** Largest rate relative to the target over the slew-rate limit (0 without a limit). */
  slewRateFraction: number;
  summary: string;
}

/** One entry of the flyable timeline. */
export interface TrackingEntry {
  /** Index into the sequence's targets. */
  target: number;
  label: string;
  slewStartS: number;
  /** The slew ends and tracking (or the hold of a fixed attitude) starts. */
  trackStartS: number;
  /** The hold ends: the next slew's start (the hold is extended while the next target waits for its window), or the requested end for the last entry. */
  holdEndS: number;
  /** Tracking start plus the requested hold (or the pass end). */
  requestedHoldEndS: number;
  window: ScheduledWindow | null;
  slew: { kind: 'eigenaxis'; plan: SegmentPlan } | { kind: 'quintic'; offset: QuinticOffset };
  source: TrackingSource;
  /** Fixed target: its attitude in the hemisphere the reference reaches; moving: its attitude at trackStartS. */
  qTrack: Quat;
  /** Moving target: attitudes at liftStartS + i·LIFT_STEP_S with continuous signs (the reference never flips hemisphere). */
  liftStartS: number;
  lift: Float64Array;
  /** Peak envelope fractions while tracking during the (requested) hold. */
  holdTorqueFraction: number;
  holdMomentumFraction: number;
  /** Passes passed over before the one chosen, and why. */
  notes: string[];
}

export interface TrackingPlan {
  entries: TrackingEntry[];
  /** Plain data the reference evaluation needs. */
  ephemeris: Ephemeris;
  qInitial: Quat;
  /** Total momentum, EME2000 (N·m·s): constant, no external torque is modelled. */
  hInertial: Vec3;
}

/** Why a target could not be planned (InfeasibleSegment reasons use Issue). */
export type TrackingReason = Issue;
