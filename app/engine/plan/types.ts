/**
 * Shapes of the slew planner: the limits it plans against, one segment's verdict, a sequence's
 * timeline and the flat table the reference evaluator reads.
 *
 * Conventions (rotation.ts header, design.md): attitudes are qInertialFromBody, scalar-last;
 * body rates in body axes; SI units (s, rad, rad/s, N·m, N·m·s, kg·m²). Times in a segment are
 * seconds from that segment's start; times in a sequence are seconds from the plan's start.
 */
import type { Issue } from '../errors';
import type { Mat3, Vec3 } from '../math/mat3';
import type { Quat } from '../math/rotation';
import type { TrackingPlan, TrackingSegmentPlan } from './trackingTypes';

/**
 * What the wheel array can do, as the planner sees it. The wheels module supplies zonotope
 * envelopes through this; tests use a box. A capacity function receives a unit body-frame
 * direction in a scratch buffer (read it, do not keep it) and returns a finite number ≥ 0.
 */
export interface PlanLimits {
  /** Largest |τ| along a unit body direction that the wheel array can deliver (N·m). */
  torqueCapacity(dirBody: Vec3): number;
  /** Largest |h| along a unit body direction the wheels can store (N·m·s). */
  momentumCapacity(dirBody: Vec3): number;
  /** Fraction of the torque envelope the plan may use, (0, 1]. */
  torqueMargin: number;
  /** Fraction of the momentum envelope the plan may use, (0, 1]. */
  momentumMargin: number;
  /** Optional cap on the body rate magnitude (rad/s), > 0. */
  slewRateLimitRadPerS?: number;
  /**
   * Profile family: 'bang-coast-bang' (default) may coast at a rate cap; 'bang-bang' never
   * coasts (accelerate to the midpoint, decelerate), so a rate or momentum cap lowers the
   * acceleration instead of adding a coast.
   */
  family?: ProfileFamily;
}

export type ProfileFamily = 'bang-bang' | 'bang-coast-bang';

/** The limit that stops a faster slew. 'none' for a zero-angle segment. */
export type BindingLimit = 'torque' | 'momentum' | 'slew-rate' | 'none';

export type ProfileKind = 'rest' | 'bang-bang' | 'bang-coast-bang';

/**
 * Scalar rest-to-rest profile of the rotation angle φ(t) ∈ [0, θ] about a fixed axis: constant
 * acceleration +a for accelTimeS, coast at peakRateRadPerS for coastTimeS, −a for accelTimeS.
 */
export interface RestToRestProfile {
  kind: ProfileKind;
  angleRad: number;
  accelRadPerS2: number;
  /** Cruise rate (bang-coast-bang) or the rate at the single switch (bang-bang). */
  peakRateRadPerS: number;
  /** Duration of each bang. */
  accelTimeS: number;
  coastTimeS: number;
  durationS: number;
}

interface SegmentGeometry {
  /** Start attitude (at rest). */
  qStart: Quat;
  /** Target attitude, sign chosen so that qStart ⊗ exp(½ θ e) equals it (same hemisphere). */
  qEnd: Quat;
  /** Eigenaxis e, unit, in body axes (equally fixed in inertial axes during the slew). */
  axisBody: Vec3;
  /** Shortest rotation angle θ ∈ [0, π]. */
  angleRad: number;
  /** Wheel momentum (G h, body frame) at the start, at rest. */
  wheelMomentumStartBody: Vec3;
  /** Wheel momentum at the end, at rest: the total momentum seen from the target attitude. */
  wheelMomentumEndBody: Vec3;
}

export interface SegmentPlan extends SegmentGeometry {
  feasible: true;
  profile: RestToRestProfile;
  /** Minimum feasible time for the profile family (s). */
  durationS: number;
  /** Switch times from the segment start: [T/2] (bang-bang), [t_a, t_a + t_c] (bang-coast-bang). */
  switchTimesS: number[];
  peakRateRadPerS: number;
  binding: BindingLimit;
  /** max over the profile of |τ| / torqueCapacity(τ̂): fraction of the UNMARGINED envelope. */
  peakTorqueFraction: number;
  /** max over the profile of |h_w| / momentumCapacity(ĥ_w), unmargined. */
  peakMomentumFraction: number;
  /** peakRate / slew-rate limit, or 0 without a limit. */
  slewRateFraction: number;
  /** 'closed-form' when the system holds no momentum (H = 0), else 'sampled-search'. */
  method: 'closed-form' | 'sampled-search';
  /** One sentence for a person: what binds and why. */
  summary: string;
}

export interface InfeasibleSegment extends SegmentGeometry {
  feasible: false;
  /** Every reason found, each with a rule name (path is 'segment' or the offending field). */
  reasons: Issue[];
}

export type SegmentVerdict = SegmentPlan | InfeasibleSegment;

/** A target's verdict in a sequence: an eigenaxis slew, an infeasible one, or a slew onto a moving target (orbit plans). */
export type PlannedSegment = SegmentVerdict | TrackingSegmentPlan;

/** One slew-then-hold entry of a sequence timeline (seconds from the plan start). */
export interface TimelineEntry {
  /** Index into the sequence's targets. */
  target: number;
  label: string;
  slewStartS: number;
  slewEndS: number;
  holdEndS: number;
  plan: SegmentPlan;
}

/**
 * Flat per-entry arrays read by evaluateReference / evaluatePlannedLoads without allocation.
 * Entry k occupies [slewStartS[k], holdEndS[k]); its quaternion is q0[4k..4k+3], etc.
 */
export interface ReferenceTable {
  n: number;
  /** Inertia J (column-major), for the planned torque and wheel momentum. */
  inertia: Mat3;
  qInitial: Quat;
  wheelMomentumInitialBody: Vec3;
  qFinal: Quat;
  wheelMomentumFinalBody: Vec3;
  slewStartS: Float64Array;
  slewEndS: Float64Array;
  holdEndS: Float64Array;
  q0: Float64Array;
  axis: Float64Array;
  h0: Float64Array;
  angle: Float64Array;
  accel: Float64Array;
  peakRate: Float64Array;
  accelTime: Float64Array;
  coastTime: Float64Array;
  /**
   * Target index of each entry when several entries fly one target (a constrained slew's legs,
   * pipeline/constrainedPlan.ts); absent: entry k is segment k. evaluateReference returns it.
   */
  segmentOf?: Int32Array;
}

export interface SequencePlan {
  /** True when every target's slew is feasible. */
  feasible: boolean;
  /** One verdict per target, in order (each planned from the previous target's attitude). */
  segments: PlannedSegment[];
  /**
   * The flyable timeline: every segment up to, not including, the first infeasible one. The
   * reference holds the last reached attitude after it.
   */
  timeline: TimelineEntry[];
  /** Index of the first infeasible target, or −1. */
  firstInfeasible: number;
  /** End of the last hold in the timeline (s). */
  totalS: number;
  reference: ReferenceTable;
  /**
   * Orbit plans only (trackingSequence.ts): the timeline with moving targets and windows. When it
   * is present a flight follows it, and `timeline` is empty and `reference` holds the initial
   * attitude (they describe eigenaxis-only sequences).
   */
  tracking?: TrackingPlan;
}
