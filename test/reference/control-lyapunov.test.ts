/**
 * Lyapunov identities of the tracking laws on a gyrostat with stored wheel momentum (derivations:
 * methods §2a, §3, §4.1, §6; laws: Mayhew, Sanfelice & Teel, IEEE TAC 56(11), 2011; Mayhew & Teel,
 * IEEE TAC 58(11), 2013; Wie, Weiss & Arapostathis, JGCD 12(3), 1989):
 *   on flows   dW/dt = −ω_eᵀK ω_e          (checked in integral form and pointwise),
 *   at jumps   ΔW = 4k_p·(−hη) ≥ 4k_pδ (hysteretic), ΔW = k_R μ ≥ k_R δ (synergistic).
 * The reference turns with a time-varying rate, the inertia is not diagonal and the wheels hold
 * momentum, so the feedforward and gyroscopic terms are all exercised.
 */
import { describe, expect, it } from 'vitest';
import { controllerFromSpec as makeController } from '../support/controller-spec';
import type { AttitudeController } from '../../app/engine/control/types';
import { makeDiagnostics } from '../../app/engine/control/types';
import { makeRng } from '../../app/engine/math/prng';
import { qCreate, qFromAxisAngle, qRandomUniform } from '../../app/engine/math/rotation';
import type { Reference } from './control-rk4';
import { initialState, inputAt, makeDerivative, makeInput, omegaError, plantOf, rk4Step } from './control-rk4';

const J = [
  [1.2, 0.1, -0.05],
  [0.1, 0.9, 0.02],
  [-0.05, 0.02, 1.5],
];
const plant = plantOf(J);
const ref: Reference = {
  rate(t, w, wd) {
    w[0] = 0.1 * Math.sin(0.7 * t);
    w[1] = 0.05 * Math.cos(0.3 * t);
    w[2] = 0.08;
    wd[0] = 0.07 * Math.cos(0.7 * t);
    wd[1] = -0.015 * Math.sin(0.3 * t);
    wd[2] = 0;
  },
};
const Kd = [
  [0.6, 0.1, 0],
  [0.1, 0.5, 0],
  [0, 0, 0.7],
];
const synergy = { potential: { eigenvalues: [1, 2, 3] }, warpGain: 0.15 };

function build(spec: Record<string, unknown>): AttitudeController {
  const r = makeController(spec, plant);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

const q0 = Array.from(qFromAxisAngle(qCreate(), [0.3, -0.5, 0.8], 1.3));
const qd0 = Array.from(qFromAxisAngle(qCreate(), [1, 0.2, 0], 0.4));

/** Flow for T seconds with fixed logic; returns W, D and the guard along the way. */
function flow(ctrl: AttitudeController, K: number[][], logic: number, T = 3, dt = 1e-3) {
  let x = initialState(q0, [0.05, -0.04, 0.03], [0.05, -0.03, 0.02], qd0);
  const f = makeDerivative({ ctrl, plant, J, ref, K }, { logic });
  const inp = makeInput();
  const d = makeDiagnostics();
  const W: number[] = [],
    D: number[] = [],
    diss: number[] = [];
  let maxGuard = -Infinity;
  const steps = Math.round(T / dt);
  for (let k = 0; k <= steps; k++) {
    inputAt(inp, x, k * dt, ref);
    W.push(ctrl.diagnostics(d, inp, logic).lyapunov);
    D.push(x[14]!);
    const e = omegaError(x, inp.omegaRef);
    let s = 0;
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) s += e[i]! * K[i]![j]! * e[j]!;
    diss.push(s);
    maxGuard = Math.max(maxGuard, ctrl.jumpGuard(inp, logic));
    if (k < steps) x = rk4Step(f, k * dt, x, dt);
  }
  return { W, D, diss, maxGuard, dt };
}

function checkFlow(r: ReturnType<typeof flow>) {
  expect(r.maxGuard).toBeLessThan(0); // the whole window is a flow (no jump due)
  const n = r.W.length - 1;
  // integral form: W(T) − W(0) = −∫ω_eᵀKω_e dt
  expect(Math.abs(r.W[n]! - r.W[0]! + r.D[n]!)).toBeLessThan(1e-10 * (1 + r.W[0]!));
  expect(r.W[n]).toBeLessThan(r.W[0]!);
  // pointwise: central difference of W against −ω_eᵀKω_e (O(dt²) ≈ 1e-6 relative)
  for (let k = 100; k < n; k += 250) {
    const dW = (r.W[k + 1]! - r.W[k - 1]!) / (2 * r.dt);
    expect(Math.abs(dW + r.diss[k]!)).toBeLessThan(1e-5 * (1 + r.diss[k]!));
  }
}

