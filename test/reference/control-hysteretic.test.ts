/**
 * Hysteretic hybrid quaternion feedback (Mayhew, Sanfelice & Teel, IEEE TAC 56(11):2555–2566,
 * 2011): the noise-free reproduction of their example 2 (data as reimplemented in Markley &
 * Crassidis, Fundamentals of Spacecraft Attitude Determination and Control, Springer 2014,
 * Ex. 7.7; jump time and end states derived for this project with RK4, dt = 1 ms), and the
 * unwinding of the continuous PD law (Bhat & Bernstein, Systems & Control Letters 39(1), 2000):
 * from rest at η = −0.99 (16.2° from the target) it turns 360° − 2·arccos(0.99) = 343.8° the long way.
 */
import { describe, expect, it } from 'vitest';
import { controllerFromSpec as makeController } from '../support/controller-spec';
import type { AttitudeController } from '../../app/engine/control/types';
import { initialState, inputAt, makeDerivative, makeInput, plantOf, REGULATION, rk4Step } from './control-rk4';

function build(spec: Record<string, unknown>, J: number[][]): AttitudeController {
  const r = makeController(spec, plantOf(J));
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

/** Ideal continuous mode with the logic checked at every 1 ms step; jump times by linear interpolation of the guard. */
function simulate(ctrl: AttitudeController, J: number[][], x0: Float64Array, tEnd: number, dt: number, logic0?: number) {
  let x = x0;
  const inp = makeInput();
  const logic = { logic: logic0 ?? ctrl.initialLogic(inputAt(inp, x, 0, REGULATION)) };
  const f = makeDerivative({ ctrl, plant: plantOf(J), J }, logic);
  const jumps: { t: number; from: number; to: number; why: string }[] = [];
  let travelled = 0;
  let gPrev = NaN;
  const steps = Math.round(tEnd / dt);
  for (let k = 0; k <= steps; k++) {
    const t = k * dt;
    inputAt(inp, x, t, REGULATION);
    const g = ctrl.jumpGuard(inp, logic.logic);
    if (g >= 0) {
      const r = ctrl.updateLogic(inp, logic.logic);
      if (r.why !== null) {
        const tj = k === 0 || !(gPrev < 0) ? t : t - dt * (g / (g - gPrev));
        jumps.push({ t: tj, from: logic.logic, to: r.logic, why: r.why });
        logic.logic = r.logic;
      }
    }
    gPrev = ctrl.jumpGuard(inp, logic.logic);
    if (k === steps) break;
    const xn = rk4Step(f, t, x, dt);
    // rotation travelled: ∫‖ω‖dt by the trapezoid rule
    travelled += 0.5 * dt * (Math.hypot(x[4]!, x[5]!, x[6]!) + Math.hypot(xn[4]!, xn[5]!, xn[6]!));
    x = xn;
  }
  return { x, jumps, travelledDeg: (travelled * 180) / Math.PI, logic: logic.logic };
}

describe('MST 2011 example 2 (noise free)', () => {
  const s14 = Math.sqrt(14);
  const v = [1 / s14, 2 / s14, 3 / s14];
  const J = [
    [10 * v[0]!, 0, 0],
    [0, 10 * v[1]!, 0],
    [0, 0, 10 * v[2]!],
  ];
  const r96 = Math.sqrt(0.96);
  const x0 = () => initialState([r96 * v[0]!, r96 * v[1]!, r96 * v[2]!, -0.2], [0.5 * v[0]!, 0.5 * v[1]!, 0.5 * v[2]!]);
  const spec = (delta: number) => ({ kind: 'hysteretic', gains: { kp: 1, kd: 1 }, hysteresis: delta, initialLogic: 1 });
  const cache = new Map<number, ReturnType<typeof simulate>>();
  const runDelta = (delta: number) => {
    if (!cache.has(delta)) cache.set(delta, simulate(build(spec(delta), J), J, x0(), 70, 1e-3));
    return cache.get(delta)!;
  };

  it('δ = 0.4: one jump near t = 1.141 s, then the short way to η = −1', () => {
    const r = runDelta(0.4);
    expect(r.jumps.length).toBe(1);
    expect(r.jumps[0]!.t).toBeGreaterThan(1.14);
    expect(r.jumps[0]!.t).toBeLessThan(1.142);
    expect(r.jumps[0]!.from).toBe(1);
    expect(r.jumps[0]!.to).toBe(-1);
    // After 70 s the lightly damped loop (decay k_d/2J ≈ 0.06 /s on the largest axis) is still a few
    // degrees from the target; the sign of η says which lift it converges to.
    expect(r.x[3]).toBeLessThan(-0.998);
  });

  it('δ = 2 (no jump possible: continuous PD): unwinds to η = +1', () => {
    const r = runDelta(2);
    expect(r.jumps.length).toBe(0);
    expect(r.x[3]).toBeGreaterThan(0.998);
  });

  it('δ = 0: immediate switch at t = 0, then η → −1', () => {
    const r = runDelta(0);
    expect(r.jumps.length).toBeGreaterThanOrEqual(1);
    expect(r.jumps[0]!.t).toBe(0);
    expect(r.jumps[0]!.to).toBe(-1);
    expect(r.x[3]).toBeLessThan(-0.998);
  });

  it('the hysteretic run turns less than the unwinding one', () => {
    const a = runDelta(0.4);
    const b = runDelta(2);
    expect(a.travelledDeg).toBeLessThan(b.travelledDeg);
  });
});

describe('unwinding of the continuous PD law (Bhat & Bernstein 2000)', () => {
  // Rest start at η = −0.99 about a principal axis, so the motion stays on that axis.
  const J = [
    [10, 0, 0],
    [0, 15, 0],
    [0, 0, 20],
  ];
  const s = Math.sqrt(1 - 0.99 * 0.99);
  const x0 = () => initialState([0, 0, s, -0.99], [0, 0, 0]);
  const expectedLong = 360 - (2 * Math.acos(0.99) * 180) / Math.PI; // 343.78°
  const expectedShort = (2 * Math.acos(0.99) * 180) / Math.PI; // 16.22°
  const gains = { omegaN: 0.3, zeta: 1.2 }; // over-damped near the target: no overshoot

  it('PD travels about 344° (the long way)', () => {
    const r = simulate(build({ kind: 'quaternion-pd', gains }, J), J, x0(), 150, 0.01);
    expect(expectedLong).toBeCloseTo(343.78, 2);
    expect(Math.abs(r.travelledDeg - expectedLong)).toBeLessThan(0.2);
    expect(r.x[3]).toBeGreaterThan(0.9999);
  });

  it('sign-switch and hysteretic laws take the short way (16.2°)', () => {
    for (const spec of [
      { kind: 'sign-switch', gains },
      { kind: 'hysteretic', gains, hysteresis: 0.2 },
    ]) {
      const r = simulate(build(spec, J), J, x0(), 150, 0.01);
      expect(Math.abs(r.travelledDeg - expectedShort)).toBeLessThan(0.2);
      expect(r.x[3]).toBeLessThan(-0.9999);
    }
  });
});
