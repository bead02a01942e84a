/**
 * Gyrostat runs with wheel torques (invented Pyra-4 vehicle, dynamics-fixtures.ts).
 * Sources: with τ_ext = 0 the inertial total momentum R(q)(J⊥ω + G h) is constant whatever the
 * wheel torques (Euler's law; methods §6 reports 5e-16 drift over 20 s); friction between rotor
 * and body is internal, so it conserves momentum and only removes energy (power balance, see
 * body-gyrostat.test.ts). Independent integrator: `odex` 2.0.4, Hairer & Wanner's ODEX
 * (Gragg–Bulirsch–Stoer extrapolation), references §6, used at tolerance 1e-12.
 */
import { describe, expect, it } from 'vitest';
import { Solver } from 'odex';
import { gyrostatDerivative, kineticEnergy, totalMomentumInertial } from '../../app/engine/body/gyrostat';
import type { Gyrostat } from '../../app/engine/body/gyrostat';
import { simulateHybrid } from '../../app/engine/hybrid/index';
import type { HybridOptions, HybridSystem } from '../../app/engine/hybrid/index';
import { pyra4, pyra4InitialState, wheelDrivenFlow, zohWheelSystem } from './dynamics-fixtures';

const ZERO4 = new Float64Array(4);
const ZERO3 = new Float64Array(3);

/** Largest relative deviation of R·H from its initial value over every recorded step. */
function momentumDrift(
  g: Gyrostat,
  sys: HybridSystem,
  x0: Float64Array,
  opts: Partial<HybridOptions>,
): { drift: number; energies: number[] } {
  const H0 = totalMomentumInertial(new Float64Array(3), x0, g);
  const n0 = Math.hypot(H0[0]!, H0[1]!, H0[2]!);
  const H = new Float64Array(3);
  let drift = 0;
  const energies: number[] = [];
  const r = simulateHybrid(sys, x0, {
    tEnd: 600,
    integrator: { kind: 'dp54', rtol: 1e-12, atol: 1e-14 },
    record: {
      every: 'step',
      store: false,
      onRecord: (_t, _j, x) => {
        totalMomentumInertial(H, x, g);
        drift = Math.max(drift, Math.hypot(H[0]! - H0[0]!, H[1]! - H0[1]!, H[2]! - H0[2]!) / n0);
        energies.push(kineticEnergy(x, g));
      },
    },
    ...opts,
  } as HybridOptions);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  expect(r.value.outcome.status).toBe('completed');
  return { drift, energies };
}

describe('momentum conservation with arbitrary wheel torques (methods §6)', () => {
  it('different sinusoidal torque on each of 4 wheels, 600 s, DP54: |ΔH_I|/|H_I| ≤ 1e-10', () => {
    const g = pyra4();
    const { drift, energies } = momentumDrift(g, wheelDrivenFlow(g), pyra4InitialState(), {});
    expect(drift).toBeLessThan(1e-10);
    // the torques do work: the energy is NOT constant (so the check above is not vacuous)
    expect(Math.max(...energies) / Math.min(...energies)).toBeGreaterThan(1.01);
  });

  it('with viscous and Coulomb rotor friction and no motor torque: H conserved, energy never rises', () => {
    const g = pyra4({ viscousNmsPerRad: new Float64Array([2e-8, 3e-8, 1e-8, 4e-8]), coulombNm: 2e-6, coulombSmoothingRadPerS: 1 });
    const sys: HybridSystem = { dim: 11, flow: (_t, x, dx) => gyrostatDerivative(dx, x, g, ZERO4, ZERO3), jump: () => null };
    const x0 = pyra4InitialState();
    const { drift, energies } = momentumDrift(g, sys, x0, {});
    expect(drift).toBeLessThan(1e-10);
    for (let k = 1; k < energies.length; k++) expect(energies[k]).toBeLessThanOrEqual(energies[k - 1]! * (1 + 1e-12));
    expect(energies[energies.length - 1]).toBeLessThan(0.9 * energies[0]!);
  });

  it('10 Hz zero-order-hold torques, fixed-step RK4 at 2 steps per sample: |ΔH_I|/|H_I| ≤ 1e-10', () => {
    const g = pyra4();
    const x0 = new Float64Array(15);
    x0.set(pyra4InitialState());
    const { drift } = momentumDrift(g, zohWheelSystem(g, 0.1), x0, { integrator: { kind: 'rk4', dt: 0.05 } });
    expect(drift).toBeLessThan(1e-10);
  });
});

describe('DP54 against odex on the same 600 s wheel-driven run (references §6)', () => {
  it('every state agrees to ≤ 1e-8 at the end and at 60 s intervals', () => {
    const g = pyra4();
    const sys = wheelDrivenFlow(g);
    const x0 = pyra4InitialState();
    const ours = simulateHybrid(sys, x0, {
      tEnd: 600,
      integrator: { kind: 'dp54', rtol: 1e-12, atol: 1e-14 },
      record: { every: 'interval', dt: 60 },
    });
    expect(ours.ok).toBe(true);
    if (!ours.ok) return;
    const solver = new Solver(11);
    solver.absoluteTolerance = solver.relativeTolerance = 1e-12;
    solver.maxSteps = 1e6;
    solver.denseOutput = true;
    const xs = new Float64Array(11),
      dx = new Float64Array(11);
    const theirs: number[][] = [];
    const res = solver.solve(
      (t: number, y: number[]) => {
        for (let i = 0; i < 11; i++) xs[i] = y[i]!;
        sys.f(t, xs, dx);
        return Array.from(dx);
      },
      0,
      Array.from(x0),
      600,
      solver.grid(60, (_t: number, y: number[]) => {
        theirs.push(y.slice());
      }),
    );
    expect(res.outcome).toBe(0); // Converged
    expect(theirs.length).toBe(11);
    expect(ours.value.count).toBe(11);
    let worst = 0;
    for (let k = 0; k < 11; k++) {
      expect(ours.value.t[k]).toBeCloseTo(60 * k, 9);
      for (let i = 0; i < 11; i++) worst = Math.max(worst, Math.abs(ours.value.x[11 * k + i]! - theirs[k]![i]!));
    }
    for (let i = 0; i < 11; i++) worst = Math.max(worst, Math.abs(ours.value.finalState[i]! - res.y[i]!));
    // measured: about 1e-10 (states are O(1) quaternion, O(1e-2) rad/s, O(1e-3) N·m·s)
    expect(worst).toBeLessThan(1e-8);
  });
});
