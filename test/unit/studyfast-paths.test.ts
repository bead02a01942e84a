/**
 * Fast paths of the study's closed loop (issue 12, study part), each checked bit for bit against
 * the general path it replaces over many random inputs:
 *  - HeldGyrostatRk4 without bearing friction (sim/heldRk4.ts stepFrictionless, the stages in
 *    local variables) against the general rk4Step (hybrid/rk4.ts) over gyrostatDerivative
 *    (body/gyrostat.ts) with the wheel torques held and no external torque: 0–6 wheels on random
 *    axes, random inertia, torques including ±0, steps of many sizes, and states holding
 *    non-finite values (the same bits written and the same finite/non-finite answer);
 *  - the online metrics recorder (metrics/online.ts), which forms a fixed-target segment's error
 *    only where it is read (first sample, a rate below the settle threshold, the segment's last
 *    sample), against computeMetrics on the same samples as a trace (metrics/metrics.ts), on
 *    random multi-segment runs (full-attitude and pointing-only segments, rates and errors
 *    straddling the settle thresholds, runs ending fast or slow): equal by Object.is;
 *  - Rng.normals (math/prng.ts), count draws in one call, against as many normal() calls on a twin
 *    generator (the same values and the same state after, a cached spare or not), and the sensors'
 *    measure (sim/sensors.ts), which now draws through it, against the per-call form it replaced
 *    (transcribed below from commit 2bf7e55) over random states and sensor models;
 *  - packedNonFiniteSum (sim/sink.ts), the online sink's finiteness check written out for the
 *    loop's layout, against Number.isFinite on every value: random samples of 0–6 wheels and of
 *    other channel lengths, with NaN, ±∞, ±0 and extreme finite values planted anywhere.
 */
import { describe, expect, it } from 'vitest';
import { differences } from './exact-differences';
import { gyrostatDerivative, makeGyrostat, type Gyrostat } from '../../app/engine/body/gyrostat';
import { makeRk4Work, rk4Step } from '../../app/engine/hybrid/rk4';
import type { FlowFn } from '../../app/engine/hybrid/types';
import { makeRng, type Rng } from '../../app/engine/math/prng';
import { qConjMultiply, qFromRotationVector, qMultiply, qNormalize } from '../../app/engine/math/rotation';
import { measure, type SensorModel } from '../../app/engine/sim/sensors';
import { packedNonFiniteSum } from '../../app/engine/sim/sink';
import { HeldGyrostatRk4 } from '../../app/engine/sim/heldRk4';
import { computeMetrics, type MetricOptions } from '../../app/engine/metrics/metrics';
import { OnlineMetrics } from '../../app/engine/metrics/online';
import { PACKED_ERROR_ANGLE, PACKED_SCALARS, PACKED_T, TraceBuilder, type PackedSample } from '../../app/engine/sim/trace';
import { randomMassProperties } from './gyrostat-fixtures';

function randomGyrostat(rng: Rng, n: number): Gyrostat {
  for (;;) {
    const { J, axes, js } = randomMassProperties(rng, n);
    const r = makeGyrostat(J, { n, axes, rotorInertiaKgm2: js });
    if (r.ok) return r.value;
  }
}

const sameBits = (a: number, b: number) => Object.is(a, b);

