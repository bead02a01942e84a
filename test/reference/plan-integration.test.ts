/**
 * The planned reference and loads, integrated independently.
 *
 * 1. Kinematics: a small RK4 of q̇ = ½ q ⊗ (ω, 0) (methods §1.1) driven by the reference rate
 *    reaches the target to 1e-9; finite differences of q and ω match ω and ω̇.
 * 2. Dynamics: the npm `odex` package (Hairer & Wanner's GBS extrapolation code, references §6)
 *    integrates the rigid body with wheels, J ω̇ = τ − ω × (Jω + h_w), ḣ_w = −τ (methods §6,
 *    absolute wheel momentum), driven only by the planned torque τ(t). Open loop, the body must
 *    arrive at the target at rest: |angle error| < 1e-11 rad, |ω| < 1e-12 rad/s, wheel momentum as
 *    planned to 1e-13 N·m·s (odex at 1e-13 abs/rel; measured ≈ 4e-14 rad, 8e-16 rad/s, 6e-16 N·m·s).
 * Negative control: dropping the gyroscopic part of τ with stored momentum misses the target.
 */
import { describe, expect, it } from 'vitest';
import { Solver } from 'odex';
import { inv } from 'mathjs';
import { planSequence } from '../../app/engine/plan/sequence';
import { evaluatePlannedLoads, evaluateReference } from '../../app/engine/plan/reference';
import { boxCapacity, cubeCapacity } from '../../app/engine/plan/limits';
import type { PlanLimits, SequencePlan } from '../../app/engine/plan/types';

const D = Math.PI / 180;
const axisAngle = (ax: number[], th: number) => {
  const n = Math.hypot(ax[0]!, ax[1]!, ax[2]!),
    s = Math.sin(th / 2) / n;
  return [ax[0]! * s, ax[1]! * s, ax[2]! * s, Math.cos(th / 2)];
};
/** Hamilton product, scalar last, written here independently of the engine. */
const qmul = (a: number[], b: number[]) => [
  a[3]! * b[0]! + a[0]! * b[3]! + a[1]! * b[2]! - a[2]! * b[1]!,
  a[3]! * b[1]! - a[0]! * b[2]! + a[1]! * b[3]! + a[2]! * b[0]!,
  a[3]! * b[2]! + a[0]! * b[1]! - a[1]! * b[0]! + a[2]! * b[3]!,
  a[3]! * b[3]! - a[0]! * b[0]! - a[1]! * b[1]! - a[2]! * b[2]!,
];
/** Rotation angle of a* ⊗ b: 2 atan2(|vec|, |w|), accurate near zero (unlike acos of a dot product). */
const angleBetween = (a: ArrayLike<number>, b: ArrayLike<number>) => {
  const e = qmul([-a[0]!, -a[1]!, -a[2]!, a[3]!], [b[0]!, b[1]!, b[2]!, b[3]!]);
  return 2 * Math.atan2(Math.hypot(e[0]!, e[1]!, e[2]!), Math.abs(e[3]!));
};

interface Case {
  name: string;
  qStart: number[];
  qTarget: number[];
  J: number[];
  h0: number[];
  limits: PlanLimits;
}
const cases: Case[] = [
  {
    // references §1.9 profile: 90° about z, 1 deg/s², 3 deg/s (J_zz = 10, margins 1).
    name: '90° about z, bang-coast-bang, H = 0',
    qStart: [0, 0, 0, 1],
    qTarget: axisAngle([0, 0, 1], 90 * D),
    J: [8, 0, 0, 0, 9, 0, 0, 0, 10],
    h0: [0, 0, 0],
    limits: { torqueCapacity: cubeCapacity(10 * D), momentumCapacity: cubeCapacity(30 * D), torqueMargin: 1, momentumMargin: 1 },
  },
  {
    // Invented 12U with an orthogonal triad facing a 175° slew, products of inertia, H = 0.
    name: '175° non-principal axis, H = 0',
    qStart: axisAngle([0.3, -0.2, 1], 0.5),
    qTarget: axisAngle([1, 0.4, -0.3], 2.2),
    J: [0.25, 0.01, -0.006, 0.01, 0.3, 0.004, -0.006, 0.004, 0.18],
    h0: [0, 0, 0],
    limits: { torqueCapacity: cubeCapacity(0.004), momentumCapacity: cubeCapacity(0.02), torqueMargin: 0.9, momentumMargin: 0.8 },
  },
  {
    // Invented Lumen-6-like body holding wheel momentum across the axis: gyroscopic torque matters.
    name: 'non-principal axis with stored momentum (sampled search)',
    qStart: axisAngle([0, 1, 0], 0.3),
    qTarget: axisAngle([1, 2, 2], 2.0),
    J: [0.11, 0.002, -0.001, 0.002, 0.12, 0.0015, -0.001, 0.0015, 0.08],
    h0: [0.0025, -0.0015, 0.001],
    limits: {
      torqueCapacity: boxCapacity([0.002, 0.002, 0.0025]),
      momentumCapacity: cubeCapacity(0.006),
      torqueMargin: 0.8,
      momentumMargin: 0.85,
    },
  },
];

