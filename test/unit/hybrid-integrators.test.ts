/**
 * The plain integrators. Sources:
 * - RK4 applied to y' = λy reproduces the degree-4 Taylor polynomial of e^z, z = hλ (its
 *   stability function; Hairer, Nørsett & Wanner, Solving ODEs I, §II.1 and IV.2 of vol. II).
 * - DOPRI5's stability function is Σ_{k≤5} z^k/k! + z⁶/600 (HNW II §IV.2 [from memory]); the
 *   propagated fifth-order solution must reproduce it exactly for one step.
 * - Convergence orders: global error O(h⁴) for RK4; local error of the DOPRI5 continuous extension
 *   O(h⁵) (4th order, HNW I §II.6); cubic Hermite interpolation is exact for cubics (standard).
 * - Closed forms: harmonic oscillator sin t; y' = −2ty → e^(−t²); y' = y² → 1/(1 − t) blows up at t = 1.
 */
import { describe, expect, it } from 'vitest';
import {
  DormandPrince,
  Rk4Stepper,
  STEP_OK,
  equalStepCount,
  hermiteInterpolate,
  makeDormandPrince,
  makeRk4Work,
  rk4Step,
  STEP_NON_FINITE,
  STEP_UNDERFLOW,
} from '../../app/engine/hybrid/index';
import type { FlowFn } from '../../app/engine/hybrid/index';

const linear =
  (lam: number): FlowFn =>
  (_t, x, d) => {
    d[0] = lam * x[0]!;
  };
const harmonic: FlowFn = (_t, x, d) => {
  d[0] = x[1]!;
  d[1] = -x[0]!;
};

describe('rk4Step', () => {
  it('one step on y′ = λy is the degree-4 Taylor polynomial of e^(hλ)', () => {
    for (const z of [0.3, -1.2, 2]) {
      const out = rk4Step(new Float64Array(1), linear(z), 0, new Float64Array([1]), 1, makeRk4Work(1));
      expect(out[0]).toBeCloseTo(1 + z + (z * z) / 2 + z ** 3 / 6 + z ** 4 / 24, 15);
    }
  });

  it('global error is fourth order on the harmonic oscillator', () => {
    const errAt = (h: number): number => {
      const s = new Rk4Stepper(2, harmonic, h);
      s.reset(0, [0, 1]);
      while (s.t < 10) s.advance(10);
      return Math.abs(s.x[0]! - Math.sin(10));
    };
    const ratio = errAt(0.1) / errAt(0.05);
    expect(ratio).toBeGreaterThan(15);
    expect(ratio).toBeLessThan(17);
  });

  it('equal steps land exactly on the stop: 0.3/0.1 takes 3 steps, 0.25/0.1 takes 3 of 1/12', () => {
    expect(equalStepCount(0.30000000000000004, 0.1)).toBe(3);
    expect(equalStepCount(0.1, 0.1)).toBe(1);
    expect(equalStepCount(0.25, 0.1)).toBe(3);
    const s = new Rk4Stepper(1, linear(1), 0.1);
    s.reset(0, [1]);
    let n = 0;
    while (s.t < 0.25) {
      s.advance(0.25);
      n++;
    }
    expect(n).toBe(3);
    expect(s.t).toBe(0.25);
  });

  it('fast path runTo equals step-by-step advance and counts 4 evaluations per step', () => {
    const a = new Rk4Stepper(2, harmonic, 0.01);
    const b = new Rk4Stepper(2, harmonic, 0.01);
    a.reset(0, [0, 1]);
    b.reset(0, [0, 1]);
    const r = a.runTo(1.234, 1e9);
    while (b.t < 1.234) b.advance(1.234);
    expect(r.steps).toBe(124);
    expect(a.t).toBe(1.234);
    // same steps up to rounding of the step length (runTo keeps h fixed, advance recomputes it)
    for (let i = 0; i < 2; i++) expect(a.x[i]).toBeCloseTo(b.x[i]!, 14);
    expect(a.evaluations).toBe(4 * 124);
  });

  it('runTo stops at the last finite state when the flow blows up (y′ = y², y(0) = 1)', () => {
    const s = new Rk4Stepper(
      1,
      (_t, x, d) => {
        d[0] = x[0]! * x[0]!;
      },
      0.01,
    );
    s.reset(0, [1]);
    const r = s.runTo(2, 1e9);
    expect(r.status).toBe(STEP_NON_FINITE);
    expect(Number.isFinite(s.x[0])).toBe(true);
    expect(s.t).toBeLessThan(2);
    expect(s.t).toBeGreaterThan(0.9);
  });
});

describe('hermiteInterpolate', () => {
  it('is exact for a cubic', () => {
    const p = (t: number) => 2 - t + 3 * t * t - 0.5 * t ** 3;
    const dp = (t: number) => -1 + 6 * t - 1.5 * t * t;
    const out = new Float64Array(1);
    for (const th of [0, 0.3, 0.77, 1]) {
      hermiteInterpolate(out, th, 2, [p(1)], [dp(1)], [p(3)], [dp(3)]);
      expect(out[0]).toBeCloseTo(p(1 + 2 * th), 13);
    }
  });
});

