/**
 * Attitude constraints as plain typed data: keep-out and keep-in cones on body axes, measured
 * against a direction source (a fixed inertial direction or a sampled, time-varying one).
 *
 * Conventions (rotation.ts header, design.md): attitudes are qInertialFromBody, scalar-last
 * [x, y, z, w]; a body axis b points along R(q) b in inertial axes. Angles in radians, times in
 * seconds of plan time. Every type here is plain data (numbers, arrays, Float64Array) so that it
 * crosses Web Worker boundaries by structured clone.
 *
 * The angle that a constraint measures is θ(t) = ∠(R(q(t)) b, s(t)) ∈ [0, π] between the body
 * axis and the source direction, less the source's angular radius r(t) (the angle to the nearest
 * point of the source's disc; r = 0 for a point source):
 *   keep-out margin = (θ − r) − (halfAngle + margin)    (e.g. Earth limb: θ_centre − ρ_Earth)
 *   keep-in  margin = (halfAngle − margin) − (θ − r)
 * A constraint is violated where its margin is negative (zero is allowed).
 */

/** Numbers as the caller has them: a plain array or a Float64Array. */
export type Numbers = readonly number[] | Float64Array;

/** A direction fixed in inertial axes (a star, an inertial reference). */
export interface FixedDirectionSource {
  kind: 'fixed';
  /** Inertial direction, 3 numbers; normalised on validation (must be non-zero). */
  direction: Numbers;
  /** Angular radius of the source's disc (rad, [0, π/2)); default 0 (a point). */
  angularRadiusRad?: number;
}

/**
 * A direction given as samples in time (the Sun, the Moon, the Earth's centre, a ground station),
 * interpolated between samples: 'linear' normalises the linear blend of the two unit vectors,
 * 'great-circle' moves at constant angular rate along the arc between them. Before the first and
 * after the last sample the end direction is held (the check warns when that happens).
 */
export interface SampledDirectionSource {
  kind: 'sampled';
  /** Sample times (s, plan time), strictly increasing, at least one. */
  timesS: Numbers;
  /** Inertial directions, 3 numbers per sample (normalised on validation); consecutive samples < 90° apart. */
  directions: Numbers;
  interpolation: 'linear' | 'great-circle';
  /**
   * Angular radius of the source's disc (rad, [0, π/2)): one number for all times, or one per
   * sample (interpolated linearly in time). Default 0.
   */
  angularRadiusRad?: number | Numbers;
}

export type DirectionSource = FixedDirectionSource | SampledDirectionSource;

export type ConstraintKind = 'keep-out' | 'keep-in';

/** Where a constraint applies (plan time, s); outside it the constraint is not checked. */
export interface ConstraintWindow {
  startS: number;
  endS: number;
}

export interface AttitudeConstraint {
  /** The user's name for it (shown in reports), non-empty. */
  name: string;
  kind: ConstraintKind;
  /** Body axis the cone is attached to, 3 numbers, non-zero (normalised on validation). */
  bodyAxis: Numbers;
  /** Half-angle of the cone about the source direction (rad), in (0, π). */
  halfAngleRad: number;
  /** Extra clearance (rad, ≥ 0): widens a keep-out cone, narrows a keep-in cone. */
  marginRad: number;
  window?: ConstraintWindow;
  source: DirectionSource;
}

/**
 * A validated direction source in one shape: n ≥ 1 samples (a fixed direction is one sample at
 * t = 0), unit directions, radius per sample. `greatCircle` is false for linear blending.
 */
export interface PreparedSource {
  timesS: Float64Array;
  directions: Float64Array;
  greatCircle: boolean;
  /** Radius per sample (rad); constant when `radiusVaries` is false (then radiusRad[0] holds it). */
  radiusRad: Float64Array;
  radiusVaries: boolean;
  /** Per interval j (n − 1 entries): the arc angle Ω_j between samples j and j + 1 (rad). */
  arcAngleRad: Float64Array;
  /** Per interval j: the unit vector p_j ⊥ a_j in the plane of the arc (3 per interval; source.ts). */
  arcBasis: Float64Array;
}

/** A validated constraint: unit axis, window as numbers (±Infinity when absent). */
export interface PreparedConstraint {
  name: string;
  kind: ConstraintKind;
  axisBody: Float64Array;
  halfAngleRad: number;
  marginRad: number;
  windowStartS: number;
  windowEndS: number;
  source: PreparedSource;
  /** Index of the source among the distinct sources of the list (same object → same index). */
  sourceIndex: number;
}

/** An attitude history: n times (strictly increasing) and 4n quaternion numbers qInertialFromBody. */
export interface AttitudeHistory {
  timesS: Numbers;
  qInertialFromBody: Numbers;
}

/** One stretch where a constraint is violated (margin < 0), crossing times interpolated. */
export interface ViolationInterval {
  startS: number;
  endS: number;
  /** Most negative margin inside the stretch (rad) and when. */
  minMarginRad: number;
  minAtS: number;
}

/** The check of one constraint over a history. */
export interface ConstraintCheck {
  name: string;
  kind: ConstraintKind;
  /** Smallest margin over the samples inside the window (rad); NaN when none is inside. */
  minMarginRad: number;
  minAtS: number;
  /** Samples inside the constraint's window. */
  samplesChecked: number;
  intervals: ViolationInterval[];
  /** Total violated time (s). */
  violatedS: number;
  /** Margin per sample (rad), NaN outside the window; present when the check was asked for series. */
  marginRad?: Float64Array;
}

export interface HistoryCheck {
  /** One entry per constraint, in the order given. */
  constraints: ConstraintCheck[];
  /** Smallest margin over every constraint (rad); NaN when nothing was checked. */
  minimumMarginRad: number;
  /** True when no constraint is violated anywhere. */
  clear: boolean;
}
