/**
 * The closed loop: gyrostat plant + sensors + sampled (or ideal continuous) controller + wheel
 * allocation and limits, as ONE hybrid system run by the general simulator (hybrid/).
 *
 * Hybrid state: the plant state x = [q(4), ω(3), h(N)] flows; the controller's logic value, the
 * held wheel torques and the sample clock are the discrete part. Sampled-data control is modelled
 * the way methods §7 describes: a timer makes every controller update a (scheduled) jump, at
 * which the sensors are read, the logic may switch, the torque is computed, allocated, limited and
 * held (zero-order hold) until the next sample. In the ideal continuous mode the torque is a
 * function of the true state inside the flow map and logic switches are located on the jump-set
 * boundary by the simulator's root finder; that is the setting of the stability theorems.
 *
 * The run's jump counter j counts LOGIC jumps only (sample instants are scheduled timer jumps of
 * the simulator, not shown as j).
 *
 * Per-segment latching (`beginSegment`, e.g. the eigenaxis law's limits) happens only at jumps:
 * at the first sample of a new segment in sampled mode, from the MEASURED state the controller
 * sees; in the ideal mode at the reference's switch time (a scheduled jump when the reference
 * lists its `switchTimes`), from the true state. Flow-map evaluations never latch, so an RK4 stage
 * cannot latch from an intermediate stage state.
 *
 * Nothing here allocates per sample or per flow evaluation (scratch per run; doubles that change
 * per sample live in a Float64Array rather than in closure variables, which V8 would box).
 */
import type { AttitudeController, ControlDiagnostics, ControlInput } from '../control/types';
import type { Gyrostat } from '../body/gyrostat';
import { gyrostatDerivative } from '../body/gyrostat';
import type { WheelArray } from '../wheels/array';
import { allocateMinMax, allocateMinNorm } from '../wheels/allocation';
import { createLimitInfo, limitWheelTorque } from '../wheels/limits';
import { bodyTorqueFromWheelTorque } from '../wheels/array';
import { simulateHybrid } from '../hybrid/simulate';
import type { HybridSystem } from '../hybrid/types';
import { qNormalize } from '../math/rotation';
import { makeRng } from '../math/prng';
import type { SensorModel } from './sensors';
import { measure } from './sensors';
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
import type { Actuation, JumpEvent, RunOutcome, RunTrace } from './types';

export type { Actuation } from './types';

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
  /** Stop early once settled for this long (s); 0 = run to tEnd. Used by studies. */
  stopWhenSettledForS?: number;
  settleAngleRad?: number;
  settleRateRadPerS?: number;
  /** Cap on logic jumps at one instant before the run is declared Zeno-like. */
  maxJumpsPerInstant?: number;
  /** Cancellation hook polled at samples. */
  shouldStop?: () => boolean;
}

export interface ClosedLoopResult {
  trace: RunTrace;
  jumps: JumpEvent[];
  outcome: RunOutcome;
}

/** Slots of the per-run scalar state array (see the header on boxing). */
const SETTLED_SINCE = 0;
const SWITCH_T = 1;
const SWITCH_LEFT = 2;

