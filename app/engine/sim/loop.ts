/**
 * The loop state the sampled and the ideal closed loops share (sampled.ts, ideal.ts): the true and
 * measured state, the reference, the controller's logic value and its jumps, the wheel commands,
 * the trace, and the three steps every sample or located jump takes — logic update, wheel
 * actuation within limits, and recording.
 *
 * Conventions (closedLoop.ts header): plant state x = [q(4), ω(3), h(N)]; the run's jump counter j
 * counts LOGIC jumps only. Nothing here allocates per sample (buffers made once per run; doubles
 * that change per sample sit in typed arrays, which V8 does not box).
 */
import type { AttitudeController, ControlDiagnostics, ControlInput } from '../control/types';
import { wheelFrictionTorqueAt } from '../body/gyrostat';
import { allocateMinMax, allocateMinNorm } from '../wheels/allocation';
import { bodyTorqueFromWheelTorque } from '../wheels/array';
import { createLimitInfo, limitWheelTorque } from '../wheels/limits';
import { makeRng, type Rng } from '../math/prng';
import type { ClosedLoopConfig, ReferenceSource, StopRule } from './closedLoop';
import {
  PACKED_ERROR_ANGLE,
  PACKED_GAP,
  PACKED_LOGIC,
  PACKED_LYAPUNOV,
  PACKED_POTENTIAL,
  PACKED_POTENTIAL_MIN,
  PACKED_SCALARS,
  PACKED_T,
  TraceBuilder,
  type PackedSample,
} from './trace';
import type { JumpEvent } from './types';
import { firstNonFinite } from './finite';
import type { SampleSink } from './sink';
import { NOISE_TAPE_MAX_SAMPLES, type SensorNoiseTape } from './noiseTape';

/**
 * Samples a trace starts with; it grows by doubling, never past the run's expected sample count
 * while below it, so a long run is neither allocated up front nor left with unused capacity.
 */
const INITIAL_TRACE_CAPACITY = 4096;
/**
 * A run expecting at most this many samples (27 min at 10 Hz, 5.8 MB of a four-wheel trace) gets
 * its whole trace at once: no growth copy per short run (a run stopped early keeps at most that
 * much unused capacity). So does a run of any length without a stop rule, which flies to tEnd
 * unless cancelled or faulty: a day-long trace is then never held twice while it grows.
 */
const WHOLE_TRACE_UP_FRONT = 16_384;

export class LoopCore {
  readonly N: number;
  readonly Ts: number;
  readonly ctrl: AttitudeController;
  readonly ref: ReferenceSource;
  readonly rng: Rng;
  readonly builder: TraceBuilder;
  readonly jumps: JumpEvent[] = [];
  readonly maxPerInstant: number;
  readonly stopRule: StopRule | null;
  /** Takes the samples instead of the trace (sink.ts); null: the trace records them. */
  readonly sink: SampleSink | null;
  /** The sensor noise read from this tape (begun for this run) instead of drawn from rng; null: drawn. */
  readonly noiseTape: SensorNoiseTape | null;

  readonly qRef = new Float64Array(4);
  readonly wRef = new Float64Array(3);
  readonly wdRef = new Float64Array(3);
  /** Pointed body axis of the active segment (zeros for a full-attitude segment). */
  readonly axis = new Float64Array(3);
  readonly qTrue = new Float64Array(4);
  readonly wTrue = new Float64Array(3);
  readonly hTrue: Float64Array;
  readonly qMeas = new Float64Array(4);
  readonly wMeas = new Float64Array(3);
  readonly hMeas: Float64Array;
  /** What the law sees (measured) and the true state with the same reference. */
  readonly input: ControlInput;
  readonly trueInput: ControlInput;
  readonly diag: ControlDiagnostics = { errorAngle: 0, eta: 0, potential: 0, potentialMin: 0, gap: 0, lyapunov: 0 };
  /** Body torque request and delivered body torque, N·m. */
  readonly tauCmd = new Float64Array(3);
  readonly tauBody = new Float64Array(3);
  /** Wheel torques: allocation output, delivered average over the period, applied right now. */
  readonly wheelCmd: Float64Array;
  readonly wheelHeld: Float64Array;
  readonly wheelNow: Float64Array;
  /** Bearing friction and the net rotor torque (motor − friction) at the recorded instant. */
  private readonly friction: Float64Array;
  private readonly motorReq: Float64Array;
  readonly wheelNet: Float64Array;
  private readonly limitInfo = createLimitInfo();
  private readonly rec: PackedSample;

