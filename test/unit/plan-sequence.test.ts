/**
 * Sequences: slew-then-hold timelines, momentum carried between segments, the feasible prefix,
 * and evaluateReference / evaluatePlannedLoads over the whole timeline.
 *
 * The invariant used for carried momentum: with no external torque the total momentum is fixed
 * in inertial axes, so R(q_k) h_k is the same at every rest attitude q_k (Euler's equation for a
 * body with wheels, methods §6; checked with the npm `quaternion` package as an independent
 * rotation implementation).
 */
import { describe, expect, it } from 'vitest';
import Quaternion from 'quaternion';
import { planSegment } from '../../app/engine/plan/segment';
import { planSequence } from '../../app/engine/plan/sequence';
import { evaluatePlannedLoads, evaluateReference } from '../../app/engine/plan/reference';
import { cubeCapacity } from '../../app/engine/plan/limits';
import type { PlanLimits, SequencePlan } from '../../app/engine/plan/types';

const D = Math.PI / 180;
const axisAngle = (ax: number[], th: number) => {
  const n = Math.hypot(ax[0]!, ax[1]!, ax[2]!),
    s = Math.sin(th / 2) / n;
  return [ax[0]! * s, ax[1]! * s, ax[2]! * s, Math.cos(th / 2)];
};
// Lumen-6-like invented vehicle: inertia about diag(0.11, 0.12, 0.08) kg·m² with small products.
const J = [0.11, 0.002, -0.001, 0.002, 0.12, 0.0015, -0.001, 0.0015, 0.08];
const lim: PlanLimits = {
  torqueCapacity: cubeCapacity(0.002),
  momentumCapacity: cubeCapacity(0.006),
  torqueMargin: 0.8,
  momentumMargin: 0.8,
  slewRateLimitRadPerS: 2 * D,
};
const q0 = axisAngle([0.2, -0.5, 1], 0.4);
const targets = [
  { q: axisAngle([1, 0, 0], 60 * D), holdS: 30, label: 'image A' },
  { q: axisAngle([0.3, 1, -0.2], 100 * D), holdS: 30, label: 'image B' },
  { q: axisAngle([-1, 0.4, 0.5], 150 * D), holdS: 10 },
];
const toQ = (q: ArrayLike<number>) => new Quaternion(q[3], q[0], q[1], q[2]);
const rotate = (q: ArrayLike<number>, v: ArrayLike<number>) => toQ(q).rotateVector([v[0]!, v[1]!, v[2]!]) as number[];

