/**
 * Gyrostat dynamics (methods §6): construction checks, the equations against Euler's equations
 * for a rigid body (references §4, standard), the kinematics against the npm `quaternion`
 * package, and algebraic identities at random states: Ḣ + ω × H = τ_ext (Euler's law for the
 * total momentum) and the power balance dT/dt = Σ τ_i Ω_i + ωᵀτ_ext (derived by hand from
 * T = ½ωᵀJ⊥ω + Σ h_i²/(2J_s,i); friction torques enter the sum and dissipate).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import Quaternion from 'quaternion';
import {
  gyrostatDerivative,
  kineticEnergy,
  makeGyrostat,
  totalMomentumBody,
  totalMomentumInertial,
  wheelMomentumFromRelativeSpeed,
  wheelRelativeSpeed,
} from '../../app/engine/body/gyrostat';
import type { Gyrostat, WheelGeometry } from '../../app/engine/body/gyrostat';
import { m3Diag, m3FromRows } from '../../app/engine/math/mat3';
import { makeRng } from '../../app/engine/math/prng';
import { qRandomUniform } from '../../app/engine/math/rotation';
import type { Issue } from '../../app/engine/errors';

/** Pyramid with sin β = 1/√3 (methods §6): g_i = (cosβ cosφ_i, cosβ sinφ_i, sinβ). */
function pyramid(js: number[]): WheelGeometry {
  const sb = 1 / Math.sqrt(3),
    cb = Math.sqrt(2 / 3);
  const axes = new Float64Array(12);
  for (let i = 0; i < 4; i++) {
    const phi = (i * Math.PI) / 2;
    axes[3 * i] = cb * Math.cos(phi);
    axes[3 * i + 1] = cb * Math.sin(phi);
    axes[3 * i + 2] = sb;
  }
  return { n: 4, axes, rotorInertiaKgm2: new Float64Array(js) };
}

const J6 = m3FromRows([
  [0.11, 0.002, -0.001],
  [0.002, 0.12, 0.0015],
  [-0.001, 0.0015, 0.08],
]);