  /**
   * Set by the sampled loop when the law's last torque saw exactly the true state (no sensor
   * error this sample): record() then takes the diagnostics from the tracking error the torque
   * formed instead of forming it again (same bits). Cleared by record().
   */
  torqueSawTrueState = false;
  /**
   * The sensor model measures the true state with nothing added (no noise, no worst-case model,
   * rate bias ±0): sensors.ts then copies q and writes ω as (ω + b) + 0, so the measured state is
   * the true one bit for bit except where a rate is −0 (−0 + 0 = +0) or NaN.
   */
  private readonly sensorsAddNothing: boolean;

  logic = NaN;
  logicJumps = 0;
  segment = -1;
  stopRequested = false;
  /**
   * Why the run must stop because a value became non-finite (the sample holding it is not
   * recorded: the trace ends at the last finite sample); null while every value is finite.
   */
  fault: string | null = null;

  constructor(readonly cfg: ClosedLoopConfig) {
    const N = cfg.wheels.n;
    this.N = N;
    this.Ts = 1 / cfg.controlRateHz;
    this.ctrl = cfg.controller;
    this.ref = cfg.reference;
    this.rng = makeRng(cfg.seed, cfg.stream ?? 0);
    this.maxPerInstant = cfg.maxJumpsPerInstant ?? 20;
    this.stopRule = cfg.stopRule ?? null;
    this.sink = cfg.sink ?? null;
    const sm0 = cfg.sensors;
    const tape = cfg.noiseTape ?? null;
    this.noiseTape =
      tape !== null && cfg.timing === 'sampled' && Math.ceil(cfg.tEnd * cfg.controlRateHz) < NOISE_TAPE_MAX_SAMPLES ? tape : null;
    this.noiseTape?.begin(cfg.seed, cfg.stream ?? 0, sm0.attitudeSigmaRad, sm0.rateSigmaRadPerS);
    const sm = cfg.sensors;
    const b = sm.rateBiasRadPerS;
    this.sensorsAddNothing =
      sm.attitudeSigmaRad === 0 &&
      sm.rateSigmaRadPerS === 0 &&
      sm.adversarialEta === 0 &&
      (sm.antipodalNoiseRad ?? 0) === 0 &&
      b[0] === 0 &&
      b[1] === 0 &&
      b[2] === 0;
    this.hTrue = new Float64Array(N);
    this.hMeas = new Float64Array(N);
    this.wheelCmd = new Float64Array(N);
    this.wheelHeld = new Float64Array(N);
    this.wheelNow = new Float64Array(N);
    this.friction = new Float64Array(N);
    this.motorReq = new Float64Array(N);
    this.wheelNet = new Float64Array(N);
    this.input = {
      q: this.qMeas,
      omega: this.wMeas,
      hWheel: this.hMeas,
      qRef: this.qRef,
      omegaRef: this.wRef,
      omegaDotRef: this.wdRef,
      pointingAxis: this.axis,
    };
    this.trueInput = {
      q: this.qTrue,
      omega: this.wTrue,
      hWheel: this.hTrue,
      qRef: this.qRef,
      omegaRef: this.wRef,
      omegaDotRef: this.wdRef,
      pointingAxis: this.axis,
    };
    const samples = Math.ceil(cfg.tEnd / this.Ts) + 8;
    const upFront = samples <= WHOLE_TRACE_UP_FRONT || this.stopRule === null;
    this.builder = this.sink
      ? new TraceBuilder(N, 0)
      : new TraceBuilder(N, upFront ? samples : INITIAL_TRACE_CAPACITY, samples, cfg.traceArena);
    this.rec = {
      j: 0,
      segment: 0,
      scalars: new Float64Array(PACKED_SCALARS),
      q: this.qTrue,
      omega: this.wTrue,
      hWheel: this.hTrue,
      qRef: this.qRef,
      omegaRef: this.wRef,
      torqueCmdBody: this.tauCmd,
      torqueBody: this.tauBody,
      wheelTorqueCmd: this.wheelCmd,
      wheelTorque: this.wheelHeld,
      wheelTorqueNet: this.wheelNet,
    };
  }