describe('HeldGyrostatRk4 without friction (stages in locals)', () => {
  it('same bits and the same finite answer as rk4Step over gyrostatDerivative, 0–6 wheels, random everything', () => {
    const rng = makeRng(20261204, 4);
    let compared = 0;
    for (let trial = 0; trial < 60; trial++) {
      const n = trial % 7;
      const g = randomGyrostat(rng, n);
      expect(g.friction.active).toBe(false);
      const dim = 7 + n;
      const tau = new Float64Array(n);
      const zero3 = new Float64Array(3);
      const flow: FlowFn = (_t, x, dx) => gyrostatDerivative(dx, x, g, tau, zero3);
      const work = makeRk4Work(dim);
      const held = new HeldGyrostatRk4(g);
      const x = new Float64Array(dim),
        a = new Float64Array(dim),
        b = new Float64Array(dim);
      for (let k = 0; k < 200; k++) {
        for (let i = 0; i < 4; i++) x[i] = rng.normal();
        for (let i = 4; i < 7; i++) x[i] = (k % 3 === 0 ? 2 : 0.05) * rng.normal();
        for (let i = 7; i < dim; i++) x[i] = k % 11 === 0 ? -0 : 5e-2 * rng.normal();
        for (let i = 0; i < n; i++) tau[i] = k % 7 === 0 ? (k % 2 ? -0 : 0) : 4e-3 * rng.normal();
        if (k % 13 === 0) x[4 + (k % 3)] = -0;
        if (k % 37 === 5) x[k % dim] = k % 2 ? NaN : Infinity;
        if (k % 41 === 7) x[4] = 1e160; // overflows within the step
        const h = k % 5 === 0 ? 0.2 : (0.1 / (1 + (k % 4))) * (0.5 + rng.next());
        rk4Step(a, flow, 0, x, h, work);
        let finite = true;
        for (let i = 0; i < dim; i++) if (!Number.isFinite(a[i]!)) finite = false;
        held.hold(tau);
        expect(held.step(b, x, h)).toBe(finite);
        for (let i = 0; i < dim; i++) if (!sameBits(a[i]!, b[i]!)) expect([trial, k, i, b[i]]).toEqual([trial, k, i, a[i]]);
        compared++;
      }
    }
    expect(compared).toBe(12_000);
  });
});

function unitQuat(rng: Rng, out: Float64Array, o = 0): void {
  const a = rng.normal(),
    b = rng.normal(),
    c = rng.normal(),
    d = rng.normal();
  const r = Math.hypot(a, b, c, d);
  out[o] = a / r;
  out[o + 1] = b / r;
  out[o + 2] = c / r;
  out[o + 3] = d / r;
}