function mk(J = J6, w = pyramid([2e-5, 2.5e-5, 3e-5, 3.5e-5]), fr?: Parameters<typeof makeGyrostat>[2]): Gyrostat {
  const r = makeGyrostat(J, w, fr);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

function errs(J: Float64Array, w: WheelGeometry, fr?: Parameters<typeof makeGyrostat>[2]): Issue[] {
  const r = makeGyrostat(J, w, fr);
  if (r.ok) throw new Error('expected errors');
  return r.errors;
}

describe('makeGyrostat', () => {
  it('J⊥ for the pyramid with equal rotors is J − (4/3) J_s I (Σ g gᵀ = diag(2cos²β, 2cos²β, 4sin²β), by hand)', () => {
    const g = mk(J6, pyramid([1e-4, 1e-4, 1e-4, 1e-4]));
    for (let k = 0; k < 9; k++) {
      const expected = J6[k]! - (k % 4 === 0 ? (4 / 3) * 1e-4 : 0);
      expect(g.Jperp[k]).toBeCloseTo(expected, 16);
    }
    // J⊥ J⊥⁻¹ = I
    for (let r = 0; r < 3; r++)
      for (let c = 0; c < 3; c++) {
        let s = 0;
        for (let k = 0; k < 3; k++) s += g.Jperp[3 * k + r]! * g.JperpInv[3 * c + k]!;
        expect(s).toBeCloseTo(r === c ? 1 : 0, 12);
      }
    expect(g.dim).toBe(11);
  });

  it('rejects J⊥ not positive definite, naming rule and path', () => {
    const one: WheelGeometry = { n: 1, axes: new Float64Array([0, 0, 1]), rotorInertiaKgm2: new Float64Array([0.02]) };
    const e = errs(m3Diag(0.01, 0.01, 0.015), one);
    expect(e).toEqual([expect.objectContaining({ path: 'wheels.rotorInertiaKgm2', rule: 'transverse-inertia-positive-definite' })]);
    expect(e[0]!.message).toContain('-0.005');
  });

  it('reports every bad wheel and friction field together', () => {
    const w: WheelGeometry = {
      n: 3,
      axes: new Float64Array([1, 0, 0, 0, 1, 0, 0, 0.5, 0.5]),
      rotorInertiaKgm2: new Float64Array([1e-5, -1, NaN]),
    };
    const e = errs(J6, w, { viscousNmsPerRad: new Float64Array([0, -1, 0]), coulombNm: Infinity, coulombSmoothingRadPerS: 0 });
    expect(e.map((i) => `${i.path}:${i.rule}`)).toEqual([
      'wheels.axes[2]:unit-norm',
      'wheels.rotorInertiaKgm2[1]:positive',
      'wheels.rotorInertiaKgm2[2]:positive',
      'friction.viscousNmsPerRad[1]:non-negative',
      'friction.coulombNm:non-negative',
      'friction.coulombSmoothingRadPerS:positive',
    ]);
  });

  it('rejects wrong array lengths, a bad n and an indefinite J', () => {
    expect(errs(J6, { n: 2, axes: new Float64Array(3), rotorInertiaKgm2: new Float64Array(1) }).map((i) => i.path)).toEqual([
      'wheels.axes',
      'wheels.rotorInertiaKgm2',
    ]);
    expect(errs(J6, { n: 1.5, axes: new Float64Array(3), rotorInertiaKgm2: new Float64Array(1) })[0]!.path).toBe('wheels.n');
    const none: WheelGeometry = { n: 0, axes: new Float64Array(0), rotorInertiaKgm2: new Float64Array(0) };
    expect(errs(m3Diag(1, 1, -1), none).map((i) => i.rule)).toContain('positive-definite');
    expect(
      errs(
        m3FromRows([
          [1, 0.5, 0],
          [0, 1, 0],
          [0, 0, 1],
        ]),
        none,
      ).map((i) => i.rule),
    ).toContain('symmetric');
  });
});

describe('gyrostatDerivative', () => {
  it('with no wheels it is Euler’s equations I1ω̇1 = (I2 − I3)ω2ω3 (cyclic), references §4', () => {
    const I = [0.1, 0.15, 0.2];
    const g = mk(m3Diag(I[0]!, I[1]!, I[2]!), { n: 0, axes: new Float64Array(0), rotorInertiaKgm2: new Float64Array(0) });
    const x = new Float64Array([0, 0, 0, 1, 0.3, -0.2, 0.4]);
    const dx = new Float64Array(7);
    gyrostatDerivative(dx, x, g, [], [0, 0, 0]);
    const [w1, w2, w3] = [0.3, -0.2, 0.4];
    expect(dx[4]).toBeCloseTo(((I[1]! - I[2]!) * w2 * w3) / I[0]!, 15);
    expect(dx[5]).toBeCloseTo(((I[2]! - I[0]!) * w3 * w1) / I[1]!, 15);
    expect(dx[6]).toBeCloseTo(((I[0]! - I[1]!) * w1 * w2) / I[2]!, 15);
  });

  it('kinematics q̇ = ½ q ⊗ (ω, 0) agrees with the npm quaternion package', () => {
    const g = mk();
    const rng = makeRng(7);
    const q = qRandomUniform(new Float64Array(4), rng);
    const x = new Float64Array(11);
    x.set(q, 0);
    x.set([0.01, -0.03, 0.02], 4);
    const dx = new Float64Array(11);
    gyrostatDerivative(dx, x, g, [0, 0, 0, 0], [0, 0, 0]);
    const ref = new Quaternion(q[3], q[0], q[1], q[2]).mul(new Quaternion(0, 0.01, -0.03, 0.02)).scale(0.5);
    expect(dx[0]).toBeCloseTo(ref.x, 15);
    expect(dx[1]).toBeCloseTo(ref.y, 15);
    expect(dx[2]).toBeCloseTo(ref.z, 15);
    expect(dx[3]).toBeCloseTo(ref.w, 15);
  });

  const stateArb = fc.record({
    seed: fc.integer({ min: 0, max: 2 ** 31 - 1 }),
    w: fc.array(fc.double({ min: -0.5, max: 0.5, noNaN: true }), { minLength: 3, maxLength: 3 }),
    h: fc.array(fc.double({ min: -0.01, max: 0.01, noNaN: true }), { minLength: 4, maxLength: 4 }),
    tau: fc.array(fc.double({ min: -0.005, max: 0.005, noNaN: true }), { minLength: 4, maxLength: 4 }),
    ext: fc.array(fc.double({ min: -0.001, max: 0.001, noNaN: true }), { minLength: 3, maxLength: 3 }),
  });
  const gFr = mk(J6, pyramid([2e-5, 2.5e-5, 3e-5, 3.5e-5]), { viscousNmsPerRad: new Float64Array([1e-6, 2e-6, 0, 3e-6]), coulombNm: 1e-4 });

  it('Ḣ + ω × H = τ_ext at random states, with and without friction (Euler’s law, methods §6)', () => {
    for (const g of [mk(), gFr]) {
      fc.assert(
        fc.property(stateArb, ({ seed, w, h, tau, ext }) => {
          const x = new Float64Array(11);
          x.set(qRandomUniform(new Float64Array(4), makeRng(seed)), 0);
          x.set(w, 4);
          x.set(h, 7);
          const dx = new Float64Array(11);
          gyrostatDerivative(dx, x, g, tau, ext);
          // Ḣ = J⊥ ω̇ + G ḣ (G and J⊥ constant in body axes)
          const dH = totalMomentumBody(new Float64Array(3), [0, 0, 0, 1, dx[4]!, dx[5]!, dx[6]!, dx[7]!, dx[8]!, dx[9]!, dx[10]!], g);
          const H = totalMomentumBody(new Float64Array(3), x, g);
          const c = [w[1]! * H[2]! - w[2]! * H[1]!, w[2]! * H[0]! - w[0]! * H[2]!, w[0]! * H[1]! - w[1]! * H[0]!];
          for (let k = 0; k < 3; k++) expect(dH[k]! + c[k]! - ext[k]!).toBeCloseTo(0, 15);
        }),
        { numRuns: 200 },
      );
    }
  });

  it('power balance dT/dt = Σ τ_i Ω_i + ωᵀτ_ext; friction only removes energy', () => {
    fc.assert(
      fc.property(stateArb, ({ seed, w, h, tau, ext }) => {
        const x = new Float64Array(11);
        x.set(qRandomUniform(new Float64Array(4), makeRng(seed)), 0);
        x.set(w, 4);
        x.set(h, 7);
        const Om = wheelRelativeSpeed(new Float64Array(4), x, gFr);
        const dx = new Float64Array(11);
        gyrostatDerivative(dx, x, gFr, tau, ext);
        // dT/dt = ωᵀ J⊥ ω̇ + Σ h_i ḣ_i / J_s,i
        let dT = 0;
        for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) dT += w[r]! * gFr.Jperp[3 * c + r]! * dx[4 + c]!;
        for (let i = 0; i < 4; i++) dT += (h[i]! * dx[7 + i]!) / gFr.Js[i]!;
        let motor = w[0]! * ext[0]! + w[1]! * ext[1]! + w[2]! * ext[2]!;
        let friction = 0;
        for (let i = 0; i < 4; i++) {
          motor += tau[i]! * Om[i]!;
          friction += (dx[7 + i]! - tau[i]!) * Om[i]!;
        }
        expect(friction).toBeLessThanOrEqual(0);
        expect(dT - motor - friction).toBeCloseTo(0, 12);
      }),
      { numRuns: 200 },
    );
  });

  it('friction torque opposes the relative spin: −cΩ − τ_c tanh(Ω/Ω_s)', () => {
    const one: WheelGeometry = { n: 1, axes: new Float64Array([0, 0, 1]), rotorInertiaKgm2: new Float64Array([1e-4]) };
    const g = mk(m3Diag(0.1, 0.1, 0.1), one, { viscousNmsPerRad: 1e-5, coulombNm: 2e-4, coulombSmoothingRadPerS: 0.5 });
    const x = new Float64Array([0, 0, 0, 1, 0, 0, 0.1, 1e-4 * (0.1 + 50)]); // Ω = 50 rad/s
    const dx = new Float64Array(8);
    gyrostatDerivative(dx, x, g, [0], [0, 0, 0]);
    expect(dx[7]).toBeCloseTo(-1e-5 * 50 - 2e-4 * Math.tanh(100), 15);
    // the body feels the reaction +(friction) about z
    expect(dx[6]! * g.Jperp[8]!).toBeCloseTo(-dx[7]!, 15);
  });
});

