/**
 * The pointing potential on S² and its warped family (app/engine/control/sphere/potential.ts).
 *
 * Sources:
 *  - V(y) = 1 − bᵀy = 1 − cos φ on the unit sphere: its Riemannian gradient is the tangential part
 *    of −b, of norm sin φ, zero only at y = ±b (elementary calculus on S²; the critical points of
 *    the "height function" — Milnor, Morse Theory, Princeton 1963, §2, from memory). The body
 *    gradient y × b has the same norm |y × b| = sin φ.
 *  - Gradients against central differences of V along ẏ = y × ω (definition of V̇ = ∇ᵀω), with
 *    the motion y(t) = R_a(−|ω|t, ω̂) y built by the npm `quaternion` package.
 *  - The warp's tangent-plane Jacobian against the area scale factor of Γ measured by finite
 *    differences (change of variables: det DΓ = |∂₁Γ × ∂₂Γ|·sign for an orthonormal tangent frame).
 *  - y = R(q_e)ᵀ b equals R(q)ᵀ r for every roll of the reference about r (npm `quaternion`).
 */
import Quaternion from 'quaternion';
import { describe, expect, it } from 'vitest';
import { makeRng } from '../../app/engine/math/prng';
import { qConjMultiply, qRotateInverse } from '../../app/engine/math/rotation';
import {
  evaluateSphereFamily,
  evenWarpDirections,
  makeSphereFamily,
  makeSphereWorkspace,
  pointingAngle,
  pointingGradient,
  pointingPotential,
  sphereMemberGradient,
  sphereWarpJacobianDet,
  sphereWarpMarginClosedForm,
} from '../../app/engine/control/sphere/index';
import { RAD_PER_DEG } from '../../app/engine/units';
import { angle, uniformDirection, type V3 } from './sphere-fixtures';

const b: V3 = [0.6, 0, 0.8];

/** y rotated for time h at body rate ω: ẏ = y × ω ⇔ y(h) = R_a(−|ω|h, ω̂) y (npm quaternion). */
function moved(y: V3, w: V3, h: number): V3 {
  const n = Math.hypot(...w);
  const q = Quaternion.fromAxisAngle([w[0] / n, w[1] / n, w[2] / n], -n * h);
  return q.rotateVector(y) as V3;
}

describe('V(y) = 1 − bᵀy: critical points only at ±b', () => {
  it('over 100 000 uniform directions, |∇V| = sin φ and min |∇V| away from ±b is sin ρ', () => {
    const rng = makeRng(2024, 1);
    const g = new Float64Array(3);
    const rho = 1 * RAD_PER_DEG;
    let minAway = Infinity,
      worstNorm = 0,
      worstV = 0,
      away = 0;
    for (let s = 0; s < 100_000; s++) {
      const y = uniformDirection(rng);
      const phi = angle(b, y);
      pointingGradient(g, b, y);
      const gn = Math.hypot(g[0]!, g[1]!, g[2]!);
      worstNorm = Math.max(worstNorm, Math.abs(gn - Math.sin(phi)));
      worstV = Math.max(worstV, Math.abs(pointingPotential(b, y) - (1 - Math.cos(phi))));
      if (phi >= rho && phi <= Math.PI - rho) {
        away++;
        minAway = Math.min(minAway, gn);
      }
    }
    expect(worstNorm).toBeLessThan(1e-15 * 8);
    expect(worstV).toBeLessThan(1e-15 * 8);
    // every sample farther than ρ = 1° from ±b has |∇V| ≥ sin 1° = 0.017452 (nowhere else zero)
    expect(away).toBeGreaterThan(99_900);
    expect(minAway).toBeGreaterThanOrEqual(Math.sin(rho) - 1e-15);
    expect(minAway).toBeLessThan(0.05); // the sampling does reach near the caps: the bound is not vacuous
    // and it vanishes at ±b exactly
    pointingGradient(g, b, b);
    expect(Math.hypot(g[0]!, g[1]!, g[2]!)).toBe(0);
    pointingGradient(g, b, [-b[0], -b[1], -b[2]]);
    expect(Math.hypot(g[0]!, g[1]!, g[2]!)).toBe(0);
  });

  it('pointing angle is accurate at 0 and π (atan2 form, no clamped acos)', () => {
    const tiny = 1e-9;
    const y: V3 = [b[0] * Math.cos(tiny) + 0 * Math.sin(tiny), Math.sin(tiny), b[2] * Math.cos(tiny)];
    expect(pointingAngle(b, y)).toBeCloseTo(tiny, 20);
    expect(Math.PI - pointingAngle(b, [-y[0], -y[1], -y[2]])).toBeCloseTo(tiny, 15);
  });
});