  /** Copy the plant state x into the true-state buffers. */
  unpack(x: Float64Array): void {
    const q = this.qTrue,
      w = this.wTrue,
      h = this.hTrue;
    q[0] = x[0]!;
    q[1] = x[1]!;
    q[2] = x[2]!;
    q[3] = x[3]!;
    w[0] = x[4]!;
    w[1] = x[5]!;
    w[2] = x[6]!;
    for (let i = 0; i < this.N; i++) h[i] = x[7 + i]!;
  }

  /** True when the measured state equals the true state bit for bit (−0 and +0 differ; NaN: false). */
  measuredIsTrue(): boolean {
    // IEEE 754-2019 §6.3: x + (±0) = x for every x ≠ 0 (±∞ too), and +0 + (±0) = +0 in
    // round-to-nearest; so with sensors that add nothing only a −0 or NaN rate, or a NaN in the
    // copied q or h (NaN never equals itself, as sameBits says), can make the two differ.
    if (this.sensorsAddNothing) {
      const q = this.qTrue,
        w = this.wTrue,
        h = this.hTrue;
      if (!(q[0] === q[0] && q[1] === q[1] && q[2] === q[2] && q[3] === q[3])) return false;
      for (let i = 0; i < 3; i++) {
        const v = w[i]!;
        if (!(v > 0 || v < 0 || (v === 0 && 1 / v > 0))) return false;
      }
      for (let i = 0; i < this.N; i++) if (h[i] !== h[i]) return false;
      return true;
    }
    const qm = this.qMeas,
      qt = this.qTrue,
      wm = this.wMeas,
      wt = this.wTrue;
    for (let i = 0; i < 4; i++) if (!sameBits(qm[i]!, qt[i]!)) return false;
    for (let i = 0; i < 3; i++) if (!sameBits(wm[i]!, wt[i]!)) return false;
    for (let i = 0; i < this.N; i++) if (!sameBits(this.hMeas[i]!, this.hTrue[i]!)) return false;
    return true;
  }

  /** Load segment s's pointed axis from the reference (zeros for a full-attitude segment). */
  loadAxis(s: number): void {
    const a = this.ref.pointingAxes;
    const o = 3 * s;
    const has = a !== undefined && o >= 0 && o + 2 < a.length;
    this.axis[0] = has ? a[o]! : 0;
    this.axis[1] = has ? a[o + 1]! : 0;
    this.axis[2] = has ? a[o + 2]! : 0;
  }

  /** One logic update (with its event record) for `inp`; true when the logic jumped. */
  logicStep(t: number, inp: ControlInput): boolean {
    const ctrl = this.ctrl;
    // Outside the jump set the jump map cannot apply (control/types.ts contract): skip the call.
    if (!(ctrl.jumpGuard(inp, this.logic) >= 0)) return false;
    const r = ctrl.updateLogic(inp, this.logic);
    if (r.why === null || r.logic === this.logic) return false;
    ctrl.diagnostics(this.diag, this.trueInput, this.logic);
    const wBefore = this.diag.lyapunov;
    ctrl.diagnostics(this.diag, this.trueInput, r.logic);
    this.logicJumps++;
    this.jumps.push({
      t,
      j: this.logicJumps,
      what: 'logic',
      from: this.logic,
      to: r.logic,
      why: r.why,
      lyapunovBefore: wBefore,
      lyapunovAfter: this.diag.lyapunov,
    });
    this.logic = r.logic;
    return true;
  }

  /** Logic updates at one instant until the logic settles (at most maxPerInstant); true when any jumped. */
  logicSteps(t: number, inp: ControlInput): boolean {
    let jumped = false;
    for (let k = 0; k < this.maxPerInstant && this.logicStep(t, inp); k++) jumped = true;
    return jumped;
  }

  /**
   * Body torque request → wheel torques within limits (direction preserved), predicted over
   * dtPredict. With friction feedforward (cfg.frictionFeedforward = f > 0) the motor is asked for
   * the allocated torque plus f × the bearing friction the drive estimates from the wheel speeds
   * it sees (`omega`, `h`: measured when sampled, true in the ideal loop), so that the rotor's net
   * torque approaches the allocation; the limits then apply to that motor command.
   */
  actuate(dtPredict: number, omega: Float64Array, h: Float64Array): void {
    const cfg = this.cfg;
    if (cfg.allocation === 'min-max' && this.N > 3) allocateMinMax(this.wheelCmd, cfg.wheels, this.tauCmd);
    else allocateMinNorm(this.wheelCmd, cfg.wheels, this.tauCmd);
    let motor: Float64Array = this.wheelCmd;
    const ff = cfg.frictionFeedforward ?? 0;
    if (ff > 0 && cfg.plant.friction.active) {
      wheelFrictionTorqueAt(this.friction, omega, h, cfg.plant);
      motor = this.motorReq;
      for (let i = 0; i < this.N; i++) motor[i] = this.wheelCmd[i]! + ff * this.friction[i]!;
    }
    limitWheelTorque(this.wheelHeld, cfg.wheels, motor, this.hTrue, dtPredict, this.limitInfo);
  }

