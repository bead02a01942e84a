/**
 * The S² synergy-gap certificate (app/engine/control/sphere/certificate.ts) against a closed form
 * derived here, and its refusals.
 *
 * Closed form (derived in this comment, for unit warp directions u_p ⊥ b and 0 < k < 1):
 *  - Rodrigues with u ⊥ b: R_a(φ, u) b = cos φ b + sin φ (u × b), so bᵀR_a(φ, u)b = cos φ.
 *  - The undesired critical point of V_q is y_q* = R_a(−θ*, u_q)(−b) with θ* = kV(y_q*), and
 *    V(y_q*) = 1 + bᵀR_a(−θ*, u_q)b = 1 + cos θ*, so θ* is the root of θ = k(1 + cos θ)
 *    (unique: the derivative 1 + k sin θ > 0), THE SAME for every member.
 *  - At y_q* every member warps by the same angle θ* (θ depends on V(y) only), so
 *    V_p(y_q*) = 1 + bᵀR_a(θ*, u_p)R_a(−θ*, u_q)b = 1 + (R_a(−θ*, u_p)b)ᵀ(R_a(−θ*, u_q)b)
 *             = 1 + (cos θ* b − sin θ* u_p × b)ᵀ(cos θ* b − sin θ* u_q × b)
 *             = 1 + cos²θ* + sin²θ* cos α_pq,      α_pq = ∠(u_p, u_q)
 *    ((u_p × b)ᵀ(u_q × b) = u_pᵀu_q for u_p, u_q ⊥ b, Binet–Cauchy identity).
 *  - V_q(y_q*) = V(−b) = 2, hence μ_q = 2 − min_p V_p(y_q*) = sin²θ* (1 − min_{p≠q} cos α_pq),
 *    and δ* = sin²θ* · min_q (1 − min_{p≠q} cos α_pq). A pair u, −u gives 2 sin²θ*; three
 *    directions 120° apart give 1.5 sin²θ*; members with equal directions share y* and get μ = 0.
 * θ* is solved below by bisection, written here (independent of the engine's Brent solver).
 */
import Quaternion from 'quaternion';
import { describe, expect, it } from 'vitest';
import {
  certifySphereFamily,
  clearSphereCertificateCache,
  evenWarpDirections,
  makeSphereFamily,
  sphereFamilyInputIssues,
} from '../../app/engine/control/sphere/index';
import { RAD_PER_DEG } from '../../app/engine/units';
import { angle, type V3 } from './sphere-fixtures';

const b: V3 = [0.6, 0, 0.8];
// an orthonormal pair in the plane ⊥ b, written out
const e1: V3 = [0, 1, 0];
const e2: V3 = [b[1] * e1[2] - b[2] * e1[1], b[2] * e1[0] - b[0] * e1[2], b[0] * e1[1] - b[1] * e1[0]]; // b × e1 = (−0.8, 0, 0.6)
const inPlane = (deg: number): V3 => {
  const t = deg * RAD_PER_DEG;
  return [0, 1, 2].map((i) => Math.cos(t) * e1[i]! + Math.sin(t) * e2[i]!) as V3;
};

function thetaStar(k: number): number {
  let lo = 0,
    hi = 2 * k; // f(0) = −2k < 0, f(2k) = k(1 − cos 2k) ≥ 0
  for (let i = 0; i < 200; i++) {
    const m = 0.5 * (lo + hi);
    if (m - k * (1 + Math.cos(m)) < 0) lo = m;
    else hi = m;
  }
  return 0.5 * (lo + hi);
}

const CASES = [
  { name: 'pair u, −u', k: 0.5, angles: [0, 180] },
  { name: 'pair at 90°', k: 0.5, angles: [0, 90] },
  { name: 'triple at 120°', k: 0.5, angles: [30, 150, 270] },
  { name: 'uneven triple 0°, 100°, 220°', k: 0.8, angles: [0, 100, 220] },
  { name: 'pair u, −u with a small gain', k: 0.1, angles: [10, 190] },
];