describe('gradients against central differences along ẏ = y × ω', () => {
  const fams = [
    makeSphereFamily(b, 0.5, evenWarpDirections(b, 2)),
    makeSphereFamily(b, 0.9, evenWarpDirections(b, 3, 0.4)),
    // directions not ⊥ b are allowed too
    makeSphereFamily(b, 0.6, [0.3, 0.5, 0.1, -1, 0.2, 0.4]),
  ];
  it('smooth ∇V = y × b and every member ∇V_p', () => {
    const rng = makeRng(5, 2);
    const g = new Float64Array(3);
    let worst = 0;
    for (let s = 0; s < 300; s++) {
      const y = uniformDirection(rng);
      const w: V3 = [rng.normal(), rng.normal(), rng.normal()];
      const h = 1e-5;
      const fdV = (pointingPotential(b, moved(y, w, h)) - pointingPotential(b, moved(y, w, -h))) / (2 * h);
      pointingGradient(g, b, y);
      worst = Math.max(worst, Math.abs(fdV - (g[0]! * w[0] + g[1]! * w[1] + g[2]! * w[2])));
      for (const fam of fams) {
        const ws = makeSphereWorkspace(fam);
        for (let p = 0; p < fam.members; p++) {
          const vp = evaluateSphereFamily(ws, fam, moved(y, w, h)).V[p]!;
          const vm = evaluateSphereFamily(ws, fam, moved(y, w, -h)).V[p]!;
          evaluateSphereFamily(ws, fam, y);
          sphereMemberGradient(g, fam, ws, p);
          worst = Math.max(worst, Math.abs((vp - vm) / (2 * h) - (g[0]! * w[0] + g[1]! * w[1] + g[2]! * w[2])));
        }
      }
    }
    // central difference error O(h²) ≈ 1e-10 relative to |ω|² ~ 10
    expect(worst).toBeLessThan(1e-8);
  });

  it('every ∇V_p is ⊥ y (no torque about the line of sight) and ∇V is ⊥ b', () => {
    const rng = makeRng(6, 2);
    const g = new Float64Array(3);
    for (let s = 0; s < 500; s++) {
      const y = uniformDirection(rng);
      pointingGradient(g, b, y);
      expect(Math.abs(g[0]! * b[0] + g[1]! * b[1] + g[2]! * b[2])).toBeLessThan(1e-15);
      for (const fam of fams) {
        const ws = evaluateSphereFamily(makeSphereWorkspace(fam), fam, y);
        for (let p = 0; p < fam.members; p++) {
          sphereMemberGradient(g, fam, ws, p);
          expect(Math.abs(g[0]! * y[0] + g[1]! * y[1] + g[2]! * y[2])).toBeLessThan(1e-14);
        }
      }
    }
  });
});

