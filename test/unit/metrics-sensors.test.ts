/**
 * Metrics, Lyapunov monitor and sensor models on synthetic traces whose answers follow from
 * elementary kinematics (a constant-rate rotation travels ω·T; trapezoidal integration is exact for
 * piecewise-linear rates) and from the chi distribution with 3 degrees of freedom (the angle of a
 * rotation vector with i.i.d. N(0, σ²) components has mean 2σ√(2/π); standard statistics, e.g.
 * Johnson, Kotz & Balakrishnan, Continuous Univariate Distributions, vol. 1 — from memory).
 */
import { describe, expect, it } from 'vitest';
import { TraceBuilder, decimateTrace } from '../../app/engine/sim/trace';
import { computeMetrics } from '../../app/engine/metrics/metrics';
import { lyapunovMonitor } from '../../app/engine/metrics/monitor';
import { measure, PERFECT_SENSORS } from '../../app/engine/sim/sensors';
import { qAngleBetween, qConjMultiply, qFromAxisAngle, qPropagateBodyRate } from '../../app/engine/math/rotation';
import { makeRng } from '../../app/engine/math/prng';
import type { JumpEvent } from '../../app/engine/sim/types';

/** A rest-free constant-rate rotation about Z toward a target `angle` away, with a chosen rate profile. */
function rotationTrace(
  rate: (t: number) => number,
  T: number,
  dt: number,
  target: Float64Array,
  torque: (t: number) => number = () => 0,
  segmentAt: (t: number) => number = () => 0,
) {
  const b = new TraceBuilder(2, 8);
  let q: Float64Array = new Float64Array([0, 0, 0, 1]);
  const zero3 = [0, 0, 0];
  for (let k = 0; k * dt <= T + 1e-12; k++) {
    const t = k * dt;
    const w = rate(t);
    b.push({
      t,
      j: 0,
      segment: segmentAt(t),
      q,
      omega: [0, 0, w],
      hWheel: [0.00005 * t, -0.002],
      qRef: target,
      omegaRef: zero3,
      torqueCmdBody: [torque(t), 0, 0],
      torqueBody: [torque(t), 0, 0],
      wheelTorqueCmd: [0, 0],
      wheelTorque: [0.0005, 0],
      wheelTorqueNet: [0.0005, 0],
      logic: 0,
      errorAngle: qAngleBetween(q, target),
      potential: 0,
      potentialMin: 0,
      gap: 0,
      lyapunov: 1 / (1 + t),
    });
    // exact propagation for the piecewise-constant midpoint rate
    q = qPropagateBodyRate(new Float64Array(4), q, [0, 0, rate(t + dt / 2)], dt);
  }
  return b.finish();
}

const opts = (target: Float64Array) => ({
  settleAngleRad: 0.01,
  settleRateRadPerS: 0.001,
  chatterWindowS: 10,
  maxTorqueNm: [0.001, 0.001],
  maxMomentumNms: [0.01, 0.01],
  segmentTargets: target,
});

