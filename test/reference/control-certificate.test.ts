/**
 * Synergy-gap certificate (definition of the gap: Mayhew & Teel, IEEE TAC 58(11), 2013; warped
 * family: Berkane & Tayebi, IEEE TAC 62(1), 2017). Reference values: the parameter set of methods
 * §4.3 (A = diag(1,2,3), u_q = e_q, k = 0.15), derived for this project in double precision —
 * our own numbers, not the paper's. The diffeomorphism margins follow the closed form
 * 1 − k(tr A − λ_q) for u_q = v_q (methods §4.2, numerical observation there).
 */
import { describe, expect, it } from 'vitest';
import { certifySynergistic } from '../../app/engine/control/certificate';
import { flowSetGradientCheck } from '../../app/engine/control/flowset';
import { controllerFromSpec as makeController } from '../support/controller-spec';
import { makeWarpFamily } from '../../app/engine/control/potential';
import { plantOf } from './control-rk4';

const diag123 = [1, 0, 0, 0, 2, 0, 0, 0, 3];
const eig = [1, 0, 0, 0, 1, 0, 0, 0, 1];

describe('methods §4.3: A = diag(1,2,3), k = 0.15, warp along the eigenvectors', () => {
  const cert = certifySynergistic({ family: makeWarpFamily(diag123, 0.15, eig), delta: 0.2 });

  // [q, i, θ*, V1, V2, V3, μ, q⁺] — methods §4.3 table
  const table: [number, number, number, number, number, number, number, number][] = [
    [1, 1, 1.094121, 10, 7.090397, 7.338701, 2.909603, 2],
    [1, 2, 1.115905, 8, 6.13976, 7.371377, 1.86024, 2],
    [1, 3, 0.964529, 6, 6.735382, 5.509745, 0.490255, 3],
    [2, 1, 1.284671, 6.52121, 10, 7.331528, 3.47879, 1],
    [2, 2, 0.949335, 6.434731, 8, 6.921209, 1.565269, 1],
    [2, 3, 1.050985, 6.749968, 6, 5.750011, 0.249989, 3],
    [3, 1, 1.378646, 6.45488, 6.918383, 10, 3.54512, 1],
    [3, 2, 1.311547, 6.893985, 6.322073, 8, 1.677927, 2],
    [3, 3, 0.772329, 5.59356, 5.79678, 6, 0.40644, 1],
  ];

  it('finds exactly one preimage of each critical point of Φ per member, with ‖b_q‖ ≈ 0', () => {
    expect(cert.criticalPoints.length).toBe(12);
    for (const c of cert.criticalPoints) expect(c.gradientNorm).toBeLessThan(1e-12);
    for (let q = 1; q <= 3; q++) {
      const own = cert.criticalPoints.filter((c) => c.member === q);
      expect(own.map((c) => c.target).sort()).toEqual([0, 1, 2, 3]);
      const id = own.find((c) => c.target === 0)!;
      expect(id.potentials[q - 1]).toBe(0);
    }
  });

  it.each(table)('row q = %i, i = %i: θ*, (V1, V2, V3), μ and q⁺', (q, i, th, v1, v2, v3, mu, next) => {
    const c = cert.criticalPoints.find((p) => p.member === q && p.target === i)!;
    expect(c.warpAngle).toBeCloseTo(th, 6);
    expect(c.potentials[0]).toBeCloseTo(v1, 6);
    expect(c.potentials[1]).toBeCloseTo(v2, 6);
    expect(c.potentials[2]).toBeCloseTo(v3, 6);
    expect(c.gap).toBeCloseTo(mu, 6);
    expect(c.jumpTo).toBe(next);
    // V_q at its own undesired critical point equals Φ(R_a(π, e_i)) = 2(6 − λ_i) (methods §4.2)
    expect(c.potentials[q - 1]).toBeCloseTo(2 * (6 - i), 10);
  });

  it('δ* = 0.249989 (q = 2 at Γ₂⁻¹(R_a(π, e₃))); δ = 0.2 admissible with margin 0.049989', () => {
    expect(cert.certified).toBe(true);
    expect(cert.deltaStar).toBeCloseTo(0.249989, 6);
    expect(cert.deltaStarTolerance).toBeLessThan(1e-10);
    const worst = cert.criticalPoints.filter((c) => c.target > 0).reduce((a, b) => (b.gap < a.gap ? b : a));
    expect([worst.member, worst.target]).toEqual([2, 3]);
    expect(cert.admissible).toBe(true);
    expect(cert.margin).toBeCloseTo(0.049989, 6);
    expect(cert.recommendedDelta).toBeCloseTo(0.8 * 0.249989, 6);
    expect(cert.issues).toEqual([]);
    expect(cert.summary).toMatch(/admissible/);
  });

  it('diffeomorphism margin 0.25 (per member 1 − k(trA − λ_q) = 0.25, 0.40, 0.55)', () => {
    expect(cert.diffeomorphismMargin).toBeCloseTo(0.25, 6);
    [0.25, 0.4, 0.55].forEach((m, q) => expect(cert.diffeomorphismMargins[q]).toBeCloseTo(m, 6));
  });

  it('multi-start search finds no critical point outside the enumerated ones', () => {
    expect(cert.completeness.unmatched).toBe(0);
    expect(cert.completeness.converged).toBeGreaterThan(0.8 * cert.completeness.starts);
  });

  it('the optimum k ≈ 0.1496 gives δ* = 0.250000', () => {
    const c = certifySynergistic({ family: makeWarpFamily(diag123, 0.1496, eig), delta: 0.2 }, { flowSetSamples: 0 });
    expect(c.deltaStar).toBeCloseTo(0.25, 6);
  });

  it('δ outside (0, δ*) is reported on the jump-threshold field', () => {
    for (const d of [0.3, 0.249995, 0, -0.1]) {
      const c = certifySynergistic({ family: makeWarpFamily(diag123, 0.15, eig), delta: d }, { path: 'controllers[1]', flowSetSamples: 0 });
      expect(c.certified).toBe(true);
      expect(c.admissible).toBe(false);
      // δ ≥ δ* is the certificate's refusal; δ ≤ 0 is plain bad input on the same field.
      expect(c.issues.map((i) => [i.path, i.rule])).toEqual([['controllers[1].gapThreshold', d > 0 ? 'certificate-gap' : 'positive']]);
    }
    const close = certifySynergistic({ family: makeWarpFamily(diag123, 0.15, eig), delta: 0.24 }, { flowSetSamples: 0 });
    expect(close.admissible).toBe(true);
    expect(close.warnings.map((w) => w.rule)).toContain('gap-margin');
  });

  it('scaling (A, k) → (cA, k/c) multiplies the gap by c (methods §4.2)', () => {
    const c = certifySynergistic(
      {
        family: makeWarpFamily(
          diag123.map((v) => 2.5 * v),
          0.15 / 2.5,
          eig,
        ),
        delta: 0.2,
      },
      { flowSetSamples: 0 },
    );
    expect(c.deltaStar).toBeCloseTo(2.5 * cert.deltaStar, 9);
  });
});

