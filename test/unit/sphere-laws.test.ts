/**
 * The pointing laws behind the AttitudeController interface (app/engine/control/sphere/laws.ts,
 * build.ts): torque and diagnostics against formulas evaluated here with the npm `quaternion`
 * package, roll freedom, the hybrid logic contract of control/types.ts, input validation, and the
 * bandwidth gains against the standard second-order step response (e.g. Ogata, Modern Control
 * Engineering, ch. 5 — from memory: φ(t) = φ₀e^{−ζω_n t}(cos ω_d t + ζ/√(1−ζ²) sin ω_d t) from rest).
 */
import Quaternion from 'quaternion';
import { describe, expect, it } from 'vitest';
import { controllerFromSpec as makeController } from '../support/controller-spec';
import { makeReducedPd, makeReducedSynergistic, reducedGainsFromBandwidth } from '../../app/engine/control/sphere/index';
import type { ControlInput, PlantModel } from '../../app/engine/control/types';
import { makeDiagnostics } from '../../app/engine/control/types';
import { makeRng } from '../../app/engine/math/prng';
import { qRandomUniform } from '../../app/engine/math/rotation';
import { RAD_PER_DEG } from '../../app/engine/units';
import { fly, triadVehicle } from '../reference/closedloop-fixtures';
import { angle, attitudeSeeing, uniformDirection, type V3 } from '../reference/sphere-fixtures';

const Jrows = [
  [1.2, 0.1, -0.05],
  [0.1, 0.9, 0.02],
  [-0.05, 0.02, 1.5],
];
const plant: PlantModel = {
  Jperp: Float64Array.from([1.2, 0.1, -0.05, 0.1, 0.9, 0.02, -0.05, 0.02, 1.5]),
  nWheels: 3,
  axes: Float64Array.of(1, 0, 0, 0, 1, 0, 0, 0, 1),
};
const b: V3 = [0.6, 0, 0.8];
const Kd = [0.6, 0.1, 0, 0.1, 0.5, 0, 0, 0, 0.7];
const kp = 0.8;

function pd() {
  const r = makeReducedPd({ axis: [3, 0, 4], kp, Kd }, plant); // any length: normalised to b
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}
function syn(hysteresis = 0.3) {
  const r = makeReducedSynergistic({ axis: b, kp, Kd, warpGain: 0.5, members: 3, hysteresis }, plant);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}
function input(q: number[], w: number[], qRef = [0, 0, 0, 1], wRef = [0, 0, 0], wdRef = [0, 0, 0], h = [0, 0, 0]): ControlInput {
  return {
    q: Float64Array.from(q),
    omega: Float64Array.from(w),
    hWheel: Float64Array.from(h),
    qRef: Float64Array.from(qRef),
    omegaRef: Float64Array.from(wRef),
    omegaDotRef: Float64Array.from(wdRef),
  };
}
const seen = (q: number[], qRef: number[]) => {
  const qe = new Quaternion(qRef[3]!, qRef[0]!, qRef[1]!, qRef[2]!).conjugate().mul(new Quaternion(q[3]!, q[0]!, q[1]!, q[2]!));
  return qe.conjugate().rotateVector(b) as V3;
};

