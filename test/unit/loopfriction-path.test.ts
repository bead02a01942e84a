/**
 * The closed loop's RK4 step with bearing friction, its stages in local variables
 * (sim/heldRk4Friction.ts, reached through HeldGyrostatRk4.step when the gyrostat's friction is
 * active), checked bit for bit against the general rk4Step (hybrid/rk4.ts) over
 * gyrostatDerivative (body/gyrostat.ts) with the wheel torques held and no external torque:
 * 0–6 wheels on random axes, random inertia and rotor inertia, random viscous and Coulomb
 * coefficients (some wheels with none, smoothing speeds from tiny to large), torques and momenta
 * including ±0, steps of many sizes, and states holding NaN, ±∞ or values that overflow within
 * the step (the same bits written and the same finite/non-finite answer).
 */
import { describe, expect, it } from 'vitest';
import { gyrostatDerivative, makeGyrostat, type Gyrostat } from '../../app/engine/body/gyrostat';
import { makeRk4Work, rk4Step } from '../../app/engine/hybrid/rk4';
import type { FlowFn } from '../../app/engine/hybrid/types';
import { makeRng, type Rng } from '../../app/engine/math/prng';
import { HeldGyrostatRk4 } from '../../app/engine/sim/heldRk4';
import { heldRk4FrictionStep } from '../../app/engine/sim/heldRk4Friction';
import { randomMassProperties } from './gyrostat-fixtures';

function randomFrictionGyrostat(rng: Rng, n: number, trial: number): Gyrostat {
  for (;;) {
    const { J, axes, js } = randomMassProperties(rng, n);
    // some wheels without viscous or without Coulomb friction; at least one coefficient > 0
    const visc = Float64Array.from({ length: n }, (_, i) => ((i + trial) % 3 === 0 ? 0 : 1e-6 * rng.next()));
    const coul = Float64Array.from({ length: n }, (_, i) => ((i + trial) % 4 === 1 ? 0 : 1e-4 * rng.next()));
    if (n > 0) coul[0] = 2e-4;
    const smoothing = [1e-3, 0.5, 3, 40][trial % 4]! * (0.5 + rng.next());
    const r = makeGyrostat(
      J,
      { n, axes, rotorInertiaKgm2: js },
      { viscousNmsPerRad: visc, coulombNm: coul, coulombSmoothingRadPerS: smoothing },
    );
    if (r.ok) return r.value;
  }
}

describe('HeldGyrostatRk4 with bearing friction (stages in locals)', () => {
  it('same bits and the same finite answer as rk4Step over gyrostatDerivative, 0–6 wheels, random everything', () => {
    const rng = makeRng(20261204, 12);
    let compared = 0;
    for (let trial = 0; trial < 70; trial++) {
      const n = trial % 7;
      const g = randomFrictionGyrostat(rng, n, trial);
      expect(g.friction.active).toBe(n > 0);
      const dim = 7 + n;
      const tau = new Float64Array(n);
      const zero3 = new Float64Array(3);
      const flow: FlowFn = (_t, x, dx) => gyrostatDerivative(dx, x, g, tau, zero3);
      const work = makeRk4Work(dim);
      const held = new HeldGyrostatRk4(g);
      const kw = new Float64Array(4 * n),
        hSlot = new Float64Array(1);
      const x = new Float64Array(dim),
        a = new Float64Array(dim),
        b = new Float64Array(dim),
        c = new Float64Array(dim);
      for (let k = 0; k < 200; k++) {
        for (let i = 0; i < 4; i++) x[i] = rng.normal();
        for (let i = 4; i < 7; i++) x[i] = (k % 3 === 0 ? 2 : 0.05) * rng.normal();
        // wheel momenta: rotor speeds h/J_s around the smoothing speed, far above it, or ±0
        for (let i = 7; i < dim; i++) x[i] = k % 11 === 0 ? -0 : (k % 2 ? 5e-2 : 1e-5) * rng.normal();
        for (let i = 0; i < n; i++) tau[i] = k % 7 === 0 ? (k % 2 ? -0 : 0) : 4e-3 * rng.normal();
        if (k % 13 === 0) x[4 + (k % 3)] = -0;
        if (k % 37 === 5) x[k % dim] = k % 2 ? NaN : Infinity;
        if (k % 43 === 8) x[k % dim] = -Infinity;
        if (k % 41 === 7) x[4] = 1e160; // overflows within the step
        const h = k % 5 === 0 ? 0.2 : (0.1 / (1 + (k % 4))) * (0.5 + rng.next());
        rk4Step(a, flow, 0, x, h, work);
        let finite = true;
        for (let i = 0; i < dim; i++) if (!Number.isFinite(a[i]!)) finite = false;
        held.hold(tau);
        expect(held.step(b, x, h)).toBe(finite);
        hSlot[0] = h;
        expect(heldRk4FrictionStep(c, x, g, tau, kw, hSlot)).toBe(finite);
        for (let i = 0; i < dim; i++) {
          if (!Object.is(a[i]!, b[i]!)) expect([trial, k, i, b[i]]).toEqual([trial, k, i, a[i]]);
          if (!Object.is(a[i]!, c[i]!)) expect([trial, k, i, c[i]]).toEqual([trial, k, i, a[i]]);
        }
        compared++;
      }
    }
    expect(compared).toBe(14_000);
  });
});