describe('certificate against the closed form', () => {
  for (const c of CASES) {
    it(`${c.name}, k = ${c.k}: θ*, y*, V_p(y*), μ_q and δ* to 1e-9`, () => {
      const dirs = c.angles.flatMap(inPlane);
      const fam = makeSphereFamily(b, c.k, dirs);
      const cert = certifySphereFamily({ family: fam, delta: 0.01 }, { samples: 20_000 });
      expect(cert.certified).toBe(true);
      expect(cert.admissible).toBe(true);
      const th = thetaStar(c.k);
      const s2 = Math.sin(th) ** 2;
      const M = c.angles.length;
      const cosA = (p: number, q: number) => Math.cos((c.angles[p]! - c.angles[q]!) * RAD_PER_DEG);
      let deltaStar = Infinity;
      const und = cert.criticalPoints.filter((p) => p.kind === 'undesired');
      expect(und.length).toBe(M);
      for (let q = 0; q < M; q++) {
        const cp = und.find((p) => p.member === q + 1)!;
        expect(Math.abs(cp.warpAngle - th)).toBeLessThan(1e-12);
        // y_q* = R_a(−θ*, u_q)(−b), rotated by the npm quaternion package
        const ystar = Quaternion.fromAxisAngle(inPlane(c.angles[q]!), -th).rotateVector([-b[0], -b[1], -b[2]]) as V3;
        expect(angle(cp.direction, ystar)).toBeLessThan(1e-12);
        for (let p = 0; p < M; p++) {
          const Vp = p === q ? 2 : 1 + Math.cos(th) ** 2 + s2 * cosA(p, q);
          expect(Math.abs(cp.potentials[p]! - Vp)).toBeLessThan(1e-12);
        }
        let minCos = Infinity;
        for (let p = 0; p < M; p++) if (p !== q) minCos = Math.min(minCos, cosA(p, q));
        const mu = s2 * (1 - minCos);
        expect(Math.abs(cp.gap - mu)).toBeLessThan(1e-9);
        deltaStar = Math.min(deltaStar, mu);
      }
      expect(Math.abs(cert.deltaStar - deltaStar)).toBeLessThan(1e-9);
      expect(cert.deltaStarTolerance).toBeLessThan(1e-12);
      // the desired critical point of every member is b itself (θ = 0)
      for (const cp of cert.criticalPoints.filter((p) => p.kind === 'desired')) {
        expect(cp.warpAngle).toBe(0);
        expect(angle(cp.direction, b)).toBeLessThan(1e-15);
      }
      // diffeomorphism margin: closed form 1 − k for u ⊥ b; the sampled minimum never below it and close to it
      expect(cert.diffeomorphismMargin).toBeCloseTo(1 - c.k, 14);
      for (const m of cert.sampledDiffeomorphismMargins) {
        expect(m).toBeGreaterThanOrEqual(1 - c.k - 1e-12);
        expect(m - (1 - c.k)).toBeLessThan(1e-3 * c.k);
      }
      // completeness: every zero of ∇V_p found by the searches is a located point
      expect(cert.completeness!.unmatched).toBe(0);
      expect(cert.completeness!.converged).toBeGreaterThan(0);
      for (const g of cert.completeness!.minGradientNormAway) expect(g).toBeGreaterThan(1e-3);
    });
  }

  it('the recommended hysteresis and the admissibility boundary', () => {
    const fam = makeSphereFamily(b, 0.5, evenWarpDirections(b, 2));
    const ds = 2 * Math.sin(thetaStar(0.5)) ** 2;
    const ok = certifySphereFamily({ family: fam, delta: 0.8 * ds });
    expect(ok.admissible).toBe(true);
    expect(ok.recommendedDelta).toBeCloseTo(0.8 * ds, 9);
    expect(ok.flowSet!.minGradientNorm.every((g) => g > 1e-3)).toBe(true);
    const tooBig = certifySphereFamily({ family: fam, delta: ds + 1e-6 });
    expect(tooBig.certified).toBe(true);
    expect(tooBig.admissible).toBe(false);
    expect(tooBig.issues.map((i) => i.rule)).toEqual(['synergy-gap']);
    expect(tooBig.issues[0]!.path).toBe('hysteresis');
    const zero = certifySphereFamily({ family: fam, delta: 0 });
    expect(zero.admissible).toBe(false);
    const close = certifySphereFamily({ family: fam, delta: 0.95 * ds });
    expect(close.admissible).toBe(true);
    expect(close.warnings.map((w) => w.rule)).toEqual(['gap-margin']);
  });
});