describe('DormandPrince', () => {
  it('one step on y′ = λy is Σ z^k/k! (k ≤ 5) + z⁶/600, with 1 + 6 evaluations (FSAL)', () => {
    for (const z of [0.5, 0.1, -0.7, -2]) {
      const s = new DormandPrince(1, linear(Math.sign(z)), { rtol: 0.5, atol: 100, hInit: Math.abs(z) });
      s.reset(0, [1]);
      expect(s.advance(Math.abs(z))).toBe(STEP_OK);
      const R = 1 + z + (z * z) / 2 + z ** 3 / 6 + z ** 4 / 24 + z ** 5 / 120 + z ** 6 / 600;
      expect(Math.abs(s.x[0]! - R)).toBeLessThan(1e-14 * Math.abs(R));
      expect(s.evaluations).toBe(7);
      // a second step reuses the last stage
      s.advance(2 * Math.abs(z));
      expect(s.evaluations).toBe(13);
    }
  });

  it('dense output is fourth order: halving h divides the interior error by about 32', () => {
    const interiorErr = (h: number): number => {
      const s = new DormandPrince(2, harmonic, { rtol: 0.5, atol: 1, hInit: h, hMax: h });
      s.reset(0, [0, 1]);
      s.advance(h);
      const out = new Float64Array(2);
      let e = 0;
      for (let k = 1; k < 10; k++) e = Math.max(e, Math.abs(s.dense(out, (h * k) / 10)[0]! - Math.sin((h * k) / 10)));
      return e;
    };
    const r = interiorErr(0.2) / interiorErr(0.1);
    expect(r).toBeGreaterThan(28);
    expect(r).toBeLessThan(36);
  });

  it('dense output matches the step ends and is continuous across truncation', () => {
    const s = new DormandPrince(2, harmonic, { rtol: 1e-8, atol: 1e-10 });
    s.reset(0, [0, 1]);
    s.advance(5);
    const out = new Float64Array(2);
    expect(s.dense(out, s.tOld)[0]).toBeCloseTo(s.xOld[0]!, 15);
    expect(s.dense(out, s.t)[0]).toBeCloseTo(s.x[0]!, 15);
    const tm = 0.5 * (s.tOld + s.t);
    const xm = s.dense(new Float64Array(2), tm);
    s.truncate(tm);
    expect(s.t).toBe(tm);
    expect(Array.from(s.x)).toEqual(Array.from(xm));
  });

  it('meets its tolerance on closed forms (harmonic to t = 20, Gaussian y′ = −2ty)', () => {
    for (const tol of [1e-6, 1e-9, 1e-12]) {
      const s = new DormandPrince(2, harmonic, { rtol: tol, atol: tol });
      s.reset(0, [0, 1]);
      expect(s.integrateTo(20)).toBe(STEP_OK);
      expect(s.t).toBe(20);
      // global error accumulates over ~3 periods: allow 100× the local tolerance
      expect(Math.abs(s.x[0]! - Math.sin(20))).toBeLessThan(100 * tol);
      const gsn = new DormandPrince(
        1,
        (t, x, d) => {
          d[0] = -2 * t * x[0]!;
        },
        { rtol: tol, atol: tol * 1e-3 },
      );
      gsn.reset(0, [1]);
      gsn.integrateTo(2);
      expect(Math.abs(gsn.x[0]! - Math.exp(-4))).toBeLessThan(100 * tol * Math.exp(-4) + 1e-3 * tol);
    }
  });

  it('y′ = y² (blow-up at t = 1) ends in underflow or non-finite at t ≈ 1, state finite', () => {
    const s = new DormandPrince(
      1,
      (_t, x, d) => {
        d[0] = x[0]! * x[0]!;
      },
      { rtol: 1e-8, atol: 1e-8 },
    );
    s.reset(0, [1]);
    const st = s.integrateTo(2);
    expect([STEP_UNDERFLOW, STEP_NON_FINITE]).toContain(st);
    expect(s.t).toBeGreaterThan(0.999);
    expect(s.t).toBeLessThan(1 + 1e-6);
    expect(Number.isFinite(s.x[0])).toBe(true);
  });

  it('makeDormandPrince reports every bad option with its path', () => {
    const r = makeDormandPrince(2, harmonic, { rtol: 0, atol: [-1, 0, 1] as unknown as number, hMin: 1, hMax: 0.5, hInit: -1 });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors.map((e) => `${e.path}:${e.rule}`)).toEqual([
      'integrator.rtol:range',
      'integrator.atol:shape',
      'integrator.atol[0]:non-negative',
      'integrator.hInit:positive',
      'integrator.hMin:order',
      'integrator.hInit:order',
    ]);
  });
});