describe('run metrics', () => {
  it('constant-rate rotation travels ω·T; a long way round is flagged as unwinding', () => {
    const target = qFromAxisAngle(new Float64Array(4), [0, 0, 1], -0.3); // 0.3 rad the short way (negative Z)
    const tr = rotationTrace(() => 0.1, 59.8, 0.1, target); // +Z at 0.1 rad/s for 59.8 s: 5.98 rad ≈ 2π − 0.3
    const m = computeMetrics(tr, [], opts(target));
    expect(m.rotationTravelledRad).toBeCloseTo(5.98, 9);
    expect(m.shortestRotationRad).toBeCloseTo(0.3, 9);
    expect(m.unwound).toBe(true);
    expect(m.finalErrorRad).toBeLessThan(1e-6 + 0.01);
  });

  it('the segments tile the run: rotation travelled over three segments is still ω·T', () => {
    // Segment k runs to the next segment's first sample, so no sample interval is left out at a
    // boundary (constant rate: the trapezoid rule is exact, ∫ω dt = ω·T).
    const target = qFromAxisAngle(new Float64Array(4), [0, 0, 1], 1);
    const targets = new Float64Array([...target, ...target, ...target]);
    const tr = rotationTrace(
      () => 0.1,
      59.8,
      0.1,
      target,
      () => 0,
      (t) => (t < 20 - 1e-9 ? 0 : t < 40 - 1e-9 ? 1 : 2),
    );
    const m = computeMetrics(tr, [], opts(targets));
    expect(m.segments.map((g) => g.segment)).toEqual([0, 1, 2]);
    expect(m.rotationTravelledRad).toBeCloseTo(5.98, 12);
    expect(m.segments[0]!.travelledRad).toBeCloseTo(2, 12); // 0 → 20 s, the next segment's first sample
    expect(m.segments[2]!.travelledRad).toBeCloseTo(1.98, 12); // 40 → 59.8 s
  });

  it('short way: no unwinding; settle time is when the error and rate stay inside the thresholds', () => {
    const target = qFromAxisAngle(new Float64Array(4), [0, 0, 1], 0.5);
    // triangle rate profile: accelerate 5 s, decelerate 5 s: 0.5 rad total at peak 0.1 rad/s
    const rate = (t: number) => (t < 5 ? 0.02 * t : t < 10 ? 0.02 * (10 - t) : 0);
    const tr = rotationTrace(rate, 20, 0.05, target);
    const m = computeMetrics(tr, [], opts(target));
    expect(m.unwound).toBe(false);
    expect(m.rotationTravelledRad).toBeCloseTo(0.5, 3);
    expect(m.settled).toBe(true);
    expect(m.settleTimeS!).toBeGreaterThan(9);
    expect(m.settleTimeS!).toBeLessThanOrEqual(10.05);
    expect(m.peakWheelMomentumFraction).toBeCloseTo(0.2, 9); // |h2| = 0.002 of 0.01
    expect(m.peakWheelTorqueFraction).toBeCloseTo(0.5, 12);
  });

  it('chatter counts reversals of the torque direction per second in the worst window (jumps are counted apart)', () => {
    const target = qFromAxisAngle(new Float64Array(4), [0, 0, 1], 0.0);
    // torque alternating sign every sample (dt 0.1) for 20 s: 10 reversals per second
    const tr = rotationTrace(
      () => 0,
      20,
      0.1,
      target,
      (t) => (Math.round(t * 10) % 2 === 0 ? 1e-4 : -1e-4),
    );
    const jumps: JumpEvent[] = [{ t: 3, j: 1, what: 'logic', from: 1, to: -1, why: 'test' }];
    const m = computeMetrics(tr, jumps, opts(target));
    expect(m.torqueReversals).toBe(200);
    expect(m.chatterPerS).toBeCloseTo(10.1, 6); // a closed 10 s window holds 101 reversals, 0.1 s apart
    expect(m.jumps).toBe(1);
    expect(m.controlEffortNms).toBeCloseTo(2e-3, 9);
  });

  it('chatter ignores torques below the floor, counts a three-axis flip once, and skips the plan’s own switches', () => {
    const target = qFromAxisAngle(new Float64Array(4), [0, 0, 1], 0.0);
    // Negligible torques (1e-300 N·m) flipping sign every sample: nothing to count.
    const tiny = rotationTrace(
      () => 0,
      20,
      0.1,
      target,
      (t) => (Math.round(t * 10) % 2 === 0 ? 1e-300 : -1e-300),
    );
    expect(computeMetrics(tiny, [], opts(target)).chatterPerS).toBe(0);
    // One reversal of a torque along (1, 1, 1): one event, not three.
    const flip = rotationTrace(
      () => 0,
      20,
      0.1,
      target,
      (t) => (t < 10 ? 1e-4 : -1e-4),
    );
    for (let k = 0; k < flip.n; k++) flip.torqueCmdBody.fill(flip.torqueCmdBody[3 * k]!, 3 * k, 3 * k + 3);
    const m1 = computeMetrics(flip, [], opts(target));
    expect(m1.torqueReversals).toBe(1);
    expect(m1.chatterPerS).toBeCloseTo(0.1, 12);
    // The same reversal at a planned switch of the reference (t = 10 s) belongs to the plan.
    const m2 = computeMetrics(flip, [], { ...opts(target), plannedSwitchTimes: [10] });
    expect(m2.torqueReversals).toBe(0);
    expect(m2.chatterPerS).toBe(0);
  });

  it('decimation keeps the last sample and every k-th', () => {
    const target = qFromAxisAngle(new Float64Array(4), [0, 0, 1], 0.1);
    const tr = rotationTrace(() => 0.01, 1, 0.1, target);
    const d = decimateTrace(tr, 3);
    expect(Array.from(d.t).map((v) => +v.toFixed(6))).toEqual([0, 0.3, 0.6, 0.9, 1]);
    expect(d.hWheel.length).toBe(2 * d.n);
  });
});