function planCase(c: Case): SequencePlan {
  const r = planSequence({ qStart: c.qStart, inertia: c.J, wheelMomentumBody: c.h0, targets: [{ q: c.qTarget, holdS: 0 }] }, c.limits);
  if (!r.ok || !r.value.feasible) throw new Error(`${c.name}: ${JSON.stringify(r.ok ? r.value.segments : r.errors)}`);
  return r.value;
}

/** Phase boundaries of the single slew: start, switches, end. */
function breaks(s: SequencePlan): number[] {
  const e = s.timeline[0]!;
  return [e.slewStartS, ...e.plan.switchTimesS.map((x) => x + e.slewStartS), e.slewEndS];
}

/** Reference rate with the phase's own acceleration (t clamped into the open phase interval). */
function clampInto(t: number, a: number, b: number): number {
  const d = 1e-12 * (b - a);
  return Math.min(Math.max(t, a + d), b - d);
}

describe.each(cases)('reference kinematics: $name', (c) => {
  const s = planCase(c);
  const plan = s.timeline[0]!.plan;
  const q = new Float64Array(4),
    w = new Float64Array(3),
    wd = new Float64Array(3);

  it('RK4 of q̇ = ½ q ⊗ ω_ref(t) reaches the target to 1e-9', () => {
    let y = Array.from(plan.qStart);
    const bk = breaks(s);
    const rate = (t: number, a: number, b: number) => {
      evaluateReference(s, clampInto(t, a, b), q, w, wd);
      return [w[0]!, w[1]!, w[2]!, 0];
    };
    const f = (t: number, qq: number[], a: number, b: number) => qmul(qq, rate(t, a, b)).map((x) => 0.5 * x);
    for (let k = 0; k + 1 < bk.length; k++) {
      const a = bk[k]!,
        b = bk[k + 1]!;
      const n = Math.max(1, Math.ceil((b - a) / 0.02));
      const h = (b - a) / n;
      for (let i = 0; i < n; i++) {
        const t = a + i * h;
        const k1 = f(t, y, a, b);
        const k2 = f(
          t + h / 2,
          y.map((v, j) => v + (h / 2) * k1[j]!),
          a,
          b,
        );
        const k3 = f(
          t + h / 2,
          y.map((v, j) => v + (h / 2) * k2[j]!),
          a,
          b,
        );
        const k4 = f(
          t + h,
          y.map((v, j) => v + h * k3[j]!),
          a,
          b,
        );
        y = y.map((v, j) => v + (h / 6) * (k1[j]! + 2 * k2[j]! + 2 * k3[j]! + k4[j]!));
      }
    }
    expect(angleBetween(y, c.qTarget)).toBeLessThan(1e-9);
    // Same sign as the plan's end quaternion (no hemisphere flip along the way).
    expect(y[0]! * plan.qEnd[0]! + y[1]! * plan.qEnd[1]! + y[2]! * plan.qEnd[2]! + y[3]! * plan.qEnd[3]!).toBeGreaterThan(0);
    evaluateReference(s, s.totalS, q, w, wd);
    expect(angleBetween(q, c.qTarget)).toBeLessThan(1e-12);
  });

  it('finite differences: ω = 2 vec(q* ⊗ q̇) and ω̇ = dω/dt', () => {
    const h = 1e-4;
    const qp = new Float64Array(4),
      qm = new Float64Array(4),
      wp = new Float64Array(3),
      wm = new Float64Array(3);
    const bk = breaks(s);
    const scale = plan.peakRateRadPerS;
    for (let k = 1; k < 60; k++) {
      const t = (plan.durationS * k) / 60;
      if (bk.some((x) => Math.abs(x - t) < 3 * h)) continue;
      evaluateReference(s, t, q, w, wd);
      evaluateReference(s, t + h, qp, wp, wd);
      evaluateReference(s, t - h, qm, wm, wd);
      evaluateReference(s, t, q, w, wd);
      const qdot = [0, 1, 2, 3].map((i) => (qp[i]! - qm[i]!) / (2 * h));
      const conj = [-q[0]!, -q[1]!, -q[2]!, q[3]!];
      const om = qmul(conj, qdot).map((x) => 2 * x);
      for (let i = 0; i < 3; i++) {
        expect(Math.abs(om[i]! - w[i]!)).toBeLessThan(1e-8 * Math.max(1, scale));
        expect(Math.abs((wp[i]! - wm[i]!) / (2 * h) - wd[i]!)).toBeLessThan(1e-9);
      }
      expect(Math.abs(om[3]!)).toBeLessThan(1e-9);
    }
  });
});