describe('refusals', () => {
  const u = inPlane(0);
  it('two members with the same warp direction share their undesired critical point: zero gap, refused', () => {
    const cert = certifySphereFamily({ family: makeSphereFamily(b, 0.5, [...u, ...u]), delta: 0.1 }, { path: 'controllers[2]' });
    expect(cert.certified).toBe(false);
    expect(cert.admissible).toBe(false);
    expect(cert.deltaStar).toBe(0);
    const z = cert.issues.find((i) => i.rule === 'zero-gap')!;
    expect(z.path).toBe('controllers[2].warpDirections');
    expect(z.message).toMatch(/members 1 and 2 share their undesired critical point/);
    expect(cert.summary).toMatch(/^Refused: zero-gap/);
  });

  it('k = 0 (no warp) and warps about ±b itself leave every member equal to V: refused', () => {
    const mb = b.map((v) => -v);
    for (const fam of [makeSphereFamily(b, 0, evenWarpDirections(b, 2)), makeSphereFamily(b, 0.5, [...b, ...mb])]) {
      const cert = certifySphereFamily({ family: fam, delta: 0.1 });
      expect(cert.certified).toBe(false);
      expect(cert.issues.some((i) => i.rule === 'zero-gap')).toBe(true);
    }
  });

  it('k ≥ 1/|u × b| breaks the diffeomorphism condition: refused with the bound', () => {
    const cert = certifySphereFamily({ family: makeSphereFamily(b, 1.2, evenWarpDirections(b, 2)), delta: 0.1 });
    expect(cert.certified).toBe(false);
    const d = cert.issues.filter((i) => i.rule === 'diffeomorphism');
    expect(d.length).toBe(2);
    expect(d[0]!.path).toBe('warpGain');
    expect(d[0]!.message).toMatch(/k < 1\/\|u × b\| = 1\.000000/);
    expect(cert.diffeomorphismMargin).toBeCloseTo(-0.2, 14);
  });

  it('bad input: one member, zero or non-finite vectors, negative gain — every problem listed', () => {
    const issues = sphereFamilyInputIssues([0, 0, 0], -1, [1, 0, 0, 0, 0, 0, NaN, 1], 'c');
    expect(issues.map((i) => `${i.path}:${i.rule}`).sort()).toEqual(
      ['c.axis:unit-vector', 'c.warpGain:finite', 'c.warpDirections:triples', 'c.warpDirections[1]:unit-vector'].sort(),
    );
    const one = certifySphereFamily({ family: makeSphereFamily(b, 0.5, u), delta: 0.1 });
    expect(one.issues.map((i) => i.rule)).toContain('min-members');
  });
});

describe('cache', () => {
  it('same parameters give equal results; the returned copy cannot alter the cache; δ is part of the key', () => {
    clearSphereCertificateCache();
    const fam = makeSphereFamily(b, 0.5, evenWarpDirections(b, 3));
    const t0 = performance.now();
    const a = certifySphereFamily({ family: fam, delta: 0.3 });
    const t1 = performance.now();
    a.criticalPoints[1]!.gap = -1;
    a.issues.push({ path: 'x', rule: 'y', message: 'z' });
    const c = certifySphereFamily({ family: fam, delta: 0.3 });
    const t2 = performance.now();
    expect(c.criticalPoints[1]!.gap).toBeGreaterThan(0);
    expect(c.issues).toEqual([]);
    expect(t2 - t1).toBeLessThan(t1 - t0); // served from the cache
    const d = certifySphereFamily({ family: fam, delta: 0.9 });
    expect(d.delta).toBe(0.9);
    expect(d.admissible).toBe(false); // 0.9 > δ* = 1.5 sin²θ* ≈ 0.8249
  });
});