  /** Net rotor torque at the recorded instant: the delivered (period-average) motor torque minus friction. */
  private netWheelTorque(): void {
    if (!this.cfg.plant.friction.active) {
      // No friction: held − (+0) is held itself, bit for bit (−0 too).
      for (let i = 0; i < this.N; i++) this.wheelNet[i] = this.wheelHeld[i]!;
      return;
    }
    wheelFrictionTorqueAt(this.friction, this.wTrue, this.hTrue, this.cfg.plant);
    for (let i = 0; i < this.N; i++) this.wheelNet[i] = this.wheelHeld[i]! - this.friction[i]!;
  }

  /**
   * Append the current (true) state as a trace sample at t, and ask the stop rule and the caller
   * whether to stop. A sample holding a non-finite value (the controller's torque request, the
   * wheel commands, the state, a diagnostic) is not appended: it sets `fault`, which ends the run.
   */
  record(t: number): void {
    if (this.fault !== null) return;
    const diag = this.diag;
    // Diagnostics of the TRUE state: diag.errorAngle is the angle of q_ref* ⊗ q (control/types.ts).
    const ctrl = this.ctrl;
    if (this.torqueSawTrueState && ctrl.diagnosticsOfLastTorque) ctrl.diagnosticsOfLastTorque(diag, this.logic);
    else ctrl.diagnostics(diag, this.trueInput, this.logic);
    this.torqueSawTrueState = false;
    bodyTorqueFromWheelTorque(this.tauBody, this.cfg.wheels, this.wheelHeld);
    this.netWheelTorque();
    const rec = this.rec;
    const x = rec.scalars;
    rec.j = this.logicJumps;
    rec.segment = this.segment < 0 ? 0 : this.segment;
    x[PACKED_T] = t;
    x[PACKED_LOGIC] = this.logic;
    x[PACKED_ERROR_ANGLE] = diag.errorAngle;
    x[PACKED_POTENTIAL] = diag.potential;
    x[PACKED_POTENTIAL_MIN] = diag.potentialMin;
    x[PACKED_GAP] = diag.gap;
    x[PACKED_LYAPUNOV] = diag.lyapunov;
    if (!(this.sink ? this.sink.push(rec) : this.builder.pushPackedIfFinite(rec))) {
      const bad = firstNonFinite(rec) ?? 'a value became non-finite';
      this.fault = `${bad} at t = ${fmtS(t)} s; the run stops there and its trace ends at the last finite sample`;
      this.stopRequested = true;
      return;
    }
    const rule = this.stopRule;
    if (rule) {
      const w = this.wTrue,
        wr = this.wRef;
      const ex = w[0]! - wr[0]!,
        ey = w[1]! - wr[1]!,
        ez = w[2]! - wr[2]!;
      if (rule.update(t, diag.errorAngle, Math.sqrt(ex * ex + ey * ey + ez * ez))) this.stopRequested = true;
    }
    if (this.cfg.shouldStop?.()) this.stopRequested = true;
  }
}

/** a and b are the same double (NaN never is: the caller then takes the general path). */
function sameBits(a: number, b: number): boolean {
  return a === b && (a !== 0 || 1 / a === 1 / b);
}

/** Renormalise the quaternion block of x after a step (true when it changed). */
export function projectQuaternion(x: Float64Array): boolean {
  const n2 = x[0]! * x[0]! + x[1]! * x[1]! + x[2]! * x[2]! + x[3]! * x[3]!;
  if (!(n2 > 0) || Math.abs(n2 - 1) < 2e-15) return false;
  const inv = 1 / Math.sqrt(n2);
  x[0]! *= inv;
  x[1]! *= inv;
  x[2]! *= inv;
  x[3]! *= inv;
  return true;
}

/** Seconds for messages (12 significant digits). */
export function fmtS(v: number): string {
  return Number.isFinite(v) ? String(Number(v.toPrecision(12))) : String(v);
}