describe('helpers', () => {
  it('totalMomentumInertial rotates H by R(q): 90° about z takes body x to inertial y', () => {
    const g = mk(m3Diag(0.2, 0.1, 0.1), { n: 0, axes: new Float64Array(0), rotorInertiaKgm2: new Float64Array(0) });
    const s = Math.SQRT1_2;
    const H = totalMomentumInertial(new Float64Array(3), [0, 0, s, s, 0.5, 0, 0], g);
    expect(H[0]).toBeCloseTo(0, 15);
    expect(H[1]).toBeCloseTo(0.1, 15);
    expect(H[2]).toBeCloseTo(0, 15);
    // a non-unit quaternion is normalised on the fly
    const H2 = totalMomentumInertial(new Float64Array(3), [0, 0, 2 * s, 2 * s, 0.5, 0, 0], g);
    expect(H2[1]).toBeCloseTo(0.1, 15);
  });

  it('kinetic energy of a body at rest with a spinning rotor is ½ J_s Ω²', () => {
    const one: WheelGeometry = { n: 1, axes: new Float64Array([1, 0, 0]), rotorInertiaKgm2: new Float64Array([1e-4]) };
    const g = mk(m3Diag(0.1, 0.1, 0.1), one);
    expect(kineticEnergy([0, 0, 0, 1, 0, 0, 0, 1e-4 * 300], g)).toBeCloseTo(0.5 * 1e-4 * 300 * 300, 14);
  });

  it('relative speed and absolute momentum convert both ways', () => {
    const g = mk();
    const w = [0.01, 0.02, -0.03];
    const h = wheelMomentumFromRelativeSpeed(new Float64Array(4), w, [100, -200, 300, 0], g);
    const x = new Float64Array(11);
    x.set([0, 0, 0, 1, ...w, ...h]);
    const Om = wheelRelativeSpeed(new Float64Array(4), x, g);
    expect(Array.from(Om).map((v) => Math.round(v * 1e9) / 1e9)).toEqual([100, -200, 300, 0]);
  });
});