/**
 * Integrate the body with wheels over the slew with odex, phase by phase (τ jumps at switches, so
 * the solver restarts there). `torque` gives the body torque applied at time t.
 */
function flyOpenLoop(c: Case, s: SequencePlan, torque: (t: number, out: Float64Array) => void) {
  const J = c.J;
  const Jinv = inv([
    [J[0]!, J[3]!, J[6]!],
    [J[1]!, J[4]!, J[7]!],
    [J[2]!, J[5]!, J[8]!],
  ]) as number[][];
  const tau = new Float64Array(3);
  let y = [...s.timeline[0]!.plan.qStart, 0, 0, 0, ...c.h0];
  const bk = breaks(s);
  for (let k = 0; k + 1 < bk.length; k++) {
    const a = bk[k]!,
      b = bk[k + 1]!;
    const f = (t: number, x: number[]) => {
      torque(clampInto(t, a, b), tau);
      const q = x.slice(0, 4),
        om = x.slice(4, 7),
        hw = x.slice(7, 10);
      const H = [0, 1, 2].map((r) => J[r]! * om[0]! + J[3 + r]! * om[1]! + J[6 + r]! * om[2]! + hw[r]!);
      const g = [om[1]! * H[2]! - om[2]! * H[1]!, om[2]! * H[0]! - om[0]! * H[2]!, om[0]! * H[1]! - om[1]! * H[0]!];
      const rhs = [0, 1, 2].map((i) => tau[i]! - g[i]!);
      const omd = [0, 1, 2].map((r) => Jinv[r]![0]! * rhs[0]! + Jinv[r]![1]! * rhs[1]! + Jinv[r]![2]! * rhs[2]!);
      const qd = qmul(q, [om[0]!, om[1]!, om[2]!, 0]).map((v) => 0.5 * v);
      return [...qd, ...omd, -tau[0]!, -tau[1]!, -tau[2]!];
    };
    const solver = new Solver(10);
    solver.absoluteTolerance = 1e-13;
    solver.relativeTolerance = 1e-13;
    solver.maxSteps = 100000;
    const r = solver.solve(f, a, y, b);
    expect(r.outcome).toBe(0); // Converged
    y = r.y;
  }
  return { q: y.slice(0, 4), omega: y.slice(4, 7), h: y.slice(7, 10) };
}

describe.each(cases)('open-loop dynamics with odex: $name', (c) => {
  const s = planCase(c);
  const plan = s.timeline[0]!.plan;

  it('the body driven by the planned torque arrives at the target at rest, wheels as planned', () => {
    const h = new Float64Array(3);
    const end = flyOpenLoop(c, s, (t, out) => evaluatePlannedLoads(s, t, out, h));
    expect(angleBetween(end.q, c.qTarget)).toBeLessThan(1e-11);
    expect(Math.hypot(end.omega[0]!, end.omega[1]!, end.omega[2]!)).toBeLessThan(1e-12);
    for (let i = 0; i < 3; i++) expect(Math.abs(end.h[i]! - plan.wheelMomentumEndBody[i]!)).toBeLessThan(1e-13);
  });

  if (c.h0.some((x) => x !== 0)) {
    it('negative control: without the gyroscopic term (τ = J e α only) the body misses', () => {
      const h = new Float64Array(3),
        q = new Float64Array(4),
        w = new Float64Array(3),
        wd = new Float64Array(3);
      const end = flyOpenLoop(c, s, (t, out) => {
        evaluateReference(s, t, q, w, wd);
        evaluatePlannedLoads(s, t, out, h);
        for (let i = 0; i < 3; i++) out[i] = c.J[i]! * wd[0]! + c.J[3 + i]! * wd[1]! + c.J[6 + i]! * wd[2]!;
      });
      expect(angleBetween(end.q, c.qTarget)).toBeGreaterThan(1e-3);
    });
  }
});
