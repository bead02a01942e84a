/**
 * Torque-free rigid body through the gyrostat flow with no wheels, integrated by our simulator.
 * Sources (references.md §4): Euler's equations and their invariants 2T = Σ I_i ω_i²,
 * H² = Σ (I_i ω_i)² (standard); the axisymmetric closed form ω1 + iω2 = ω⊥ e^{iΩt},
 * Ω = (I3 − I1)ω3/I1; the Jacobi elliptic solution ω = (a cn, b sn, c dn)(λt | m) (Landau &
 * Lifshitz, Mechanics, §37 [from memory]) evaluated with @stdlib/math-base-special-ellipj and
 * -ellipk (independent npm references); the intermediate-axis growth ω1(t) = ω1(0) cosh(λt),
 * λ = ω_s √((I2 − I1)(I3 − I2)/(I1 I3)) (linearised Euler equations, standard).
 */
import { describe, expect, it } from 'vitest';
import ellipj from '@stdlib/math-base-special-ellipj';
import ellipk from '@stdlib/math-base-special-ellipk';
import { kineticEnergy, totalMomentumBody, totalMomentumInertial } from '../../app/engine/body/gyrostat';
import { simulateHybrid } from '../../app/engine/hybrid/index';
import type { HybridArc, HybridOptions } from '../../app/engine/hybrid/index';
import { rigidBody, wheelDrivenFlow } from './dynamics-fixtures';

/** What the reference library's ellipj returns: [sn, cn, dn, am]. */
type SnCnDnAm = [number, number, number, number];

function run(I: [number, number, number], w0: number[], opts: Partial<HybridOptions>): HybridArc {
  const g = rigidBody(...I);
  const x0 = new Float64Array([0, 0, 0, 1, w0[0]!, w0[1]!, w0[2]!]);
  const r = simulateHybrid(wheelDrivenFlow(g), x0, {
    tEnd: 1,
    integrator: { kind: 'dp54', rtol: 1e-12, atol: 1e-14 },
    ...opts,
  } as HybridOptions);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  expect(r.value.outcome.status).toBe('completed');
  return r.value;
}

function omegaAt(arc: HybridArc, k: number): number[] {
  return [arc.x[7 * k + 4]!, arc.x[7 * k + 5]!, arc.x[7 * k + 6]!];
}

describe('axisymmetric body, I = (0.1, 0.1, 0.2), ω0 = (0.1, 0, 0.5) (references §4)', () => {
  const omegaClosed = (t: number) => [0.1 * Math.cos(0.5 * t), 0.1 * Math.sin(0.5 * t), 0.5];

  for (const integrator of [
    { kind: 'dp54', rtol: 1e-12, atol: 1e-14 },
    { kind: 'rk4', dt: 0.01 },
  ] as const) {
    it(`${integrator.kind}: ω(2 s) = (0.0540302, 0.0841471, 0.5) and the closed form over 20 s`, () => {
      const arc = run([0.1, 0.1, 0.2], [0.1, 0, 0.5], { tEnd: 20, integrator, record: { every: 'interval', dt: 0.5 } });
      // point k is t = 0.5 k (the start is point 0)
      expect(arc.t[4]).toBe(2);
      const w2 = omegaAt(arc, 4);
      expect(w2[0]).toBeCloseTo(0.0540302, 7);
      expect(w2[1]).toBeCloseTo(0.0841471, 7);
      expect(w2[2]).toBeCloseTo(0.5, 12);
      let err = 0;
      for (let k = 0; k < arc.count; k++) {
        const c = omegaClosed(arc.t[k]!);
        const w = omegaAt(arc, k);
        for (let i = 0; i < 3; i++) err = Math.max(err, Math.abs(w[i]! - c[i]!));
      }
      expect(arc.t[arc.count - 1]).toBe(20);
      expect(err).toBeLessThan(1e-10);
    });
  }
});

