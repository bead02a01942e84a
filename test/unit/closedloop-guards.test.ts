/**
 * The closed loop never lets a non-finite number into a trace and never calls a cut-short run
 * complete (issue 17, items 3 and 5): a controller whose torque request turns NaN stops the run
 * with status 'non-finite', a message naming the channel and the time, and a trace that ends at
 * the last finite sample; a run that reaches its step cap stops as 'max-steps' with the end time
 * it was asked for. The pipeline's verdict of such runs is 'failed'. Also the trace builder's
 * growth: doubling, but not past the expected sample count while below it.
 *
 * Reference for the finiteness rule: IEEE 754 (NaN and ±Infinity are the non-finite values,
 * Number.isFinite in ECMA-262 §21.1.2.2) — common practice, no further source.
 */
import { describe, expect, it } from 'vitest';
import type { AttitudeController } from '../../app/engine/control/types';
import { validateTraceForExport } from '../../app/engine/export/trace-check';
import { verdictOf } from '../../app/engine/pipeline/summarise';
import { TraceBuilder } from '../../app/engine/sim/trace';
import { fly, law, metricsOf, triadVehicle } from '../reference/closedloop-fixtures';

const v = triadVehicle([10, 15, 20]);
const q0 = [Math.sin(0.5), 0, 0, Math.cos(0.5)]; // 1 rad about x

/** A real PD law whose torque request becomes `bad` from its `from`-th call on. */
function breaksAfter(from: number, bad: number): AttitudeController {
  const pd = law({ kind: 'quaternion-pd', gains: { kp: 2, kd: 10 } }, v);
  let calls = 0;
  return {
    ...pd,
    initialLogic: (i) => pd.initialLogic(i),
    jumpGuard: (i, l) => pd.jumpGuard(i, l),
    updateLogic: (i, l) => pd.updateLogic(i, l),
    diagnostics: (o, i, l) => pd.diagnostics(o, i, l),
    torque(out, input, logic) {
      pd.torque(out, input, logic);
      if (++calls > from) out[1] = bad;
      return out;
    },
  };
}

describe('a non-finite torque request stops the run', () => {
  it('sampled: status non-finite at the sample where it happened; the trace ends before it and is finite', () => {
    // 10 Hz: calls 1..50 are the samples at t = 0 … 4.9 s; the 51st (t = 5 s) is NaN.
    const r = fly({ vehicle: v, controller: breaksAfter(50, NaN), q0, tEnd: 20 });
    expect(r.outcome.status).toBe('non-finite');
    expect(r.outcome.message).toContain("the controller's body torque request (torqueCmdBody) became NaN (component 2 of 3) at t = 5 s");
    expect(r.outcome.t).toBeCloseTo(5, 9);
    expect(r.outcome.plannedEndS).toBe(20);
    expect(r.trace.n).toBe(50);
    expect(r.trace.t[r.trace.n - 1]).toBeCloseTo(4.9, 9);
    expect(validateTraceForExport(r.trace).ok).toBe(true);
    // The pipeline's verdict: failed, never settled.
    expect(verdictOf(r.outcome, metricsOf(r, v)).kind).toBe('failed');
  });

  it('sampled: +Infinity is caught the same way, also at the very first sample (empty trace)', () => {
    const r = fly({ vehicle: v, controller: breaksAfter(0, Infinity), q0, tEnd: 5 });
    expect(r.outcome.status).toBe('non-finite');
    expect(r.outcome.message).toContain('became Infinity');
    expect(r.outcome.t).toBe(0);
    expect(r.trace.n).toBe(0);
  });

  it('continuous-ideal: the run stops as non-finite, every recorded sample finite', () => {
    const r = fly({ vehicle: v, controller: breaksAfter(400, NaN), q0, tEnd: 20, timing: 'continuous-ideal' });
    expect(r.outcome.status).toBe('non-finite');
    expect(r.outcome.t).toBeLessThan(20);
    expect(r.trace.n).toBeGreaterThan(0);
    expect(validateTraceForExport(r.trace).ok).toBe(true);
    expect(verdictOf(r.outcome, metricsOf(r, v)).kind).toBe('failed');
  });
});

describe('the step cap truncates a run and says so', () => {
  it('sampled: 100 RK4 steps at 1 step per 0.1 s sample end the run at t = 10 s of 60 s', () => {
    const r = fly({ vehicle: v, controller: law({ kind: 'quaternion-pd', gains: { kp: 2, kd: 10 } }, v), q0, tEnd: 60, maxSteps: 100 });
    expect(r.outcome.status).toBe('max-steps');
    expect(r.outcome.message).toBe('the run used its 100 RK4 steps by t = 10 s of 60 s; the trace ends there');
    expect(r.outcome.plannedEndS).toBe(60);
    expect(r.trace.t[r.trace.n - 1]).toBeCloseTo(10, 9);
    expect(verdictOf(r.outcome, metricsOf(r, v)).kind).toBe('failed');
  });

  it('continuous-ideal: the hybrid simulator stops at the cap as max-steps', () => {
    const r = fly({
      vehicle: v,
      controller: law({ kind: 'quaternion-pd', gains: { kp: 2, kd: 10 } }, v),
      q0,
      tEnd: 60,
      maxSteps: 100,
      timing: 'continuous-ideal',
    });
    expect(r.outcome.status).toBe('max-steps');
    expect(r.outcome.t).toBeLessThan(60);
  });

  it('without a cap the same run completes (the cap is what stopped it)', () => {
    const r = fly({ vehicle: v, controller: law({ kind: 'quaternion-pd', gains: { kp: 2, kd: 10 } }, v), q0, tEnd: 60 });
    expect(r.outcome.status).toBe('completed');
    expect(r.trace.n).toBe(601);
  });
});

describe('TraceBuilder growth', () => {
  const sample = (t: number) => ({
    t,
    j: 0,
    segment: 0,
    q: [0, 0, 0, 1],
    omega: [0, 0, 0],
    hWheel: [0, 0, 0],
    qRef: [0, 0, 0, 1],
    omegaRef: [0, 0, 0],
    torqueCmdBody: [0, 0, 0],
    torqueBody: [0, 0, 0],
    wheelTorqueCmd: [0, 0, 0],
    wheelTorque: [0, 0, 0],
    wheelTorqueNet: [0, 0, 0],
    logic: 0,
    errorAngle: 0,
    potential: 0,
    potentialMin: 0,
    gap: 0,
    lyapunov: 0,
  });

  it('doubles from 16 but stops at the expected count (1000), then doubles again past it', () => {
    const b = new TraceBuilder(3, 16, 1000);
    const caps: number[] = [];
    for (let k = 0; k < 1001; k++) {
      b.push(sample(k));
      if (caps.at(-1) !== b.capacity) caps.push(b.capacity);
    }
    // 16·2^k while below 1000, then exactly 1000, then 2000 (arithmetic, no source needed).
    expect(caps).toEqual([16, 32, 64, 128, 256, 512, 1000, 2000]);
    const tr = b.finish();
    expect(tr.n).toBe(1001);
    expect(tr.t[1000]).toBe(1000);
  });

  it('without an expected count it doubles as before', () => {
    const b = new TraceBuilder(3, 16);
    for (let k = 0; k < 100; k++) b.push(sample(k));
    expect(b.capacity).toBe(128);
  });
});