describe('online metrics: a fixed-target error formed only where read', () => {
  it('equal to computeMetrics on the same samples, random multi-segment runs', () => {
    const rng = makeRng(20261204, 5);
    const N = 3;
    let runs = 0;
    for (let trial = 0; trial < 120; trial++) {
      const nSeg = 1 + (trial % 3);
      const targets = new Float64Array(4 * nSeg);
      const axes = new Float64Array(3 * nSeg);
      for (let g = 0; g < nSeg; g++) {
        unitQuat(rng, targets, 4 * g);
        // every other trial: some pointing-only segments (a unit body axis), else zeros
        if (trial % 2 === 1 && (g + trial) % 2 === 0) {
          const x = rng.normal(),
            y = rng.normal(),
            z = rng.normal(),
            r = Math.hypot(x, y, z);
          axes[3 * g] = x / r;
          axes[3 * g + 1] = y / r;
          axes[3 * g + 2] = z / r;
        }
      }
      const o: MetricOptions = {
        settleAngleRad: 0.3,
        settleRateRadPerS: 0.05,
        chatterWindowS: 10,
        maxTorqueNm: [0.004, 0.004, 0.004],
        maxMomentumNms: [0.03, 0.03, 0.03],
        segmentTargets: targets,
        plannedSwitchTimes: [],
        ...(trial % 2 === 1 ? { segmentAxes: axes } : {}),
      };
      const online = new OnlineMetrics(N, o);
      const builder = new TraceBuilder(N, 16);
      const n = 5 + (trial % 40);
      const s: PackedSample = {
        j: 0,
        segment: 0,
        scalars: new Float64Array(PACKED_SCALARS),
        q: new Float64Array(4),
        omega: new Float64Array(3),
        hWheel: new Float64Array(N),
        qRef: new Float64Array(4),
        omegaRef: new Float64Array(3),
        torqueCmdBody: new Float64Array(3),
        torqueBody: new Float64Array(3),
        wheelTorqueCmd: new Float64Array(N),
        wheelTorque: new Float64Array(N),
        wheelTorqueNet: new Float64Array(N),
      };
      const q = new Float64Array(4);
      for (let k = 0; k < n; k++) {
        s.segment = Math.min(nSeg - 1, Math.floor((k * nSeg) / n));
        s.scalars[PACKED_T] = 0.1 * k;
        // near the target (inside the angle threshold) or anywhere
        if (rng.next() < 0.5) {
          const e = 0.4 * rng.next();
          const t = targets.subarray(4 * s.segment, 4 * s.segment + 4);
          q[0] = t[0]! + 0.5 * e * rng.normal();
          q[1] = t[1]! + 0.5 * e * rng.normal();
          q[2] = t[2]! + 0.5 * e * rng.normal();
          q[3] = t[3]!;
          const r = Math.hypot(q[0]!, q[1]!, q[2]!, q[3]!);
          for (let i = 0; i < 4; i++) s.q[i] = q[i]! / r;
        } else unitQuat(rng, s.q);
        s.qRef.set(targets.subarray(4 * s.segment, 4 * s.segment + 4));
        // rates around the settle threshold, the last sample fast or slow
        const scale = rng.next() < 0.5 ? 0.02 : 0.2;
        for (let i = 0; i < 3; i++) s.omega[i] = scale * rng.normal();
        s.scalars[PACKED_ERROR_ANGLE] = rng.next();
        for (let i = 0; i < 3; i++) {
          s.torqueCmdBody[i] = 0.002 * rng.normal();
          s.torqueBody[i] = 0.002 * rng.normal();
        }
        for (let i = 0; i < N; i++) {
          s.hWheel[i] = 0.03 * rng.normal();
          s.wheelTorque[i] = 0.004 * rng.normal();
        }
        expect(online.push(s)).toBe(true);
        expect(builder.pushPackedIfFinite(s)).toBe(true);
      }
      const a = online.metrics([]);
      const b = computeMetrics(builder.finish(), [], o);
      expect(differences(a, b), `trial ${trial}`).toEqual([]);
      runs++;
    }
    expect(runs).toBe(120);
  });
});

describe('Rng.normals and the sensors drawing through it', () => {
  it('normals(out, k) gives the values and the state of k normal() calls', () => {
    for (let seed = 0; seed < 40; seed++) {
      const a = makeRng(seed, seed % 3),
        b = makeRng(seed, seed % 3);
      const out = new Float64Array(8);
      for (let round = 0; round < 200; round++) {
        const k = (round * 7 + seed) % 6; // 0–5: odd counts leave a spare cached
        a.normals(out, k);
        for (let i = 0; i < k; i++) expect(Object.is(out[i], b.normal())).toBe(true);
        if (round % 5 === 0) expect(a.next()).toBe(b.next());
      }
      expect(a.normal()).toBe(b.normal());
    }
  });

  /** sensors.ts measure as of commit 2bf7e55 (a normal() call per value), without the pointing-only stall. */
  function measureBefore(
    qOut: Float64Array,
    omegaOut: Float64Array,
    model: SensorModel,
    rng: Rng,
    qTrue: Float64Array,
    omegaTrue: Float64Array,
    qRef: Float64Array,
  ): void {
    const dtheta = new Float64Array(3),
      dq = new Float64Array(4),
      qe = new Float64Array(4);
    const sa = model.attitudeSigmaRad;
    if (sa > 0) {
      dtheta[0] = sa * rng.normal();
      dtheta[1] = sa * rng.normal();
      dtheta[2] = sa * rng.normal();
      qFromRotationVector(dq, dtheta);
      qMultiply(qOut, qTrue, dq);
    } else qOut.set(qTrue);
    const ebar = model.adversarialEta;
    if (ebar > 0) {
      qConjMultiply(qe, qRef, qOut);
      if (Math.abs(qe[3]!) < ebar) {
        qe[3] = -qe[3]!;
        qMultiply(qOut, qRef, qe);
        qNormalize(qOut, qOut);
      }
    }
    const sw = model.rateSigmaRadPerS;
    const b = model.rateBiasRadPerS;
    for (let i = 0; i < 3; i++) omegaOut[i] = omegaTrue[i]! + b[i]! + (sw > 0 ? sw * rng.normal() : 0);
  }

  it('measure: the same measured state and the same draws as the per-call form', () => {
    const pick = makeRng(99, 1);
    const qa = new Float64Array(4),
      qb = new Float64Array(4),
      wa = new Float64Array(3),
      wb = new Float64Array(3),
      qT = new Float64Array(4),
      wT = new Float64Array(3),
      qR = new Float64Array(4);
    for (let trial = 0; trial < 40; trial++) {
      const model: SensorModel = {
        attitudeSigmaRad: trial % 4 === 0 ? 0 : 4e-5 * (1 + pick.next()),
        rateSigmaRadPerS: trial % 3 === 0 ? 0 : 9e-5 * (1 + pick.next()),
        rateBiasRadPerS: [1e-5 * pick.normal(), trial % 2 ? -0 : 1e-5 * pick.normal(), 0],
        adversarialEta: trial % 5 === 0 ? 0 : 0.04,
      };
      const a = makeRng(trial, 7),
        b = makeRng(trial, 7);
      for (let k = 0; k < 300; k++) {
        unitQuat(pick, qT);
        unitQuat(pick, qR);
        for (let i = 0; i < 3; i++) wT[i] = k % 17 === 0 ? -0 : 0.05 * pick.normal();
        measure(qa, wa, model, a, qT, wT, qR);
        measureBefore(qb, wb, model, b, qT, wT, qR);
        for (let i = 0; i < 4; i++) expect(Object.is(qa[i], qb[i])).toBe(true);
        for (let i = 0; i < 3; i++) expect(Object.is(wa[i], wb[i])).toBe(true);
      }
      expect(a.next()).toBe(b.next());
    }
  });
});