function plan(h: number[]): SequencePlan {
  const r = planSequence({ qStart: q0, inertia: J, wheelMomentumBody: h, targets }, lim);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

describe('planSequence timeline', () => {
  it('chains slews and holds; each segment equals the stand-alone segment plan', () => {
    const s = plan([0, 0, 0]);
    expect(s.feasible).toBe(true);
    expect(s.timeline.length).toBe(3);
    let t = 0,
      prev = q0;
    s.timeline.forEach((e, k) => {
      const alone = planSegment({ qStart: prev, qTarget: targets[k]!.q, inertia: J, wheelMomentumBody: [0, 0, 0] }, lim);
      if (!alone.ok || !alone.value.feasible) throw new Error('segment');
      expect(e.slewStartS).toBe(t);
      expect(Math.abs(e.slewEndS - e.slewStartS - alone.value.durationS)).toBeLessThan(1e-12);
      expect(Math.abs(e.holdEndS - e.slewEndS - targets[k]!.holdS)).toBeLessThan(1e-12);
      t = e.holdEndS;
      prev = Array.from(e.plan.qEnd);
    });
    expect(s.totalS).toBe(t);
    expect(s.timeline[0]!.label).toBe('image A');
    expect(s.timeline[2]!.label).toBe('target 3');
    const sum = s.timeline.reduce((acc, e, k) => acc + e.plan.durationS + targets[k]!.holdS, 0);
    expect(Math.abs(s.totalS - sum)).toBeLessThan(1e-9);
  });

  it('carries the stored momentum: R(q_k) h_k is the same inertial vector at every rest attitude', () => {
    const h0 = [0.0008, -0.0005, 0.0011];
    const s = plan(h0);
    expect(s.feasible).toBe(true);
    const HI = rotate(q0, h0);
    for (const e of s.timeline) {
      const a = rotate(e.plan.qStart, e.plan.wheelMomentumStartBody);
      const b = rotate(e.plan.qEnd, e.plan.wheelMomentumEndBody);
      for (let i = 0; i < 3; i++) {
        expect(Math.abs(a[i]! - HI[i]!)).toBeLessThan(1e-15);
        expect(Math.abs(b[i]! - HI[i]!)).toBeLessThan(1e-15);
      }
      expect(e.plan.method).toBe('sampled-search');
    }
  });

  it('stops the timeline before the first infeasible target, but still plans every target', () => {
    // 0.0016 N·m·s along body y is 26.7% of the 0.006 cube: over a 25% margin before anything moves.
    const r = planSequence(
      {
        qStart: [0, 0, 0, 1],
        inertia: [0.1, 0, 0, 0, 0.1, 0, 0, 0, 0.1],
        wheelMomentumBody: [0, 0.0016, 0],
        targets: [
          { q: axisAngle([0, 1, 0], 30 * D), holdS: 5 },
          { q: axisAngle([0, 0, 1], 90 * D), holdS: 5 },
        ],
      },
      { ...lim, momentumMargin: 0.25 },
    );
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    expect(r.value.feasible).toBe(false);
    expect(r.value.firstInfeasible).toBe(0);
    expect(r.value.timeline.length).toBe(0);
    expect(r.value.segments.length).toBe(2);
    expect(r.value.segments.every((v) => !v.feasible && v.reasons.some((x) => x.rule === 'stored-momentum-start'))).toBe(true);
    expect(r.value.totalS).toBe(0);
  });

  it('a middle infeasible target: prefix timeline, reference holds the last reached attitude', () => {
    // Zero torque capacity about body x only matters for a slew whose Je has an x part.
    const noX: PlanLimits = {
      torqueCapacity: (d) => (Math.abs(d[0]!) > 1e-12 ? 0 : 0.002 / Math.max(Math.abs(d[1]!), Math.abs(d[2]!))),
      momentumCapacity: cubeCapacity(0.006),
      torqueMargin: 0.8,
      momentumMargin: 0.8,
    };
    const Jd = [0.1, 0, 0, 0, 0.12, 0, 0, 0, 0.08];
    // Target 3 is target 2 turned 30° about its own body z: that slew needs no x torque.
    const q2 = axisAngle([1, 0, 1], 50 * D);
    const q3 = toQ(q2).mul(Quaternion.fromAxisAngle([0, 0, 1], 30 * D));
    const tg = [
      { q: axisAngle([0, 0, 1], 40 * D), holdS: 7 },
      { q: q2, holdS: 5 }, // needs x torque
      { q: [q3.x, q3.y, q3.z, q3.w], holdS: 3 },
    ];
    const r = planSequence({ qStart: [0, 0, 0, 1], inertia: Jd, wheelMomentumBody: [0, 0, 0], targets: tg }, noX);
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const s = r.value;
    expect(s.feasible).toBe(false);
    expect(s.firstInfeasible).toBe(1);
    expect(s.timeline.length).toBe(1);
    expect(s.segments.map((v) => v.feasible)).toEqual([true, false, true]);
    const bad = s.segments[1]!;
    if (bad.feasible) throw new Error('expected infeasible');
    expect(bad.reasons[0]!.rule).toBe('zero-torque-capacity');
    expect(s.totalS).toBe(s.timeline[0]!.holdEndS);
    const q = new Float64Array(4),
      w = new Float64Array(3),
      wd = new Float64Array(3);
    evaluateReference(s, s.totalS + 100, q, w, wd);
    const qa = tg[0]!.q;
    expect(Math.abs(Math.abs(q[0]! * qa[0]! + q[1]! * qa[1]! + q[2]! * qa[2]! + q[3]! * qa[3]!) - 1)).toBeLessThan(1e-15);
    expect(Array.from(w)).toEqual([0, 0, 0]);
  });

  it('reports every bad field of the input at once', () => {
    const r = planSequence(
      {
        qStart: [0, 0, 0, 1],
        inertia: J,
        wheelMomentumBody: [0, 0, 0],
        targets: [{ q: [1, 1, 0, 0], holdS: 1 }, { q: [0, 0, 0, 1], holdS: -2 }, null as never],
      },
      lim,
    );
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors.map((e) => `${e.path}:${e.rule}`)).toEqual([
      'targets[0].q:unit-norm',
      'targets[1].holdS:non-negative',
      'targets[2]:type',
    ]);
  });
});