describe('reduced PD', () => {
  it('torque = quaternion-PD torque + k_pε − k_p(y × b): the same tracking feedforward and damping, the pointing gradient instead', () => {
    const qpd = makeController({ kind: 'quaternion-pd', gains: { kp, kd: [0, 1, 2].map((i) => [Kd[i]!, Kd[3 + i]!, Kd[6 + i]!]) } }, plant);
    if (!qpd.ok) throw new Error(JSON.stringify(qpd.errors));
    const law = pd();
    const rng = makeRng(3, 0);
    const q = new Float64Array(4),
      qr = new Float64Array(4);
    const t1 = new Float64Array(3),
      t2 = new Float64Array(3);
    for (let s = 0; s < 200; s++) {
      qRandomUniform(q, rng);
      qRandomUniform(qr, rng);
      const inp = input(Array.from(q), [0.1, -0.2, 0.05], Array.from(qr), [0.02, 0.03, -0.01], [0.001, 0, 0.002], [0.05, -0.02, 0.01]);
      law.torque(t1, inp, 0);
      qpd.value.torque(t2, inp, 0);
      const qe = new Quaternion(qr[3], qr[0], qr[1], qr[2]).conjugate().mul(new Quaternion(q[3], q[0], q[1], q[2]));
      const y = seen(Array.from(q), Array.from(qr));
      const g = [y[1] * b[2] - y[2] * b[1], y[2] * b[0] - y[0] * b[2], y[0] * b[1] - y[1] * b[0]];
      const eps = [qe.x, qe.y, qe.z];
      for (let i = 0; i < 3; i++) expect(t1[i]).toBeCloseTo(t2[i]! + kp * eps[i]! - kp * g[i]!, 12);
    }
  });

  it('diagnostics: pointing angle, eta = cos(φ/2), V = 1 − cos φ, W = k_pV + ½ω_eᵀJω_e; no logic', () => {
    const law = pd();
    const d = makeDiagnostics();
    const rng = makeRng(4, 0);
    for (let s = 0; s < 100; s++) {
      const y0 = uniformDirection(rng);
      const q = attitudeSeeing(y0, b, 6 * rng.next());
      const w = [0.1, -0.05, 0.2];
      law.diagnostics(d, input(q, w), 0);
      const phi = angle(b, y0);
      expect(d.errorAngle).toBeCloseTo(phi, 12);
      expect(d.eta).toBeCloseTo(Math.cos(phi / 2), 12);
      expect(d.potential).toBeCloseTo(1 - Math.cos(phi), 12);
      expect(d.potentialMin).toBe(d.potential);
      expect(d.gap).toBe(0);
      let ke = 0;
      for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) ke += 0.5 * w[i]! * Jrows[i]![j]! * w[j]!;
      expect(d.lyapunov).toBeCloseTo(kp * (1 - Math.cos(phi)) + ke, 12);
    }
    expect(law.initialLogic()).toBe(0);
    expect(law.jumpGuard()).toBeLessThan(0);
    expect(law.jumpDecrease).toBe(0);
    expect(law.kind).toBe('reduced-pd');
  });
});

describe('roll is free', () => {
  it('at rest on target, every roll about b gives zero torque and W = 0 (no stiffness about b), for both laws', () => {
    const d = makeDiagnostics();
    const t = new Float64Array(3);
    for (const law of [pd(), syn()]) {
      for (const roll of [0, 0.7, 2, 4, 6]) {
        const inp = input(attitudeSeeing(b, b, roll), [0, 0, 0]);
        law.torque(t, inp, 1);
        expect(Math.hypot(t[0]!, t[1]!, t[2]!)).toBeLessThan(1e-15);
        expect(law.diagnostics(d, inp, 1).lyapunov).toBeLessThan(1e-15);
      }
    }
  });

  it('away from the target the potential torque has no component along the line of sight y', () => {
    const t = new Float64Array(3);
    const rng = makeRng(5, 0);
    for (const law of [pd(), syn()]) {
      for (let s = 0; s < 200; s++) {
        const y0 = uniformDirection(rng);
        const q = attitudeSeeing(y0, b, 6 * rng.next());
        for (let logic = 1; logic <= 3; logic++) {
          law.torque(t, input(q, [0, 0, 0]), logic);
          expect(Math.abs(t[0]! * y0[0] + t[1]! * y0[1] + t[2]! * y0[2])).toBeLessThan(1e-14);
        }
      }
    }
  });
});

