/**
 * Eigenaxis quaternion feedback with per-axis rate saturation (Wie, Weiss & Arapostathis, JGCD
 * 12(3), 1989; Wie & Lu, JGCD 18(6), 1995). Check case of methods §2c (derived for this project and
 * re-derived here in closed form): J = diag(10, 15, 20) kg m², 90° about (1,2,2)/3, ω_n = 0.3 rad/s,
 * ζ = 0.9, ω_max = 0.05 rad/s ⇒ k = 2ω_n² = 0.18, c = 2ζω_n = 0.54, L = (c/k)ω_max ε̂ = (0.05, 0.1, 0.1),
 * peak |τ| = cJ_iiω_max|ε̂_i| = (0.09, 0.27, 0.36) N m, peak ‖ω‖ = 0.05, axis fixed, 38° left at 20 s.
 */
import { describe, expect, it } from 'vitest';
import { eigenaxisLimits } from '../../app/engine/control/index';
import { controllerFromSpec as makeController } from '../support/controller-spec';
import type { AttitudeController } from '../../app/engine/control/types';
import { qFromAxisAngle, qCreate } from '../../app/engine/math/rotation';
import { initialState, inputAt, makeDerivative, makeInput, plantOf, REGULATION, rk4Step } from './control-rk4';

const J = [
  [10, 0, 0],
  [0, 15, 0],
  [0, 0, 20],
];
const axis = [1 / 3, 2 / 3, 2 / 3];