describe('packedNonFiniteSum', () => {
  it('is 0 exactly when every value is finite, NaN otherwise, for any layout', () => {
    const rng = makeRng(5, 11);
    const specials = [NaN, Infinity, -Infinity];
    const finiteOdd = [0, -0, Number.MAX_VALUE, -Number.MAX_VALUE, Number.MIN_VALUE, 1e308];
    let nonFinite = 0;
    for (let k = 0; k < 20_000; k++) {
      const N = k % 7;
      const odd = k % 10 === 9; // channel lengths other than the loop's
      const f = (len: number) =>
        Float64Array.from({ length: len }, () => (rng.next() < 0.05 ? finiteOdd[k % finiteOdd.length]! : rng.normal()));
      const s: PackedSample = {
        j: 0,
        segment: 0,
        scalars: f(odd ? 5 + (k % 4) : PACKED_SCALARS),
        q: f(4),
        omega: f(3),
        hWheel: f(N),
        qRef: f(4),
        omegaRef: f(odd ? 2 : 3),
        torqueCmdBody: f(3),
        torqueBody: f(3),
        wheelTorqueCmd: f(odd ? N + 1 : N),
        wheelTorque: f(N),
        wheelTorqueNet: f(N),
      };
      const channels = [
        s.scalars,
        s.q,
        s.qRef,
        s.omega,
        s.omegaRef,
        s.torqueCmdBody,
        s.torqueBody,
        s.hWheel,
        s.wheelTorqueCmd,
        s.wheelTorque,
        s.wheelTorqueNet,
      ];
      if (k % 2 === 1) {
        const c = channels[k % channels.length]!;
        if (c.length > 0) c[Math.floor(rng.next() * c.length)] = specials[k % 3]!;
      }
      const finite = channels.every((c) => Array.from(c).every((v) => Number.isFinite(v)));
      if (!finite) nonFinite++;
      const z = packedNonFiniteSum(s);
      if (finite) expect(z === 0).toBe(true);
      else expect(Number.isNaN(z)).toBe(true);
    }
    expect(nonFinite).toBeGreaterThan(8_000);
  });
});