describe('reduced synergistic logic', () => {
  it('initial logic is the argmin; the guard is μ − δ; a jump names the gap and goes to the argmin; an invalid logic is reset', () => {
    const law = syn(0.3);
    const cp = law.sphereCertificate!.criticalPoints.find((p) => p.kind === 'undesired' && p.member === 1)!;
    const inp = input(attitudeSeeing(cp.direction, b, 0.2), [0, 0, 0]);
    expect(law.initialLogic(inp)).toBe(cp.jumpTo);
    expect(law.jumpGuard(inp, 1)).toBeCloseTo(cp.gap - 0.3, 9);
    const j = law.updateLogic(inp, 1);
    expect(j.logic).toBe(cp.jumpTo);
    expect(j.why).toMatch(/^pointing synergy gap \d\.\d{4} ≥ δ = 0\.3: V_1 = 2\.0000 → V_\d = /);
    expect(law.updateLogic(inp, cp.jumpTo)).toEqual({ logic: cp.jumpTo, why: null });
    const bad = law.updateLogic(inp, 7);
    expect(bad.logic).toBe(cp.jumpTo);
    expect(bad.why).toMatch(/invalid value 7/);
    expect(law.jumpGuard(inp, 0)).toBeGreaterThan(0);
    expect(law.jumpDecrease).toBeCloseTo(kp * 0.3, 15);
    expect(law.kind).toBe('reduced-synergistic');
    expect(law.certificate).toBeNull();
  });
});

describe('builders list every problem', () => {
  it('bad gains, axis, members and initial logic', () => {
    const r = makeReducedPd({ axis: [0, 0, 0], kp: -1, Kd: [1, 2, 0, 0, 1, 0, 0, 0, 1] }, plant, 'c[1]');
    expect(r.ok).toBe(false);
    if (!r.ok)
      expect(r.errors.map((e) => `${e.path}:${e.rule}`).sort()).toEqual([
        'c[1].Kd:positive-definite',
        'c[1].axis:unit-vector',
        'c[1].kp:positive',
      ]);
    const s = makeReducedSynergistic({ axis: b, kp, Kd: 1, warpGain: 0.5, members: 1, hysteresis: 0.2 }, plant);
    expect(!s.ok && s.errors[0]!.rule).toBe('min-members');
    const l = makeReducedSynergistic({ axis: b, kp, Kd: 1, warpGain: 0.5, hysteresis: 0.2, initialLogic: 3 }, plant);
    expect(!l.ok && l.errors[0]!.path).toBe('controller.initialLogic');
  });

  it('a refused certificate refuses the law, unless requireCertificate is false (then warnings)', () => {
    const spec = { axis: b, kp, Kd: 1, warpGain: 0.5, hysteresis: 5 };
    const r = makeReducedSynergistic(spec, plant);
    expect(!r.ok && r.errors.map((e) => e.rule)).toEqual(['synergy-gap']);
    const w = makeReducedSynergistic({ ...spec, requireCertificate: false }, plant);
    expect(w.ok).toBe(true);
    if (w.ok) {
      expect(w.warnings.map((e) => e.rule)).toContain('synergy-gap');
      expect(w.value.sphereCertificate!.admissible).toBe(false);
    }
  });
});

describe('bandwidth gains', () => {
  it('a small tilt about the largest principal axis follows the second-order response with ω_n and ζ', () => {
    const v = triadVehicle([0.11, 0.12, 0.08]);
    const wn = 0.5,
      zeta = 0.5;
    const g = reducedGainsFromBandwidth(v.model.Jperp, wn, zeta);
    expect(g.inertiaRef).toBeCloseTo(0.12, 8);
    const r = makeReducedPd({ axis: [1, 0, 0], kp: g.kp, Kd: g.kd }, v.model);
    if (!r.ok) throw new Error('refused');
    const phi0 = 0.5 * RAD_PER_DEG;
    // y0 tilted from b = x towards z: a rotation about the body y axis (J = 0.12)
    const q0 = attitudeSeeing([Math.cos(phi0), 0, Math.sin(phi0)], [1, 0, 0], 0);
    const run = fly({ vehicle: v, controller: r.value, q0, tEnd: 12, timing: 'continuous-ideal', controlRateHz: 20 });
    const wd = wn * Math.sqrt(1 - zeta * zeta);
    let worst = 0;
    for (let k = 0; k < run.trace.n; k++) {
      const t = run.trace.t[k]!;
      const ref = phi0 * Math.exp(-zeta * wn * t) * (Math.cos(wd * t) + (zeta / Math.sqrt(1 - zeta * zeta)) * Math.sin(wd * t));
      worst = Math.max(worst, Math.abs(run.trace.errorAngle[k]! - Math.abs(ref)));
    }
    expect(worst).toBeLessThan(1e-3 * phi0);
  });
});