function build(extra: Record<string, unknown> = {}): AttitudeController {
  const r = makeController({ kind: 'eigenaxis', gains: { omegaN: 0.3, zeta: 0.9 }, maxRateRadPerS: 0.05, ...extra }, plantOf(J));
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

function startQ(): number[] {
  return Array.from(qFromAxisAngle(qCreate(), axis, Math.PI / 2));
}

describe('eigenaxis law, methods §2c check case', () => {
  it('saturation limits from the initial error direction: L = (0.05, 0.1, 0.1)', () => {
    // L_i = (c/k) ω_max |ε_i(0)|/‖ε(0)‖ with c/k = 0.54/0.18 = 3 (hand computation from §2c).
    const L = eigenaxisLimits(new Float64Array(3), 0.18, 0.54, 0.05, [Math.SQRT1_2 / 3, (Math.SQRT1_2 * 2) / 3, (Math.SQRT1_2 * 2) / 3]);
    expect(L[0]).toBeCloseTo(0.05, 12);
    expect(L[1]).toBeCloseTo(0.1, 12);
    expect(L[2]).toBeCloseTo(0.1, 12);
    // The controller latches the same limits at the segment start.
    const ctrl = build() as AttitudeController & { segmentLimits(o: Float64Array): { limits: Float64Array; sign: number } };
    const inp = inputAt(makeInput(), initialState(startQ(), [0, 0, 0]), 0, REGULATION);
    ctrl.initialLogic(inp);
    const s = ctrl.segmentLimits(new Float64Array(3));
    expect(Array.from(s.limits).map((v) => +v.toFixed(12))).toEqual([0.05, 0.1, 0.1]);
    expect(s.sign).toBe(1);
  });

  it('initial torque is the peak −(0.09, 0.27, 0.36) N m', () => {
    const ctrl = build();
    const inp = inputAt(makeInput(), initialState(startQ(), [0, 0, 0]), 0, REGULATION);
    ctrl.initialLogic(inp);
    const tau = ctrl.torque(new Float64Array(3), inp, 0);
    // −J k L = −(10·0.18·0.05, 15·0.18·0.1, 20·0.18·0.1) (hand computation)
    expect(tau[0]).toBeCloseTo(-0.09, 12);
    expect(tau[1]).toBeCloseTo(-0.27, 12);
    expect(tau[2]).toBeCloseTo(-0.36, 12);
  });

  function run(h0: number[], extra: Record<string, unknown> = {}) {
    const ctrl = build(extra);
    const plant = plantOf(J);
    let x = initialState(startQ(), [0, 0, 0], h0);
    ctrl.initialLogic(inputAt(makeInput(), x, 0, REGULATION));
    const f = makeDerivative({ ctrl, plant, J }, { logic: 0 });
    const inp = makeInput();
    const tau = new Float64Array(3);
    let peakRate = 0,
      axisDev = 0,
      axisDev20 = 0,
      angleAt20 = NaN;
    const peakTau = [0, 0, 0];
    const dt = 0.01;
    const angle = () => 2 * Math.atan2(Math.hypot(x[0]!, x[1]!, x[2]!), Math.abs(x[3]!));
    // 60 s: the whole slew (saturation ends near 27 s, when sin(θ/2) falls to 0.15).
    for (let k = 0; k < 6000; k++) {
      if (k === 2000) {
        angleAt20 = angle();
        axisDev20 = axisDev;
      }
      inputAt(inp, x, k * dt, REGULATION);
      ctrl.torque(tau, inp, 0);
      for (let i = 0; i < 3; i++) peakTau[i] = Math.max(peakTau[i]!, Math.abs(tau[i]!));
      x = rk4Step(f, k * dt, x, dt);
      const w = [x[4]!, x[5]!, x[6]!];
      const nw = Math.hypot(...w);
      peakRate = Math.max(peakRate, nw);
      // deviation of ε and ω from the initial axis (sin of the angle between them)
      const e = [x[0]!, x[1]!, x[2]!];
      const ne = Math.hypot(...e);
      const cx = (a: number[]) =>
        Math.hypot(a[1]! * axis[2]! - a[2]! * axis[1]!, a[2]! * axis[0]! - a[0]! * axis[2]!, a[0]! * axis[1]! - a[1]! * axis[0]!);
      axisDev = Math.max(axisDev, cx(e) / ne, nw > 0 ? cx(w) / nw : 0);
    }
    return { peakRate, axisDev, axisDev20, peakTau, angleLeft: angleAt20, angleEnd: angle() };
  }

  it('closed loop (RK4, dt = 0.01 s): peak rate 0.050000, fixed axis, 38° left at 20 s', () => {
    const r = run([0, 0, 0]);
    expect(r.peakRate).toBeLessThanOrEqual(0.05);
    expect(r.peakRate).toBeCloseTo(0.05, 6);
    expect(r.axisDev20).toBeLessThan(1e-12);
    // Later the error itself shrinks to ~1e-5, so the relative roundoff of its direction grows.
    expect(r.axisDev).toBeLessThan(1e-10);
    expect(r.peakTau[0]).toBeCloseTo(0.09, 9);
    expect(r.peakTau[1]).toBeCloseTo(0.27, 9);
    expect(r.peakTau[2]).toBeCloseTo(0.36, 9);
    // Closed form while saturated (derived: ω̇ = −c(ω + ω_max ε̂) from rest ⇒ ‖ω‖ = ω_max(1 − e^{−ct}),
    // θ(t) = θ0 − ω_max(t − (1 − e^{−ct})/c); saturation holds while sin(θ/2) > (c/k)ω_max = 0.15).
    const c = 0.54;
    const closed = Math.PI / 2 - 0.05 * (20 - (1 - Math.exp(-c * 20)) / c);
    expect(r.angleLeft).toBeCloseTo(closed, 8);
    expect((r.angleLeft * 180) / Math.PI).toBeCloseTo(38, 0);
    expect(r.angleEnd).toBeLessThan(1e-3);
  });

  it('keeps the eigenaxis with stored wheel momentum (cancels ω × (Jω + Gh))', () => {
    const r = run([0.3, -0.2, 0.5]);
    expect(r.axisDev20).toBeLessThan(1e-12);
    expect(r.axisDev).toBeLessThan(1e-10);
    expect(r.peakRate).toBeCloseTo(0.05, 6);
  });

  it('direction-preserving torque limit scales the whole vector', () => {
    const ctrl = build({ torqueLimitNm: 0.18 });
    const inp = inputAt(makeInput(), initialState(startQ(), [0, 0, 0]), 0, REGULATION);
    ctrl.initialLogic(inp);
    const tau = ctrl.torque(new Float64Array(3), inp, 0);
    // unlimited −(0.09, 0.27, 0.36); largest ratio 0.36/0.18 ⇒ scale ½ (common practice, no source)
    expect(Array.from(tau).map((v) => +v.toFixed(12))).toEqual([-0.045, -0.135, -0.18]);
  });

  it('warns when the rest-start peak torque can exceed the limit', () => {
    const r = makeController(
      { kind: 'eigenaxis', gains: { omegaN: 0.3, zeta: 0.9 }, maxRateRadPerS: 0.05, torqueLimitNm: 0.2 },
      plantOf(J),
    );
    expect(r.ok).toBe(true);
    expect(r.warnings.map((w) => w.rule)).toContain('torque-margin');
  });
});