describe('Lyapunov monitor', () => {
  it('flags a flow interval where W rises and a jump that drops less than promised', () => {
    const target = qFromAxisAngle(new Float64Array(4), [0, 0, 1], 0.1);
    const tr = rotationTrace(() => 0, 10, 0.1, target);
    // W decreasing except a bump between t = 4 and 5
    for (let k = 0; k < tr.n; k++)
      tr.lyapunov[k] = 10 - tr.t[k]! + (tr.t[k]! > 4 && tr.t[k]! <= 5 ? 2 * (tr.t[k]! - 4) : tr.t[k]! > 5 ? 2 : 0);
    const jumps: JumpEvent[] = [
      { t: 7, j: 1, what: 'logic', from: 1, to: 2, why: 'gap', lyapunovBefore: 3, lyapunovAfter: 2.5 },
      { t: 8, j: 2, what: 'logic', from: 2, to: 1, why: 'gap', lyapunovBefore: 3, lyapunovAfter: 1 },
    ];
    const flags = lyapunovMonitor(tr, jumps, { jumpDecrease: 1, relTol: 1e-6, absTol: 1e-9 });
    const rise = flags.filter((f) => f.kind === 'flow-rise');
    expect(rise).toHaveLength(1);
    expect(rise[0]!.tStart).toBeCloseTo(4, 9);
    expect(rise[0]!.tEnd).toBeCloseTo(5, 9);
    expect(rise[0]!.amount).toBeCloseTo(1, 9);
    const weak = flags.filter((f) => f.kind === 'weak-jump');
    expect(weak).toHaveLength(1);
    expect(weak[0]!.tStart).toBe(7);
  });

  it('a monotone W gives no flags', () => {
    const target = qFromAxisAngle(new Float64Array(4), [0, 0, 1], 0.1);
    const tr = rotationTrace(() => 0, 10, 0.1, target);
    expect(lyapunovMonitor(tr, [], { jumpDecrease: 0, relTol: 1e-9, absTol: 0 })).toEqual([]);
  });
});

describe('sensor models', () => {
  it('attitude noise angle has the chi(3) mean 2σ√(2/π)', () => {
    const rng = makeRng(11);
    const sigma = 10 / 206264.806; // 10 arcsec
    const model = { ...PERFECT_SENSORS, attitudeSigmaRad: sigma };
    const q = qFromAxisAngle(new Float64Array(4), [0.3, 0.1, 0.9], 1.0);
    const qm = new Float64Array(4),
      wm = new Float64Array(3);
    let sum = 0;
    const N = 20000;
    for (let i = 0; i < N; i++) {
      measure(qm, wm, model, rng, q, [0, 0, 0], q);
      sum += qAngleBetween(q, qm);
    }
    const mean = sum / N;
    expect(mean / (2 * sigma * Math.sqrt(2 / Math.PI))).toBeCloseTo(1, 1);
  });

  it('rate bias is added and white noise has the requested σ', () => {
    const rng = makeRng(5);
    const model = { ...PERFECT_SENSORS, rateSigmaRadPerS: 1e-4, rateBiasRadPerS: [1e-3, 0, -2e-3] };
    const qm = new Float64Array(4),
      wm = new Float64Array(3);
    const q = new Float64Array([0, 0, 0, 1]);
    let s0 = 0,
      s2 = 0,
      sq = 0;
    const N = 20000;
    for (let i = 0; i < N; i++) {
      measure(qm, wm, model, rng, q, [0.01, 0.02, 0.03], q);
      s0 += wm[0]!;
      s2 += wm[2]!;
      sq += (wm[1]! - 0.02) ** 2;
    }
    expect(s0 / N).toBeCloseTo(0.011, 5);
    expect(s2 / N).toBeCloseTo(0.028, 5);
    expect(Math.sqrt(sq / N) / 1e-4).toBeCloseTo(1, 1);
  });

  it('worst-case bounded noise flips the sign of the measured η when |η| < ē, and only then', () => {
    const rng = makeRng(1);
    const model = { ...PERFECT_SENSORS, adversarialEta: 0.1 };
    const qRef = new Float64Array([0, 0, 0, 1]);
    const qm = new Float64Array(4),
      wm = new Float64Array(3),
      e = new Float64Array(4);
    const near = qFromAxisAngle(new Float64Array(4), [0, 1, 0], Math.PI - 0.1); // η = cos(π/2 − 0.05) ≈ 0.05
    measure(qm, wm, model, rng, near, [0, 0, 0], qRef);
    qConjMultiply(e, qRef, qm);
    expect(e[3]).toBeCloseTo(-near[3]!, 12);
    expect(qAngleBetween(near, qm)).toBeLessThan(2 * 0.1 + 1e-9); // noise size below 2ē
    const far = qFromAxisAngle(new Float64Array(4), [0, 1, 0], 2.0);
    measure(qm, wm, model, rng, far, [0, 0, 0], qRef);
    expect(Array.from(qm)).toEqual(Array.from(far));
  });
});