describe('refusals', () => {
  const s3 = 1 / Math.sqrt(3);
  it.each([
    ['opposite eigen-directions (e₁, −e₁)', [1, 0, 0, -1, 0, 0]],
    ['opposite directions ±(1,1,1)/√3', [s3, s3, s3, -s3, -s3, -s3]],
    ['the same direction twice', [0, 1, 0, 0, 1, 0]],
  ])('zero gap: %s (methods §4.2)', (_name, dirs) => {
    const c = certifySynergistic({ family: makeWarpFamily(diag123, 0.15, dirs), delta: 0.2 }, { path: 'ctl' });
    expect(c.certified).toBe(false);
    expect(c.admissible).toBe(false);
    expect(c.deltaStar).toBeLessThan(1e-12);
    expect(c.issues.map((i) => [i.path, i.rule])).toContainEqual(['ctl.warpDirections', 'certificate-zero-gap']);
    expect(c.summary).toMatch(/^Refused/);
  });

  it('broken diffeomorphism condition: k = 0.25 > 1/(trA − λ₁) = 0.2', () => {
    const c = certifySynergistic({ family: makeWarpFamily(diag123, 0.25, eig), delta: 0.2 }, { path: 'ctl' });
    expect(c.certified).toBe(false);
    // 1 − k(trA − λ_1) = 1 − 0.25·5 = −0.25 for member 1
    expect(c.diffeomorphismMargins[0]).toBeCloseTo(-0.25, 6);
    expect(c.issues.map((i) => [i.path, i.rule])).toContainEqual(['ctl.warpGain', 'certificate-diffeomorphism']);
    expect(c.deltaStar).toBe(0); // no gap is claimed for a refused family
  });

  it('a one-member family has no gap at all (μ ≡ 0)', () => {
    const c = certifySynergistic({ family: makeWarpFamily(diag123, 0.15, [1, 0, 0]), delta: 0.2 }, { path: 'ctl', flowSetSamples: 0 });
    expect(c.certified).toBe(false);
    expect(c.issues.map((i) => i.rule)).toEqual(expect.arrayContaining(['certificate-min-members', 'certificate-zero-gap']));
  });

  it('makeController refuses an uncertified family with the field path, unless told to build anyway', () => {
    const plant = plantOf([
      [1, 0, 0],
      [0, 1, 0],
      [0, 0, 1],
    ]);
    const spec = {
      kind: 'synergistic',
      gains: { kR: 1, kOmega: 1 },
      potential: { eigenvalues: [1, 2, 3] },
      warpGain: 0.15,
      warpDirections: [
        [1, 0, 0],
        [-1, 0, 0],
      ],
      hysteresis: 0.2,
    };
    const r = makeController(spec, plant, 'controllers[0]');
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors.map((e) => [e.path, e.rule])).toContainEqual(['controllers[0].warpDirections', 'certificate-zero-gap']);
    const forced = makeController({ ...spec, requireCertificate: false }, plant, 'controllers[0]');
    expect(forced.ok).toBe(true);
    expect(forced.warnings.map((w) => w.rule)).toContain('certificate-zero-gap');
    const good = makeController({ ...spec, warpDirections: undefined }, plant);
    expect(good.ok).toBe(true);
    if (good.ok) expect(good.value.certificate?.deltaStar).toBeCloseTo(0.249989, 6);
  });
});

