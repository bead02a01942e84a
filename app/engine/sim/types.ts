/**
 * The shape of a closed-loop run: what the simulator hands to metrics, exports, plots and 3D.
 *
 * All per-sample channels are flat Float64Arrays, sample-major: channel `q` of sample k is
 * q[4k .. 4k+3] in `[x, y, z, w]` order; per-wheel channels hold `nWheels` values per sample.
 * One sample per control sample (the zero-order-hold instants) plus, in ideal continuous mode, one
 * at each located jump. Time in seconds from the scenario's start epoch; SI units throughout.
 */

import type { JumpEvent } from '../hybrid/types';

export type { JumpEvent };

/**
 * How a controller is given the maneuver: follow-plan — it tracks the planned slew (attitude,
 * rate and acceleration of the reference profile); step-target — it is handed each target at
 * once, at rest, when that target's slew is due.
 */
export type RunMode = 'follow-plan' | 'step-target';

/** How a sampled torque command reaches the wheels. */
export type Actuation =
  | { mode: 'hold' }
  /** Each control period's wheel torque as a full-torque pulse of proportional width. */
  | { mode: 'pwm' }
  /** Each wheel torque rounded to a multiple of the quantum (N·m). */
  | { mode: 'quantized'; quantumNm: number };

export type RunStatus = 'completed' | 'zeno' | 'step-underflow' | 'non-finite' | 'max-steps' | 'cancelled';

export interface RunOutcome {
  status: RunStatus;
  /** Sentence for a person: what stopped the run and where. */
  message: string;
  /** Hybrid time where the run ended. */
  t: number;
  j: number;
  /** The end time the run was asked to reach, s (t < plannedEndS when it stopped early). */
  plannedEndS?: number;
}

export interface RunTrace {
  n: number;
  nWheels: number;
  t: Float64Array;
  /** Hybrid jump counter at the sample (logic jumps only, not timer resets). */
  j: Int32Array;
  /** Maneuver segment index (target number) active at the sample. */
  segment: Int32Array;
  /** Attitude qInertialFromBody, 4 per sample. */
  q: Float64Array;
  /** Body rate in body axes, rad/s, 3 per sample. */
  omega: Float64Array;
  /** Wheel axial (absolute) momentum, N·m·s, nWheels per sample. */
  hWheel: Float64Array;
  /** Reference attitude (the target in direct mode), 4 per sample. */
  qRef: Float64Array;
  /** Reference body rate, rad/s, 3 per sample. */
  omegaRef: Float64Array;
  /** Controller's body torque request, N·m, 3 per sample (held over the sample period). */
  torqueCmdBody: Float64Array;
  /** Body torque actually delivered by the wheels after limits, N·m, 3 per sample. */
  torqueBody: Float64Array;
  /** Commanded wheel motor torques (allocation output), N·m, nWheels per sample. */
  wheelTorqueCmd: Float64Array;
  /** Delivered wheel motor torques after torque and momentum limits (the period average), N·m, nWheels per sample. */
  wheelTorque: Float64Array;
  /** Net torque on each rotor: the delivered motor torque minus bearing friction, = dh/dt, N·m, nWheels per sample. */
  wheelTorqueNet: Float64Array;
  /** Controller logic value (h ∈ {−1, 1}, synergistic index q ∈ {1..M}, 0 for smooth laws). */
  logic: Float64Array;
  /** Shortest rotation angle from the true attitude to the reference, rad. */
  errorAngle: Float64Array;
  /** Active potential V_q (0 where the law has none). */
  potential: Float64Array;
  /** Minimum over the family min_p V_p. */
  potentialMin: Float64Array;
  /** Synergy gap μ = V_q − min_p V_p. */
  gap: Float64Array;
  /** Lyapunov value W. */
  lyapunov: Float64Array;
}