export function runClosedLoop(cfg: ClosedLoopConfig): ClosedLoopResult {
  const N = cfg.wheels.n;
  const dim = 7 + N;
  const Ts = 1 / cfg.controlRateHz;
  const sampled = cfg.timing === 'sampled';
  const ctrl = cfg.controller;
  const ref = cfg.reference;
  const rng = makeRng(cfg.seed, cfg.stream ?? 0);
  // Runs that may stop early (studies) start small and grow by doubling, instead of reserving the
  // whole duration for every case.
  const fullCapacity = Math.ceil(cfg.tEnd / Ts) + 8;
  const builder = new TraceBuilder(N, cfg.stopWhenSettledForS ? Math.min(fullCapacity, 1024) : fullCapacity);
  const jumps: JumpEvent[] = [];

  // Scratch, allocated once per run.
  const qRef = new Float64Array(4),
    wRef = new Float64Array(3),
    wdRef = new Float64Array(3);
  const qTrue = new Float64Array(4),
    wTrue = new Float64Array(3),
    hTrue = new Float64Array(N);
  const qMeas = new Float64Array(4),
    wMeas = new Float64Array(3),
    hMeas = new Float64Array(N);
  const input: ControlInput = { q: qMeas, omega: wMeas, hWheel: hMeas, qRef, omegaRef: wRef, omegaDotRef: wdRef };
  const trueInput: ControlInput = { q: qTrue, omega: wTrue, hWheel: hTrue, qRef, omegaRef: wRef, omegaDotRef: wdRef };
  const diag: ControlDiagnostics = { errorAngle: 0, eta: 0, potential: 0, potentialMin: 0, gap: 0, lyapunov: 0 };
  const tauCmd = new Float64Array(3);
  const tauBody = new Float64Array(3);
  const wheelCmd = new Float64Array(N);
  const wheelHeld = new Float64Array(N); // delivered average over the period
  const wheelNow = new Float64Array(N); // what the motors apply right now (PWM phase)
  const pulseEnd = new Float64Array(N);
  const zero3 = new Float64Array(3);
  const limitInfo = createLimitInfo();
  // One sample record, refilled at every sample (its arrays are the scratch above; numbers in `scalars`).
  const rec: PackedSample = {
    j: 0,
    segment: 0,
    scalars: new Float64Array(PACKED_SCALARS),
    q: qTrue,
    omega: wTrue,
    hWheel: hTrue,
    qRef,
    omegaRef: wRef,
    torqueCmdBody: tauCmd,
    torqueBody: tauBody,
    wheelTorqueCmd: wheelCmd,
    wheelTorque: wheelHeld,
  };
  const recScalars = rec.scalars;
  const sc = new Float64Array(3);
  sc[SETTLED_SINCE] = -1;

  let logic = NaN;
  let logicJumps = 0;
  let segment = -1;
  let sampleIndex = 0;
  let stopRequested = false;
  const maxPerInstant = cfg.maxJumpsPerInstant ?? 20;
  const pwm = cfg.actuation.mode === 'pwm';
  const quantum = cfg.actuation.mode === 'quantized' ? cfg.actuation.quantumNm : 0;
  const settleFor = cfg.stopWhenSettledForS ?? 0;
  const settleAngle = cfg.settleAngleRad ?? 0;
  const settleRate = cfg.settleRateRadPerS ?? 0;
  const switches = !sampled && ref.switchTimes ? ref.switchTimes : null;
  let switchIdx = 0;

  const unpack = (x: Float64Array) => {
    qTrue[0] = x[0]!;
    qTrue[1] = x[1]!;
    qTrue[2] = x[2]!;
    qTrue[3] = x[3]!;
    wTrue[0] = x[4]!;
    wTrue[1] = x[5]!;
    wTrue[2] = x[6]!;
    for (let i = 0; i < N; i++) hTrue[i] = x[7 + i]!;
  };

  /** Step past every reference switch at or before t (a jump at t has reached them). */
  const passSwitches = (t: number) => {
    if (!switches) {
      sc[SWITCH_T] = sc[SWITCH_LEFT] = Infinity;
      return;
    }
    const tol = 1e-12 * Math.max(1, Math.abs(t));
    while (switchIdx < switches.length && switches[switchIdx]! <= t + tol) switchIdx++;
    const ts = switchIdx < switches.length ? switches[switchIdx]! : Infinity;
    sc[SWITCH_T] = ts;
    // Flow evaluations at or after a switch not yet reached by a jump (the last RK4 stage lands
    // on it) read the reference just before it: the old segment, continued from the left.
    sc[SWITCH_LEFT] = ts - 1e-9 * Math.max(1, Math.abs(ts));
  };

  /** Reference inside a flow (ideal mode): no latching, old segment until the switch jump. */
  const flowReference = (t: number) => {
    ref.at(t < sc[SWITCH_T]! ? t : sc[SWITCH_LEFT]!, qRef, wRef, wdRef);
  };

  /** Reference at a jump instant; on a segment change let the law re-latch from `inp`. */
  const jumpReference = (t: number, inp: ControlInput): boolean => {
    const s = ref.at(t, qRef, wRef, wdRef);
    if (s === segment) return false;
    segment = s;
    ctrl.beginSegment?.(inp);
    return true;
  };

  /** Logic update (with its event record) for the given input; returns true when it jumped. */
  const logicStep = (t: number, inp: ControlInput): boolean => {
    // Outside the jump set the jump map cannot apply (types.ts contract): skip the call.
    if (!(ctrl.jumpGuard(inp, logic) >= 0)) return false;
    const r = ctrl.updateLogic(inp, logic);
    if (r.why === null || r.logic === logic) return false;
    ctrl.diagnostics(diag, trueInput, logic);
    const wBefore = diag.lyapunov;
    ctrl.diagnostics(diag, trueInput, r.logic);
    logicJumps++;
    jumps.push({
      t,
      j: logicJumps,
      what: 'logic',
      from: logic,
      to: r.logic,
      why: r.why,
      lyapunovBefore: wBefore,
      lyapunovAfter: diag.lyapunov,
    });
    logic = r.logic;
    return true;
  };

  /** Body torque request → wheel torques within limits (direction preserved) for the period dt. */
  const actuate = (dtPredict: number) => {
    if (cfg.allocation === 'min-max' && N > 3) allocateMinMax(wheelCmd, cfg.wheels, tauCmd);
    else allocateMinNorm(wheelCmd, cfg.wheels, tauCmd);
    limitWheelTorque(wheelHeld, cfg.wheels, wheelCmd, hTrue, dtPredict, limitInfo);
  };

  const record = (t: number) => {
    // diagnostics of the TRUE state: diag.errorAngle is the angle of q_ref* ⊗ q (types.ts)
    ctrl.diagnostics(diag, trueInput, logic);
    bodyTorqueFromWheelTorque(tauBody, cfg.wheels, wheelHeld);
    const err = diag.errorAngle;
    rec.j = logicJumps;
    rec.segment = segment < 0 ? 0 : segment;
    recScalars[PACKED_T] = t;
    recScalars[PACKED_LOGIC] = logic;
    recScalars[PACKED_ERROR_ANGLE] = err;
    recScalars[PACKED_POTENTIAL] = diag.potential;
    recScalars[PACKED_POTENTIAL_MIN] = diag.potentialMin;
    recScalars[PACKED_GAP] = diag.gap;
    recScalars[PACKED_LYAPUNOV] = diag.lyapunov;
    builder.pushPacked(rec);
    if (settleFor > 0) {
      const ex = wTrue[0]! - wRef[0]!,
        ey = wTrue[1]! - wRef[1]!,
        ez = wTrue[2]! - wRef[2]!;
      const ok = err < settleAngle && Math.sqrt(ex * ex + ey * ey + ez * ez) < settleRate;
      if (!ok) sc[SETTLED_SINCE] = -1;
      else if (sc[SETTLED_SINCE]! < 0) sc[SETTLED_SINCE] = t;
      else if (t - sc[SETTLED_SINCE]! >= settleFor) stopRequested = true;
    }
    if (cfg.shouldStop?.()) stopRequested = true;
  };

  const applyActuationMode = (t: number) => {
    if (quantum > 0) {
      for (let i = 0; i < N; i++) {
        const max = cfg.wheels.maxTorqueNm[i]!;
        let v = Math.round(wheelHeld[i]! / quantum) * quantum;
        if (Math.abs(v) > max) v = Math.sign(v) * Math.floor(max / quantum) * quantum;
        wheelHeld[i] = v;
      }
    }
    for (let i = 0; i < N; i++) {
      if (pwm) {
        const full = cfg.wheels.maxTorqueNm[i]!;
        const width = Math.min(1, Math.abs(wheelHeld[i]!) / full) * Ts;
        wheelNow[i] = width > 0 ? Math.sign(wheelHeld[i]!) * full : 0;
        pulseEnd[i] = t + width;
      } else {
        wheelNow[i] = wheelHeld[i]!;
        pulseEnd[i] = Infinity;
      }
    }
  };

  /** One controller sample at time t (sampled mode): measure, switch, compute, allocate, hold. */
  const sample = (t: number, x: Float64Array) => {
    unpack(x);
    const s = ref.at(t, qRef, wRef, wdRef);
    measure(qMeas, wMeas, cfg.sensors, rng, qTrue, wTrue, qRef);
    for (let i = 0; i < N; i++) hMeas[i] = hTrue[i]!;
    if (s !== segment) {
      segment = s;
      ctrl.beginSegment?.(input);
    }
    if (Number.isNaN(logic)) logic = ctrl.initialLogic(input);
    for (let k = 0; k < maxPerInstant && logicStep(t, input); k++);
    ctrl.torque(tauCmd, input, logic);
    actuate(Ts);
    applyActuationMode(t);
    record(t);
    sampleIndex++;
  };

  const isDue = (t: number, due: number) => Math.abs(t - due) <= 1e-9 * Math.max(1, Math.abs(due));

  const sys: HybridSystem = {
    dim,
    flow(t, x, dx) {
      if (!sampled) {
        unpack(x);
        flowReference(t);
        ctrl.torque(tauCmd, trueInput, logic);
        actuate(0);
        for (let i = 0; i < N; i++) wheelNow[i] = wheelHeld[i]!;
      }
      gyrostatDerivative(dx, x, cfg.plant, wheelNow, zero3);
    },
    jumpGuard: sampled
      ? undefined
      : (t, x) => {
          unpack(x);
          flowReference(t);
          return ctrl.jumpGuard(trueInput, logic);
        },
    nextScheduledJump(t) {
      let next = sampleIndex * Ts;
      if (sampled) {
        if (pwm) for (let i = 0; i < N; i++) if (pulseEnd[i]! > t + 1e-12 && pulseEnd[i]! < next) next = pulseEnd[i]!;
      } else if (sc[SWITCH_T]! < next) next = sc[SWITCH_T]!;
      return next;
    },
    jump(t, x) {
      if (sampled) {
        if (isDue(t, sampleIndex * Ts)) {
          sample(sampleIndex * Ts, x);
          return null;
        }
        // PWM pulse edge: the wheels whose pulse has ended stop.
        for (let i = 0; i < N; i++)
          if (pulseEnd[i]! <= t + 1e-12) {
            wheelNow[i] = 0;
            pulseEnd[i] = Infinity;
          }
        return null;
      }
      // Continuous-ideal: an output instant or reference switch (scheduled) or a located logic crossing.
      unpack(x);
      passSwitches(t);
      const newSegment = jumpReference(t, trueInput);
      const atOutput = isDue(t, sampleIndex * Ts);
      const before = logic;
      let jumped = false;
      for (let k = 0; k < maxPerInstant && logicStep(t, trueInput); k++) jumped = true;
      if (atOutput || jumped || newSegment) {
        ctrl.torque(tauCmd, trueInput, logic);
        actuate(0);
        record(t);
      }
      if (atOutput) sampleIndex++;
      return jumped ? { what: 'logic', from: before, to: logic, why: jumps[jumps.length - 1]!.why } : null;
    },
    project(x) {
      const n2 = x[0]! * x[0]! + x[1]! * x[1]! + x[2]! * x[2]! + x[3]! * x[3]!;
      if (!(n2 > 0) || Math.abs(n2 - 1) < 2e-15) return false;
      const inv = 1 / Math.sqrt(n2);
      x[0]! *= inv;
      x[1]! *= inv;
      x[2]! *= inv;
      x[3]! *= inv;
      return true;
    },
    stop() {
      return stopRequested;
    },
  };

  const x0 = new Float64Array(dim);
  for (let i = 0; i < 4; i++) x0[i] = cfg.q0[i]!;
  for (let i = 0; i < 3; i++) x0[4 + i] = cfg.omega0[i]!;
  for (let i = 0; i < N; i++) x0[7 + i] = cfg.hWheel0[i]!;
  qNormalize(qTrue, x0);
  x0.set(qTrue, 0);

  // Initial logic and first sample at t = 0.
  unpack(x0);
  if (!sampled) {
    passSwitches(0);
    jumpReference(0, trueInput);
    logic = ctrl.initialLogic(trueInput);
    for (let k = 0; k < maxPerInstant && logicStep(0, trueInput); k++);
    ctrl.torque(tauCmd, trueInput, logic);
    actuate(0);
    record(0);
    sampleIndex = 1;
  } else {
    sample(0, x0);
  }

  const stepsPer = Math.max(1, Math.round(cfg.rk4StepsPerSample));
  const res = simulateHybrid(sys, x0, {
    tEnd: cfg.tEnd,
    integrator: { kind: 'rk4', dt: Ts / stepsPer },
    maxJumpsPerInstant: maxPerInstant + 2,
    record: 'none',
  });
  if (!res.ok) {
    // Options are built here from validated inputs; a refusal is a programming error worth a clear stop.
    const msg = res.errors.map((e) => `${e.path}: ${e.message}`).join('; ');
    return { trace: builder.finish(), jumps, outcome: { status: 'non-finite', message: `simulator refused the run: ${msg}`, t: 0, j: 0 } };
  }
  const arc = res.value;

  // Last state: record it if the run did not end exactly on a sample, against the reference at
  // that time (not the last sample's), so the final error is the error at the end.
  const tr = builder.trace;
  const last = arc.outcome.t;
  if (tr.n === 0 || last > tr.t[tr.n - 1]! + 1e-9) {
    unpack(arc.finalState);
    segment = ref.at(last, qRef, wRef, wdRef);
    record(last);
  }
  const status = arc.outcome.status === 'blocked' ? 'non-finite' : arc.outcome.status;
  const outcome: RunOutcome = { status, message: arc.outcome.message, t: arc.outcome.t, j: logicJumps };
  if (stopRequested && status === 'cancelled' && !cfg.shouldStop?.()) {
    outcome.status = 'completed';
    outcome.message = `settled for ${cfg.stopWhenSettledForS} s; run ended early at t = ${last.toFixed(1)} s`;
  }
  return { trace: builder.finish(), jumps, outcome };
}