describe('evaluateReference over a sequence', () => {
  const s = plan([0, 0, 0]);
  const q = new Float64Array(4),
    w = new Float64Array(3),
    wd = new Float64Array(3);
  const near = (a: ArrayLike<number>, b: ArrayLike<number>) =>
    Math.abs(Math.abs(a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]! + a[3]! * b[3]!) - 1);

  it('holds the start before 0, each target during its hold, the last target after the end', () => {
    expect(evaluateReference(s, -5, q, w, wd)).toBe(-1);
    expect(Array.from(q)).toEqual(q0.map((x) => x / Math.hypot(...q0)));
    expect(Array.from(w)).toEqual([0, 0, 0]);
    s.timeline.forEach((e, k) => {
      for (const t of [e.slewEndS, 0.5 * (e.slewEndS + e.holdEndS), e.holdEndS - 1e-9]) {
        expect(evaluateReference(s, t, q, w, wd)).toBe(k);
        expect(near(q, targets[k]!.q)).toBeLessThan(1e-14);
        expect(Array.from(w)).toEqual([0, 0, 0]);
        expect(Array.from(wd)).toEqual([0, 0, 0]);
      }
    });
    evaluateReference(s, s.totalS + 1e3, q, w, wd);
    expect(near(q, targets[2]!.q)).toBeLessThan(1e-14);
    evaluateReference(s, NaN, q, w, wd);
    expect(q.every(Number.isFinite)).toBe(true);
  });

  it('during a slew: rate and acceleration lie along the segment axis; q matches q0 ⊗ exp(½φe) from the npm quaternion package', () => {
    const e = s.timeline[1]!;
    const ax = e.plan.axisBody;
    for (let k = 1; k < 20; k++) {
      const t = e.slewStartS + (e.plan.durationS * k) / 20;
      evaluateReference(s, t, q, w, wd);
      const wn = Math.hypot(w[0]!, w[1]!, w[2]!);
      for (let i = 0; i < 3; i++) expect(Math.abs(w[i]! - wn * ax[i]!)).toBeLessThan(1e-15);
      // φ from the plan's profile; the product from the independent library.
      const dphi = Math.hypot(wd[0]!, wd[1]!, wd[2]!);
      expect(dphi).toBeLessThanOrEqual(e.plan.profile.accelRadPerS2 * (1 + 1e-15));
    }
    // At the midpoint of the slew the eigenaxis profile is symmetric: φ = θ/2.
    evaluateReference(s, e.slewStartS + e.plan.durationS / 2, q, w, wd);
    const ref = toQ(e.plan.qStart).mul(Quaternion.fromAxisAngle([ax[0]!, ax[1]!, ax[2]!], e.plan.angleRad / 2));
    expect(near(q, [ref.x, ref.y, ref.z, ref.w])).toBeLessThan(1e-14);
  });

  it('planned loads: τ = J ω̇ + ω × (Jω + h_w) and ḣ_w = −τ (finite differences), zero torque in holds', () => {
    const sh = plan([0.0008, -0.0005, 0.0011]);
    const tau = new Float64Array(3),
      h = new Float64Array(3),
      hp = new Float64Array(3),
      hm = new Float64Array(3);
    const Jm = (v: ArrayLike<number>) => [0, 1, 2].map((r) => J[r]! * v[0]! + J[3 + r]! * v[1]! + J[6 + r]! * v[2]!);
    const e = sh.timeline[1]!;
    const sw = e.plan.switchTimesS.map((x) => x + e.slewStartS);
    for (let k = 1; k < 40; k++) {
      const t = e.slewStartS + (e.plan.durationS * k) / 40;
      if (sw.some((x) => Math.abs(x - t) < 1e-3)) continue;
      evaluateReference(sh, t, q, w, wd);
      evaluatePlannedLoads(sh, t, tau, h);
      const Jw = Jm(w),
        Jwd = Jm(wd);
      const H = [Jw[0]! + h[0]!, Jw[1]! + h[1]!, Jw[2]! + h[2]!];
      const g = [w[1]! * H[2]! - w[2]! * H[1]!, w[2]! * H[0]! - w[0]! * H[2]!, w[0]! * H[1]! - w[1]! * H[0]!];
      for (let i = 0; i < 3; i++) expect(Math.abs(tau[i]! - (Jwd[i]! + g[i]!))).toBeLessThan(1e-15);
      const dt = 1e-4;
      evaluatePlannedLoads(sh, t + dt, tau, hp);
      evaluatePlannedLoads(sh, t - dt, tau, hm);
      evaluatePlannedLoads(sh, t, tau, h);
      for (let i = 0; i < 3; i++) expect(Math.abs((hp[i]! - hm[i]!) / (2 * dt) + tau[i]!)).toBeLessThan(1e-10);
    }
    evaluatePlannedLoads(sh, e.slewEndS + 1, tau, h);
    expect(Array.from(tau)).toEqual([0, 0, 0]);
    for (let i = 0; i < 3; i++) expect(h[i]).toBeCloseTo(e.plan.wheelMomentumEndBody[i]!, 15);
  });
});