describe('dW/dt = −ω_eᵀKω_e along tracking flows of the gyrostat', () => {
  it('quaternion PD, W = 2k_p(1 − η) + ½ω_eᵀJω_e', () => {
    checkFlow(flow(build({ kind: 'quaternion-pd', gains: { kp: 0.8, kd: Kd } }), Kd, 0));
  });
  it('sign switch inside one hemisphere', () => {
    checkFlow(flow(build({ kind: 'sign-switch', gains: { kp: 0.8, kd: Kd } }), Kd, 0));
  });
  it('hysteretic, both values of h while they stay in the flow set', () => {
    const c = build({ kind: 'hysteretic', gains: { kp: 0.8, kd: Kd }, hysteresis: 0.9 });
    checkFlow(flow(c, Kd, 1));
    checkFlow(flow(c, Kd, -1));
  });
  it('synergistic, W = k_R V_q + ½ω_eᵀJω_e, for the member active at the start', () => {
    const c = build({ kind: 'synergistic', gains: { kR: 0.4, kOmega: Kd }, hysteresis: 0.2, ...synergy });
    const inp = inputAt(makeInput(), initialState(q0, [0, 0, 0], [0, 0, 0], qd0), 0, ref);
    checkFlow(flow(c, Kd, c.initialLogic(inp)));
  });
  it('eigenaxis (unsaturated), W = 2k(1 − sη) + ½‖ω_e‖², K = cI', () => {
    const c = build({ kind: 'eigenaxis', gains: { k: 0.3, c: 0.5 }, maxRateRadPerS: 100 });
    c.initialLogic(inputAt(makeInput(), initialState(q0, [0, 0, 0], [0, 0, 0], qd0), 0, ref));
    const cI = [
      [0.5, 0, 0],
      [0, 0.5, 0],
      [0, 0, 0.5],
    ];
    checkFlow(flow(c, cI, 0));
  });
});

describe('W decreases at jumps', () => {
  it('hysteretic: ΔW = 4k_p(−hη), exactly 4k_pδ on the jump-set boundary', () => {
    const kp = 0.8,
      delta = 0.3;
    const c = build({ kind: 'hysteretic', gains: { kp, kd: Kd }, hysteresis: delta });
    const d = makeDiagnostics();
    for (const eta of [delta, 0.5, 0.95]) {
      const s = Math.sqrt(1 - eta * eta);
      const x = initialState([s * 0.6, s * 0, s * 0.8, eta], [0.02, 0.01, -0.03], [0.05, 0, 0], [0, 0, 0, 1]);
      const inp = inputAt(makeInput(), x, 0, ref);
      expect(c.jumpGuard(inp, -1)).toBeGreaterThanOrEqual(-1e-15);
      const before = c.diagnostics(d, inp, -1).lyapunov;
      const j = c.updateLogic(inp, -1);
      expect(j.logic).toBe(1);
      const after = c.diagnostics(d, inp, j.logic).lyapunov;
      expect(before - after).toBeCloseTo(4 * kp * eta, 12);
      expect(before - after).toBeGreaterThanOrEqual(c.jumpDecrease - 1e-12);
    }
  });

  it('synergistic: ΔW = k_R μ ≥ k_R δ over random states in the jump set', () => {
    const kR = 0.4;
    const c = build({ kind: 'synergistic', gains: { kR, kOmega: Kd }, hysteresis: 0.2, ...synergy });
    const rng = makeRng(21, 0);
    const d = makeDiagnostics();
    const q = qCreate();
    let jumps = 0;
    for (let s = 0; s < 3000; s++) {
      qRandomUniform(q, rng);
      const x = initialState(Array.from(q), [rng.normal() * 0.1, rng.normal() * 0.1, rng.normal() * 0.1], [0.05, 0, 0], qd0);
      const inp = inputAt(makeInput(), x, 0, ref);
      for (let logic = 1; logic <= 3; logic++) {
        if (c.jumpGuard(inp, logic) < 0) continue;
        const dg = c.diagnostics(d, inp, logic);
        const before = dg.lyapunov,
          mu = dg.gap;
        const j = c.updateLogic(inp, logic);
        const after = c.diagnostics(d, inp, j.logic).lyapunov;
        expect(before - after).toBeCloseTo(kR * mu, 12);
        expect(before - after).toBeGreaterThanOrEqual(c.jumpDecrease - 1e-12);
        jumps++;
      }
    }
    expect(jumps).toBeGreaterThan(1000);
  });

  it('synergistic hybrid arc: W never increases across flows and jumps', () => {
    const c = build({ kind: 'synergistic', gains: { kR: 0.4, kOmega: 0.3 }, hysteresis: 0.2, ...synergy });
    // Start at rest near the undesired critical point of V₂ (certificate table, q = 2, i = 3) with
    // logic 2: the gap there is 0.249989 ≥ δ, so the law must switch before it can stall.
    const cp = c.certificate!.criticalPoints.find((p) => p.member === 2 && p.target === 3)!;
    let x = initialState(cp.attitude, [0.01, 0, 0], [0.05, -0.03, 0.02]);
    const logic = { logic: 2 };
    const f = makeDerivative({ ctrl: c, plant, J }, logic);
    const inp = makeInput();
    const d = makeDiagnostics();
    const zero: Reference = { rate: (_t, w, wd) => (w.fill(0), wd.fill(0)) };
    let Wprev = Infinity;
    let jumps = 0;
    const dt = 0.01;
    for (let k = 0; k <= 6000; k++) {
      inputAt(inp, x, k * dt, zero);
      if (c.jumpGuard(inp, logic.logic) >= 0) {
        const before = c.diagnostics(d, inp, logic.logic).lyapunov;
        const j = c.updateLogic(inp, logic.logic);
        if (j.why !== null) {
          logic.logic = j.logic;
          jumps++;
          expect(before - c.diagnostics(d, inp, logic.logic).lyapunov).toBeGreaterThanOrEqual(c.jumpDecrease - 1e-12);
        }
      }
      const W = c.diagnostics(d, inp, logic.logic).lyapunov;
      expect(W).toBeLessThanOrEqual(Wprev + 1e-12);
      Wprev = W;
      if (k < 6000) x = rk4Step(f, k * dt, x, dt);
    }
    expect(jumps).toBeGreaterThanOrEqual(1);
    // after 60 s it has converged to the target (error angle small)
    expect(2 * Math.acos(Math.min(1, Math.abs(x[3]!)))).toBeLessThan(0.01);
  });
});
