/**
 * The ideal continuous closed loop: no sampling, the torque is a function of the true state inside
 * the flow map, and logic switches are located on the jump-set boundary by the general hybrid
 * simulator's root finder (hybrid/simulate.ts) — the setting of the stability theorems, kept as a
 * check of the theory against the sampled loop.
 *
 * Output instants (k·Ts) and the reference's segment switches are scheduled jumps of the
 * simulator; per-segment latching (`beginSegment`) happens only at a switch, from the true state,
 * so an RK4 stage never latches from an intermediate stage state.
 */
import { gyrostatDerivative } from '../body/gyrostat';
import { simulateHybrid } from '../hybrid/simulate';
import type { HybridSystem } from '../hybrid/types';
import type { ControlInput } from '../control/types';
import type { LoopEnd } from './closedLoop';
import { type LoopCore, projectQuaternion } from './loop';

/** Slots of the per-run scalar state (doubles that change in the flow; a typed array is not boxed). */
const SWITCH_T = 0;
const SWITCH_LEFT = 1;

export function runIdeal(core: LoopCore, x0: Float64Array): LoopEnd {
  const cfg = core.cfg;
  const Ts = core.Ts;
  const stepsPer = Math.max(1, Math.round(cfg.rk4StepsPerSample));
  // The momentum limit inside the flow looks one RK4 step ahead: near a limit the admissible
  // torque is (h_max − h)/dt, a state feedback under which RK4 approaches h_max without crossing.
  const dtStep = Ts / stepsPer;
  const ref = core.ref;
  const ctrl = core.ctrl;
  const zero3 = new Float64Array(3);
  const sc = new Float64Array(2);
  const switches = ref.switchTimes ?? null;
  let switchIdx = 0;
  let sampleIndex = 0;

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

  /** Reference inside a flow: no latching, old segment until the switch jump. */
  const flowReference = (t: number) => {
    ref.at(t < sc[SWITCH_T]! ? t : sc[SWITCH_LEFT]!, core.qRef, core.wRef, core.wdRef);
  };

  /** Reference at a jump instant; on a segment change let the law re-latch from `inp`. */
  const jumpReference = (t: number, inp: ControlInput): boolean => {
    const s = ref.at(t, core.qRef, core.wRef, core.wdRef);
    if (s === core.segment) return false;
    core.segment = s;
    core.loadAxis(s);
    ctrl.beginSegment?.(inp);
    return true;
  };

  const isDue = (t: number, due: number) => Math.abs(t - due) <= 1e-9 * Math.max(1, Math.abs(due));

  const sys: HybridSystem = {
    dim: x0.length,
    flow(t, x, dx) {
      core.unpack(x);
      flowReference(t);
      ctrl.torque(core.tauCmd, core.trueInput, core.logic);
      core.actuate(dtStep, core.wTrue, core.hTrue);
      core.wheelNow.set(core.wheelHeld);
      gyrostatDerivative(dx, x, cfg.plant, core.wheelNow, zero3);
    },
    jumpGuard(t, x) {
      core.unpack(x);
      flowReference(t);
      return ctrl.jumpGuard(core.trueInput, core.logic);
    },
    nextScheduledJump() {
      const next = sampleIndex * Ts;
      return sc[SWITCH_T]! < next ? sc[SWITCH_T]! : next;
    },
    jump(t, x) {
      // An output instant or a reference switch (scheduled) or a located logic crossing.
      core.unpack(x);
      passSwitches(t);
      const newSegment = jumpReference(t, core.trueInput);
      const atOutput = isDue(t, sampleIndex * Ts);
      const before = core.logic;
      const jumped = core.logicSteps(t, core.trueInput);
      if (atOutput || jumped || newSegment) {
        ctrl.torque(core.tauCmd, core.trueInput, core.logic);
        core.actuate(dtStep, core.wTrue, core.hTrue);
        core.record(t);
      }
      if (atOutput) sampleIndex++;
      return jumped ? { what: 'logic', from: before, to: core.logic, why: core.jumps[core.jumps.length - 1]!.why } : null;
    },
    project: projectQuaternion,
    stop: () => core.stopRequested,
  };
  const faulted = (): LoopEnd | null => (core.fault !== null ? { status: 'non-finite', message: core.fault, t: 0, x: x0 } : null);

  // Initial logic and the first output at t = 0.
  core.unpack(x0);
  passSwitches(0);
  jumpReference(0, core.trueInput);
  core.logic = ctrl.initialLogic(core.trueInput);
  core.logicSteps(0, core.trueInput);
  ctrl.torque(core.tauCmd, core.trueInput, core.logic);
  core.actuate(dtStep, core.wTrue, core.hTrue);
  core.record(0);
  sampleIndex = 1;
  const atStart = faulted();
  if (atStart) return atStart;

  const res = simulateHybrid(sys, x0, {
    tEnd: cfg.tEnd,
    integrator: { kind: 'rk4', dt: dtStep },
    maxJumpsPerInstant: core.maxPerInstant + 2,
    record: 'none',
    ...(cfg.maxSteps !== undefined ? { maxSteps: cfg.maxSteps } : {}),
  });
  if (!res.ok) {
    // Options are built here from validated inputs; a refusal is a programming error worth a clear stop.
    const msg = res.errors.map((e) => `${e.path}: ${e.message}`).join('; ');
    return { status: 'non-finite', message: `simulator refused the run: ${msg}`, t: 0, x: x0 };
  }
  const o = res.value.outcome;
  // A non-finite recorded value stopped the simulator through `stop`: say so, not "cancelled".
  if (core.fault !== null) return { status: 'non-finite', message: core.fault, t: o.t, x: res.value.finalState };
  return { status: o.status === 'blocked' ? 'non-finite' : o.status, message: o.message, t: o.t, x: res.value.finalState };
}
