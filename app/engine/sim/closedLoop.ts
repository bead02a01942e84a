/**
 * The closed loop: gyrostat plant + sensors + sampled (or ideal continuous) controller + wheel
 * allocation, limits and actuation model. Two solvers share one loop state (loop.ts):
 *  - sampled (sampled.ts): the zero-order-hold system of methods §7, a fixed-step loop of its own
 *    with every controller update at a scheduled instant k·Ts — what flight software does;
 *  - continuous-ideal (ideal.ts): the torque is a function of the true state inside the flow and
 *    logic switches are located on the jump-set boundary by the general hybrid simulator — the
 *    setting of the stability theorems.
 *
 * Hybrid state: the plant state x = [q(4), ω(3), h(N)] flows; the controller's logic value, the
 * held wheel torques and the sample clock are the discrete part. The run's jump counter j counts
 * LOGIC jumps only.
 *
 * Per-segment latching (`beginSegment`, e.g. the eigenaxis law's limits) happens only at jumps:
 * at the first sample of a new segment in sampled mode, from the MEASURED state the controller
 * sees; in the ideal mode at the reference's switch time, from the true state.
 */
import type { AttitudeController } from '../control/types';
import type { Gyrostat } from '../body/gyrostat';
import type { WheelArray } from '../wheels/array';
import { qNormalize } from '../math/rotation';
import type { SensorModel } from './sensors';
import { LoopCore } from './loop';
import { runSampled } from './sampled';
import { runIdeal } from './ideal';
import type { Actuation, JumpEvent, RunOutcome, RunStatus, RunTrace } from './types';
import type { SampleSink } from './sink';
import type { SensorNoiseTape } from './noiseTape';

export type { Actuation } from './types';

/**
 * A rule that may end a flight early, asked at every recorded sample with the error angle and the
 * rate error |ω − ω_ref| (metrics/settle.ts SettleWatch is the one the pipeline uses).
 */
export interface StopRule {
  update(t: number, errorAngleRad: number, rateErrorRadPerS: number): boolean;
}

/** Where the controller's reference comes from: a planned profile or a fixed target per segment. */
export interface ReferenceSource {
  /** Writes the reference at time t; returns the active segment index. */
  at(t: number, qOut: Float64Array, omegaOut: Float64Array, omegaDotOut: Float64Array): number;
  /**
   * Times where the active segment changes (ascending, s), when known. In continuous-ideal mode
   * the run lands on each one (so a piecewise-constant reference is not smeared across an RK4
   * step and the law latches its per-segment data at the exact instant). Not used when sampled.
   */
  switchTimes?: ArrayLike<number>;
  /**
   * Pointing-only segments: the pointed body axis of segment k at [3k, 3k + 3) (unit; zeros for a
   * full-attitude segment). The loop hands the active one to the law (ControlInput.pointingAxis)
   * and to the worst-case pointing noise. Absent: every segment is a full attitude.
   */
  pointingAxes?: Float64Array;
}

export interface ClosedLoopConfig {
  plant: Gyrostat;
  wheels: WheelArray;
  controller: AttitudeController;
  reference: ReferenceSource;
  q0: ArrayLike<number>;
  omega0: ArrayLike<number>;
  hWheel0: ArrayLike<number>;
  tEnd: number;
  timing: 'sampled' | 'continuous-ideal';
  controlRateHz: number;
  /** RK4 steps per control period (sampled) or per output interval (continuous-ideal). */
  rk4StepsPerSample: number;
  sensors: SensorModel;
  seed: number;
  /** Random stream (e.g. a study case index) so cases are independent and repeatable. */
  stream?: number;
  actuation: Actuation;
  allocation: 'min-max' | 'min-norm';
  /**
   * Fraction f ∈ [0, 1] of the modelled bearing friction the wheel drives add to each motor
   * command (friction feedforward from the wheel speeds); 0 or absent: none.
   */
  frictionFeedforward?: number;
  /** Ends the flight early when it says so (e.g. settled long enough); absent: fly to tEnd. */
  stopRule?: StopRule;
  /** Cap on logic jumps at one instant before the run is declared Zeno-like. */
  maxJumpsPerInstant?: number;
  /**
   * Cap on RK4 steps of the run (the pipeline's resource budget, pipeline/budget.ts, sets it a
   * little above its own estimate): a run that reaches it stops with status 'max-steps' and a
   * trace that ends there. Absent: 1e7.
   */
  maxSteps?: number;
  /** Cancellation hook polled at samples. */
  shouldStop?: () => boolean;
  /** Record into this memory (sim/trace.ts traceArena), which the next run will overwrite; absent: new arrays. */
  traceArena?: RunTrace;
  /** Every recorded sample goes here instead of the trace (sink.ts); the result's trace is then empty. */
  sink?: SampleSink;
  /**
   * Read the sensor noise from this tape (noiseTape.ts), begun here with the run's seed, stream
   * and σs, instead of drawing it: the same measured values; runs drawing the same realisation
   * (a study case's laws) share the draws. Used by sampled runs of at most NOISE_TAPE_MAX_SAMPLES.
   */
  noiseTape?: SensorNoiseTape;
}

export interface ClosedLoopResult {
  trace: RunTrace;
  jumps: JumpEvent[];
  outcome: RunOutcome;
}

/** How a solver ended, with its last state. */
export interface LoopEnd {
  status: RunStatus;
  message: string;
  t: number;
  x: Float64Array;
}

export function runClosedLoop(cfg: ClosedLoopConfig): ClosedLoopResult {
  const core = new LoopCore(cfg);
  const N = cfg.wheels.n;
  const x0 = new Float64Array(7 + N);
  for (let i = 0; i < 4; i++) x0[i] = cfg.q0[i]!;
  for (let i = 0; i < 3; i++) x0[4 + i] = cfg.omega0[i]!;
  for (let i = 0; i < N; i++) x0[7 + i] = cfg.hWheel0[i]!;
  const q = new Float64Array(4);
  qNormalize(q, x0);
  x0.set(q, 0);

  const end = cfg.timing === 'sampled' ? runSampled(core, x0) : runIdeal(core, x0);

  // Last state: record it if the run did not end exactly on a sample, against the reference at
  // that time (not the last sample's), so the final error is the error at the end.
  const tr = core.builder.trace;
  const n = core.sink ? core.sink.count : tr.n;
  if (core.fault === null && (n === 0 || end.t > (core.sink ? core.sink.lastT : tr.t[n - 1]!) + 1e-9)) {
    core.unpack(end.x);
    core.segment = core.ref.at(end.t, core.qRef, core.wRef, core.wdRef);
    core.loadAxis(core.segment);
    core.record(end.t);
  }
  const outcome: RunOutcome = { status: end.status, message: end.message, t: end.t, j: core.logicJumps, plannedEndS: cfg.tEnd };
  if (core.fault !== null && end.status === 'completed') {
    // Only the final record can find a fault after the solver has finished.
    outcome.status = 'non-finite';
    outcome.message = core.fault;
  }
  if (core.stopRequested && end.status === 'cancelled' && !cfg.shouldStop?.()) {
    outcome.status = 'completed';
    outcome.message = `the stop rule ended the run at t = ${end.t.toFixed(1)} s (settled long enough)`;
  }
  return { trace: core.builder.finish(), jumps: core.jumps, outcome };
}