describe('sampled flow-set check (methods §5 step 5)', () => {
  const fam = makeWarpFamily(diag123, 0.15, eig);

  it('10⁶ uniform attitudes, δ = 0.2: min ‖b_q‖ on the flow set beyond 0.2 rad stays clearly positive', () => {
    const r = flowSetGradientCheck(fam, 0.2, { samples: 1_000_000, seed: 1, minAngleRad: 0.2 });
    expect(r.samples).toBe(1_000_000);
    // Fraction beyond 0.2 rad of a Haar-uniform sample: 1 − (θ − sin θ)/π at θ = 0.2 (≈ 0.99958)
    expect(r.beyondAngle / r.samples).toBeCloseTo(1 - (0.2 - Math.sin(0.2)) / Math.PI, 3);
    for (const m of r.perMember) {
      expect(m.inFlowSet).toBeGreaterThan(100_000);
      expect(m.minGradientNorm).toBeGreaterThan(0.04);
      // the local constrained search estimates the infimum; still bounded away from zero
      expect(m.refinedMinGradientNorm).toBeGreaterThan(0.01);
      expect(m.refinedMinGradientNorm).toBeLessThanOrEqual(m.minGradientNorm);
    }
  });

  it('with δ = 0.3 > δ* the undesired critical point of V₂ enters its flow set and the check sees ‖b₂‖ → 0', () => {
    const r = flowSetGradientCheck(fam, 0.3, { samples: 20_000, seed: 1 });
    expect(r.perMember[1]!.refinedMinGradientNorm).toBeLessThan(1e-8);
    expect(r.perMember[0]!.refinedMinGradientNorm).toBeGreaterThan(0.01);
    expect(r.perMember[2]!.refinedMinGradientNorm).toBeGreaterThan(0.01);
  });
});