describe('asymmetric body, case A: I = (0.10, 0.15, 0.20), ω0 = (0.3, 0, 0.4) (references §4)', () => {
  const I = [0.1, 0.15, 0.2];
  const w0 = [0.3, 0, 0.4];
  const twoT = I[0]! * w0[0]! ** 2 + I[2]! * w0[2]! ** 2;
  const H2 = (I[0]! * w0[0]!) ** 2 + (I[2]! * w0[2]!) ** 2;
  const a = Math.sqrt((twoT * I[2]! - H2) / (I[0]! * (I[2]! - I[0]!)));
  const b = Math.sqrt((twoT * I[2]! - H2) / (I[1]! * (I[2]! - I[1]!)));
  const c = Math.sqrt((H2 - twoT * I[0]!) / (I[2]! * (I[2]! - I[0]!)));
  const lam = Math.sqrt(((I[2]! - I[1]!) * (H2 - twoT * I[0]!)) / (I[0]! * I[1]! * I[2]!));
  const m = ((I[1]! - I[0]!) * (twoT * I[2]! - H2)) / ((I[2]! - I[1]!) * (H2 - twoT * I[0]!));
  const K = ellipk(m);
  const period = (4 * K) / lam;
  const closed = (t: number) => {
    const [sn, cn, dn] = ellipj(lam * t, m) as SnCnDnAm;
    return [a * cn, b * sn, c * dn];
  };

  it('parameters match the published check values', () => {
    expect(twoT).toBeCloseTo(0.041, 15);
    expect(H2).toBeCloseTo(0.0073, 15);
    expect(m).toBeCloseTo(0.28125, 14);
    expect(lam).toBeCloseTo(0.2309401, 7);
    expect([a, b, c].map((v) => Number(v.toFixed(7)))).toEqual([0.3, 0.3464102, 0.4]);
    expect(K).toBeCloseTo(1.7030832, 7);
    expect(period).toBeCloseTo(29.498267, 6);
    // the reference library's argument order: ellipj(u, m) → [sn, cn, dn, am]; sn² + cn² = 1
    const [sn, cn] = ellipj(0.3, 0.5) as SnCnDnAm;
    expect(sn).toBeCloseTo(0.2934127, 7);
    expect(sn * sn + cn * cn).toBeCloseTo(1, 15);
  });

  it('DP54 follows (a cn, b sn, c dn)(λt | m) to ≤ 1e-9 over one period, and returns to ω0', () => {
    const arc = run([0.1, 0.15, 0.2], w0, { tEnd: period, record: { every: 'interval', dt: period / 200 } });
    let err = 0;
    for (let k = 0; k < arc.count; k++) {
      const cf = closed(arc.t[k]!);
      const w = omegaAt(arc, k);
      for (let i = 0; i < 3; i++) err = Math.max(err, Math.abs(w[i]! - cf[i]!));
    }
    expect(arc.count).toBeGreaterThanOrEqual(200);
    expect(err).toBeLessThan(1e-9);
    const wEnd = Array.from(arc.finalState.subarray(4, 7));
    for (let i = 0; i < 3; i++) expect(Math.abs(wEnd[i]! - w0[i]!)).toBeLessThan(1e-9);
  });

  it('ω(5) and ω(10) equal the printed check values (10 decimals)', () => {
    const arc = run([0.1, 0.15, 0.2], w0, { tEnd: 10, record: { every: 'interval', dt: 5 } });
    expect(arc.t[1]).toBe(5);
    const p5 = [0.1361899459, 0.3086579523, 0.3525249646];
    const p10 = [-0.1497057001, 0.3001959435, 0.355254695];
    for (let i = 0; i < 3; i++) {
      expect(Math.abs(omegaAt(arc, 1)[i]! - p5[i]!)).toBeLessThan(2e-10);
      expect(Math.abs(omegaAt(arc, 2)[i]! - p10[i]!)).toBeLessThan(2e-10);
    }
  });

  it('energy, |H| and the inertial H drift ≤ 1e-9 (relative) over 1e4 s with DP54', () => {
    const g = rigidBody(0.1, 0.15, 0.2);
    const x0 = new Float64Array([0, 0, 0, 1, 0.3, 0, 0.4]);
    const r = simulateHybrid(wheelDrivenFlow(g), x0, {
      tEnd: 1e4,
      integrator: { kind: 'dp54', rtol: 1e-12, atol: 1e-14 },
      record: 'none',
    });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const xe = r.value.finalState;
    expect(r.value.outcome).toMatchObject({ status: 'completed', t: 1e4 });
    const dT = Math.abs(kineticEnergy(xe, g) / kineticEnergy(x0, g) - 1);
    const Hb0 = totalMomentumBody(new Float64Array(3), x0, g),
      Hb1 = totalMomentumBody(new Float64Array(3), xe, g);
    const dHabs = Math.abs(Math.hypot(Hb1[0]!, Hb1[1]!, Hb1[2]!) / Math.hypot(Hb0[0]!, Hb0[1]!, Hb0[2]!) - 1);
    const Hi0 = totalMomentumInertial(new Float64Array(3), x0, g),
      Hi1 = totalMomentumInertial(new Float64Array(3), xe, g);
    const dHvec = Math.hypot(Hi1[0]! - Hi0[0]!, Hi1[1]! - Hi0[1]!, Hi1[2]! - Hi0[2]!) / Math.hypot(Hi0[0]!, Hi0[1]!, Hi0[2]!);
    // measured: about 3e-11, 1.2e-11 and 2e-11
    expect(dT).toBeLessThan(1e-9);
    expect(dHabs).toBeLessThan(1e-9);
    expect(dHvec).toBeLessThan(1e-9);
  });
});

describe('intermediate-axis instability, I = (0.10, 0.15, 0.20), ω_s = 0.5 about axis 2 (references §4)', () => {
  it('ω1(20 s)/ω1(0) = cosh(20λ) = 17.1712, λ = 0.1767767 s⁻¹', () => {
    const lam = 0.5 * Math.sqrt((0.05 * 0.05) / (0.1 * 0.2));
    expect(lam).toBeCloseTo(0.1767767, 7);
    expect(Math.cosh(20 * lam)).toBeCloseTo(17.1712, 4);
    const arc = run([0.1, 0.15, 0.2], [1e-6, 0.5, 0], { tEnd: 20, integrator: { kind: 'dp54', rtol: 1e-12, atol: 1e-18 }, record: 'none' });
    const ratio = arc.finalState[4]! / 1e-6;
    // the linearisation neglects terms of relative size (ω1/ω_s)² ≈ 1e-9
    expect(Math.abs(ratio / Math.cosh(20 * lam) - 1)).toBeLessThan(1e-6);
    expect(ratio).toBeCloseTo(17.1712, 3);
  });

  it('about the major and minor axes perturbations stay small (oscillate)', () => {
    for (const w0 of [
      [1e-6, 0, 0.5],
      [0.5, 1e-6, 0],
    ]) {
      let peak = 0;
      run([0.1, 0.15, 0.2], w0, {
        tEnd: 100,
        record: {
          every: 'step',
          onRecord: (_t, _j, x) => {
            peak = Math.max(peak, Math.abs(x[5]!), Math.abs(w0[2] === 0.5 ? x[4]! : x[6]!));
          },
        },
      });
      expect(peak).toBeLessThan(1e-5);
    }
  });
});