describe('warp Jacobian', () => {
  it('det DΓ_p = 1 + k u_pᵀ(b × y) against a finite-difference area ratio; min 1 − k|u × b|', () => {
    const fam = makeSphereFamily(b, 0.7, [...evenWarpDirections(b, 2), 0.3, 0.5, 0.1]);
    const ws = makeSphereWorkspace(fam);
    const rng = makeRng(8, 3);
    let worst = 0;
    for (let s = 0; s < 300; s++) {
      const y = uniformDirection(rng);
      // orthonormal tangent frame (e1, e2) with e1 × e2 = y
      const a: V3 = Math.abs(y[0]) < 0.9 ? [1, 0, 0] : [0, 1, 0];
      const d = a[0] * y[0] + a[1] * y[1] + a[2] * y[2];
      const e1r = [a[0] - d * y[0], a[1] - d * y[1], a[2] - d * y[2]];
      const n1 = Math.hypot(...e1r);
      const e1 = e1r.map((v) => v / n1);
      const e2 = [y[1] * e1[2]! - y[2] * e1[1]!, y[2] * e1[0]! - y[0] * e1[2]!, y[0] * e1[1]! - y[1] * e1[0]!];
      const h = 1e-6;
      for (let p = 0; p < fam.members; p++) {
        const G = (t1: number, t2: number) => {
          const v = [0, 1, 2].map((i) => y[i]! + t1 * e1[i]! + t2 * e2[i]!);
          const m = Math.hypot(...v);
          evaluateSphereFamily(
            ws,
            fam,
            v.map((x) => x / m),
          );
          return Array.from(ws.gamma.subarray(3 * p, 3 * p + 3));
        };
        const g0 = G(0, 0),
          g1 = G(h, 0),
          gm1 = G(-h, 0),
          g2 = G(0, h),
          gm2 = G(0, -h);
        const d1 = g1.map((v, i) => (v - gm1[i]!) / (2 * h)),
          d2 = g2.map((v, i) => (v - gm2[i]!) / (2 * h));
        const c = [d1[1]! * d2[2]! - d1[2]! * d2[1]!, d1[2]! * d2[0]! - d1[0]! * d2[2]!, d1[0]! * d2[1]! - d1[1]! * d2[0]!];
        const area = c[0]! * g0[0]! + c[1]! * g0[1]! + c[2]! * g0[2]!;
        worst = Math.max(worst, Math.abs(area - sphereWarpJacobianDet(fam, y, p)));
      }
    }
    expect(worst).toBeLessThan(1e-8);
    // closed-form minimum: 1 − k for u ⊥ b
    expect(sphereWarpMarginClosedForm(fam, 0)).toBeCloseTo(0.3, 15);
    const u2 = [0.3, 0.5, 0.1].map((v) => v / Math.hypot(0.3, 0.5, 0.1));
    const ux = [u2[1]! * b[2] - u2[2]! * b[1], u2[2]! * b[0] - u2[0]! * b[2], u2[0]! * b[1] - u2[1]! * b[0]];
    expect(sphereWarpMarginClosedForm(fam, 2)).toBeCloseTo(1 - 0.7 * Math.hypot(...ux), 15);
  });
});

describe('the pointing direction y = R(q_e)ᵀ b', () => {
  it('equals R(q)ᵀ r for every roll of the reference about r (npm quaternion)', () => {
    const rng = makeRng(9, 4);
    const y = new Float64Array(3),
      qe = new Float64Array(4);
    for (let s = 0; s < 200; s++) {
      const r = uniformDirection(rng);
      // a reference with R(q_d) b = r, turned by a random roll about r
      const qd0 = Quaternion.fromVectors(b, r);
      const qd = Quaternion.fromAxisAngle(r, 2 * Math.PI * rng.next()).mul(qd0);
      const q = Quaternion.fromAxisAngle(uniformDirection(rng), 3 * rng.next());
      qConjMultiply(qe, [qd.x, qd.y, qd.z, qd.w], [q.x, q.y, q.z, q.w]);
      qRotateInverse(y, qe, b);
      const ref = q.conjugate().rotateVector(r) as V3;
      for (let i = 0; i < 3; i++) expect(y[i]).toBeCloseTo(ref[i]!, 13);
    }
  });
});
