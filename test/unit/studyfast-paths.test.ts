/**
 * Fast paths of the study's closed loop (issue 12, study part), each checked bit for bit against
 * the general path it replaces over many random inputs:
 *  - HeldGyrostatRk4 without bearing friction (sim/heldRk4.ts stepFrictionless, the stages in
 *    local variables) against the general rk4Step (hybrid/rk4.ts) over gyrostatDerivative
 *    (body/gyrostat.ts) with the wheel torques held and no external torque: 0–6 wheels on random
 *    axes, random inertia, torques including ±0, steps of many sizes, and states holding
 *    non-finite values (the same bits written and the same finite/non-finite answer).
 */
import { describe, expect, it } from 'vitest';
import { gyrostatDerivative, makeGyrostat, type Gyrostat } from '../../app/engine/body/gyrostat';
import { makeRk4Work, rk4Step } from '../../app/engine/hybrid/rk4';
import type { FlowFn } from '../../app/engine/hybrid/types';
import { makeRng, type Rng } from '../../app/engine/math/prng';
import { HeldGyrostatRk4 } from '../../app/engine/sim/heldRk4';

function randomGyrostat(rng: Rng, n: number): Gyrostat {
  for (;;) {
    const axes = new Float64Array(3 * n);
    for (let i = 0; i < n; i++) {
      const x = rng.normal(),
        y = rng.normal(),
        z = rng.normal();
      const r = Math.hypot(x, y, z);
      axes[3 * i] = x / r;
      axes[3 * i + 1] = y / r;
      axes[3 * i + 2] = z / r;
    }
    const js = Float64Array.from({ length: n }, () => 1e-5 * (0.5 + rng.next()));
    const d = [0.05 + 0.2 * rng.next(), 0.05 + 0.2 * rng.next(), 0.05 + 0.2 * rng.next()];
    const o = () => 0.01 * rng.normal();
    const a = o(),
      b = o(),
      c = o();
    const J = new Float64Array([d[0]!, a, b, a, d[1]!, c, b, c, d[2]!]);
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
