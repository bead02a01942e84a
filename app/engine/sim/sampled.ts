/**
 * The sampled-data closed loop (zero-order hold): a fixed-step loop of its own, without the
 * general hybrid simulator's event machinery. It is the same hybrid system as methods §7
 * describes — a timer makes every controller update a scheduled jump — solved directly: at each
 * sample instant k·Ts the sensors are read, the logic may switch, the torque is computed,
 * allocated, limited and handed to the wheel actuation model (actuation.ts); between instants the
 * plant flows with RK4 in equal steps that land exactly on the next instant (or a PWM pulse end).
 *
 * Step policy (as hybrid/rk4.ts): between two stops the loop takes m = ⌈span/dt⌉ equal steps,
 * dt = Ts / rk4StepsPerSample, and renormalises the quaternion after each step. A run that reaches
 * a non-finite state, or records a non-finite value (a torque request, a wheel command, a
 * diagnostic: loop.ts record), stops at the last finite one and says where; a run that would pass
 * its step cap (cfg.maxSteps) stops there as 'max-steps'.
 */
import { equalStepCount } from '../hybrid/rk4';
import { makeActuator } from './actuation';
import { HeldGyrostatRk4 } from './heldRk4';
import type { LoopEnd } from './closedLoop';
import { fmtS, type LoopCore, projectQuaternion } from './loop';
import { measure, measureFromTape } from './sensors';

const DUE_TOLERANCE = 1e-9;
/** Step cap when the caller sets none (the same default as the general hybrid simulator). */
const DEFAULT_MAX_STEPS = 1e7;

export function runSampled(core: LoopCore, x0: Float64Array): LoopEnd {
  const cfg = core.cfg;
  const Ts = core.Ts;
  const actuator = makeActuator(cfg.actuation, cfg.wheels, Ts);
  // Between two stops the wheel torques are held: RK4 written for the gyrostat (heldRk4.ts).
  const stepper = new HeldGyrostatRk4(cfg.plant);
  let sampleIndex = 0;
  // Sample k's noise from the tape (its k-th entry) when the run has one: same values as drawn.
  const tape = core.noiseTape;

  /** One controller sample at t: measure, switch, compute, allocate, hold. */
  const sample = (t: number, x: Float64Array) => {
    core.unpack(x);
    const s = core.ref.at(t, core.qRef, core.wRef, core.wdRef);
    core.loadAxis(s);
    if (tape) measureFromTape(core.qMeas, core.wMeas, cfg.sensors, tape, sampleIndex, core.qTrue, core.wTrue, core.qRef, core.axis);
    else measure(core.qMeas, core.wMeas, cfg.sensors, core.rng, core.qTrue, core.wTrue, core.qRef, core.axis);
    for (let i = 0; i < core.N; i++) core.hMeas[i] = core.hTrue[i]!;
    if (s !== core.segment) {
      core.segment = s;
      core.ctrl.beginSegment?.(core.input);
    }
    // The measured input stays as it is until the torque: the law may form its tracking error once.
    core.ctrl.prepareSample?.(core.input);
    if (Number.isNaN(core.logic)) core.logic = core.ctrl.initialLogic(core.input);
    core.logicSteps(t, core.input);
    core.ctrl.torque(core.tauCmd, core.input, core.logic);
    core.torqueSawTrueState = core.measuredIsTrue();
    core.actuate(Ts, core.wMeas, core.hMeas);
    actuator.start(t, core.wheelHeld, core.wheelNow);
    core.record(t);
    sampleIndex++;
  };

  const nextStop = (t: number) => Math.min(sampleIndex * Ts, actuator.nextEdge(t));

  let x = Float64Array.from(x0);
  let xNew = new Float64Array(x.length);
  const dt = Ts / Math.max(1, Math.round(cfg.rk4StepsPerSample));
  const tEnd = cfg.tEnd;
  const maxSteps = cfg.maxSteps ?? DEFAULT_MAX_STEPS;
  let steps = 0;
  let t = 0;
  // t is passed, not captured: a captured `let` double lives boxed in the closure's context, a new
  // heap number at every step.
  const stopped = (t: number): LoopEnd =>
    core.fault !== null
      ? { status: 'non-finite', message: core.fault, t, x }
      : { status: 'cancelled', message: `the run was asked to stop at t = ${fmtS(t)} s`, t, x };
  sample(0, x);
  let tSched = nextStop(t);
  if (core.stopRequested) return stopped(t);
  for (;;) {
    // 1. What is due at this instant: a sample, or a pulse end.
    while (t < tEnd && tSched <= t) {
      const due = sampleIndex * Ts;
      if (Math.abs(t - due) <= DUE_TOLERANCE * Math.max(1, Math.abs(due))) sample(due, x);
      else actuator.edge(t, core.wheelNow);
      tSched = nextStop(t);
      if (core.stopRequested) return stopped(t);
    }
    if (t >= tEnd) return { status: 'completed', message: `reached the end time ${fmtS(tEnd)} s`, t, x };
    // 2. Flow to the next stop in equal RK4 steps.
    const tStop = Math.min(tSched, tEnd);
    const t0 = t;
    const span = tStop - t0;
    const m = equalStepCount(span, dt);
    const h = span / m;
    if (steps + m > maxSteps)
      return {
        status: 'max-steps',
        message: `the run used its ${maxSteps} RK4 steps by t = ${fmtS(t)} s of ${fmtS(tEnd)} s; the trace ends there`,
        t,
        x,
      };
    steps += m;
    stepper.hold(core.wheelNow);
    for (let i = 0; i < m; i++) {
      const ti = t0 + i * h;
      if (!stepper.step(xNew, x, h))
        return {
          status: 'non-finite',
          message: `the state became non-finite in the RK4 step from t = ${fmtS(ti)} s; the run ends at the last finite state`,
          t: ti,
          x,
        };
      const swap = x;
      x = xNew;
      xNew = swap;
      t = i === m - 1 ? tStop : t0 + (i + 1) * h;
      projectQuaternion(x);
    }
    if (core.stopRequested) return stopped(t);
  }
}
