/**
 * The study's case sampler against distributions stated outside the project.
 *
 * - Rotation angle under the Haar measure on SO(3): density (1 − cos θ)/π on [0, π], axis
 *   uniform and independent (R. E. Miles, "On random rotations in R³", Biometrika 52(3/4), 1965).
 *   Restricted to an angle band [a, b] the CDF is (F(θ) − F(a))/(F(b) − F(a)), F(θ) = θ − sin θ.
 * - A uniform unit vector has a uniform z-component on [−1, 1] (Archimedes' hat-box theorem).
 * - Kolmogorov–Smirnov one-sample test, asymptotic critical value 1.9495/√n at α = 0.001
 *   (standard KS table, from memory; as in haar-sampler.test.ts).
 * - Inertia rejection rate: with moments J_i(1 + σ n_i), the triangle inequality J1 + J2 ≥ J3 of
 *   diag(1, 1, 1.8) fails with probability Φ(−0.2 / (σ√(1 + 1 + 1.8²))) (a Gaussian linear
 *   combination; the reordering of moments is a 5e-5 effect at σ = 0.1), Φ from mathjs's erf.
 * Angles are recomputed here from the drawn quaternions with the npm `quaternion` package.
 */
import { describe, expect, it } from 'vitest';
import Quaternion from 'quaternion';
import { erf } from 'mathjs';
import { drawCase, type NominalCase } from '../../app/engine/study/sample';
import type { StudyDefinition } from '../../app/engine/scenario/study';
import { validateInertia } from '../../app/engine/body/inertia';
import { symmetricEigen3, m3FromRows } from '../../app/engine/math/mat3';
import { RAD_PER_DEG } from '../../app/engine/units';

const KS_001 = (n: number) => 1.9495 / Math.sqrt(n);

function ks(samples: number[], cdf: (x: number) => number): number {
  const s = [...samples].sort((a, b) => a - b);
  let d = 0;
  s.forEach((x, i) => {
    const f = cdf(x);
    d = Math.max(d, f - i / s.length, (i + 1) / s.length - f);
  });
  return d;
}

function def(over: Partial<StudyDefinition> = {}): StudyDefinition {
  return {
    runs: 1,
    seed: 99,
    controllers: null,
    durationS: 600,
    mode: 'step-target',
    stopAfterSettledForS: 20,
    worstCases: 5,
    attitude: { mode: 'nominal' },
    rateSigmaRadPerS: 0,
    inertia: { momentSigmaFraction: 0, axisMisalignmentSigmaRad: 0 },
    wheels: { torqueDegradationMax: 0, momentumDegradationMax: 0, failOneWheelProbability: 0 },
    sensors: { attitudeNoiseScale: [1, 1], rateBiasSigmaRadPerS: 0, adversarialEta: 0 },
    controlRateHz: null,
    actuation: null,
    torqueQuantumNm: null,
    ...over,
  };
}

// Nominal start and target: arbitrary unit quaternions ([x, y, z, w]).
const qStart = [0.1, -0.3, 0.2, Math.sqrt(1 - 0.14)];
const qTarget = [0.5, 0.5, -0.5, 0.5];
const nominal = (
  inertiaRows = [
    [0.1, 0.001, 0],
    [0.001, 0.12, 0],
    [0, 0, 0.08],
  ],
): NominalCase => ({
  qInitial: qStart,
  qTarget,
  omega0: [0, 0, 0],
  inertia: m3FromRows(inertiaRows),
  nWheels: 4,
  attitudeNoiseRad: 1e-5,
  rateBiasRadPerS: [0, 0, 0],
  controlRateHz: 10,
  actuation: 'hold',
});

/** Quaternion package wants (w, x, y, z). */
const Q = (q: readonly number[]) => new Quaternion(q[3], q[0], q[1], q[2]);
/** Rotation taking a to b: a* b, as (angle in [0, π], unit axis). */
function relative(a: readonly number[], b: readonly number[]): { angle: number; axis: number[]; w: number } {
  const r = Q(a).conjugate().mul(Q(b));
  const w = r.w,
    v = [r.x, r.y, r.z];
  const s = Math.hypot(v[0]!, v[1]!, v[2]!);
  const sg = w < 0 ? -1 : 1;
  return { angle: 2 * Math.atan2(s, Math.abs(w)), axis: v.map((x) => (sg * x) / s), w };
}

const N = 4000;
const F = (t: number) => t - Math.sin(t);

describe('initial attitude dispersions', () => {
  it('uniform: the angle to the target follows the Haar law (Miles 1965), KS at α = 0.001', () => {
    const d = def({ attitude: { mode: 'uniform' } });
    const angles = Array.from({ length: N }, (_, i) => relative(qTarget, drawCase(d, nominal(), i).q0).angle);
    expect(ks(angles, (t) => F(t) / Math.PI)).toBeLessThan(KS_001(N));
  });

  it('cone: angle from the nominal start follows the Haar law restricted to [0, α]; axis uniform', () => {
    const alpha = 40 * RAD_PER_DEG;
    const d = def({ attitude: { mode: 'cone', maxAngleRad: alpha } });
    const rel = Array.from({ length: N }, (_, i) => relative(qStart, drawCase(d, nominal(), i).q0));
    expect(Math.max(...rel.map((r) => r.angle))).toBeLessThanOrEqual(alpha + 1e-12);
    expect(
      ks(
        rel.map((r) => r.angle),
        (t) => F(t) / F(alpha),
      ),
    ).toBeLessThan(KS_001(N));
    expect(
      ks(
        rel.map((r) => r.axis[2]!),
        (z) => (z + 1) / 2,
      ),
    ).toBeLessThan(KS_001(N));
    // Power: the naive "uniform angle" law is rejected by the same test.
    expect(
      ks(
        rel.map((r) => r.angle),
        (t) => t / alpha,
      ),
    ).toBeGreaterThan(KS_001(N));
  });

  it('near-reversal: error angle in [180° − w, 180°] with the restricted Haar law, both hemispheres, axis uniform', () => {
    const w = 8 * RAD_PER_DEG;
    const d = def({ attitude: { mode: 'near-reversal', withinRad: w } });
    const draws = Array.from({ length: N }, (_, i) => drawCase(d, nominal(), i));
    const rel = draws.map((c) => relative(qTarget, c.q0));
    const a = Math.PI - w;
    expect(Math.min(...rel.map((r) => r.angle))).toBeGreaterThanOrEqual(a - 1e-12);
    expect(
      ks(
        rel.map((r) => r.angle),
        (t) => (F(t) - F(a)) / (F(Math.PI) - F(a)),
      ),
    ).toBeLessThan(KS_001(N));
    expect(
      ks(
        rel.map((r) => r.axis[2]!),
        (z) => (z + 1) / 2,
      ),
    ).toBeLessThan(KS_001(N));
    // Hemisphere: the sign of the error's scalar part is a fair coin (within 4σ of a binomial).
    const neg = rel.filter((r) => r.w < 0).length;
    expect(Math.abs(neg - N / 2)).toBeLessThan(4 * Math.sqrt(N / 4));
    // The case's own record of its initial error agrees with the package's arithmetic.
    draws.slice(0, 50).forEach((c, i) => {
      expect(c.errorAngleRad).toBeCloseTo(rel[i]!.angle, 12);
      expect(Math.sign(c.errorEta)).toBe(Math.sign(rel[i]!.w));
      for (let k = 0; k < 3; k++) expect(c.errorAxis[k]).toBeCloseTo(rel[i]!.axis[k]!, 10);
    });
  });
});

describe('a case depends only on (seed, index); dispersions do not disturb each other', () => {
  it('the same case twice is identical; another seed differs', () => {
    const d = def({
      attitude: { mode: 'uniform' },
      rateSigmaRadPerS: 0.01,
      sensors: { attitudeNoiseScale: [0.5, 2], rateBiasSigmaRadPerS: 1e-4, adversarialEta: 0 },
    });
    expect(drawCase(d, nominal(), 17)).toEqual(drawCase(d, nominal(), 17));
    expect(drawCase({ ...d, seed: 100 }, nominal(), 17).q0).not.toEqual(drawCase(d, nominal(), 17).q0);
  });

  it('turning the inertia, wheel and rate dispersions on leaves the attitude and noise draws unchanged', () => {
    const base = def({ attitude: { mode: 'cone', maxAngleRad: 1 } });
    const more = def({
      attitude: { mode: 'cone', maxAngleRad: 1 },
      rateSigmaRadPerS: 0.02,
      inertia: { momentSigmaFraction: 0.1, axisMisalignmentSigmaRad: 0.05 },
      wheels: { torqueDegradationMax: 0.3, momentumDegradationMax: 0.3, failOneWheelProbability: 0.5 },
      controlRateHz: [2, 5, 10],
    });
    for (let i = 0; i < 20; i++) {
      const a = drawCase(base, nominal(), i),
        b = drawCase(more, nominal(), i);
      expect(b.q0).toEqual(a.q0);
      expect(b.noiseSeed).toBe(a.noiseSeed);
      expect(b.attitudeNoiseRad).toBe(a.attitudeNoiseRad);
    }
  });
});

describe('inertia dispersion keeps only physical samples and counts the rejections', () => {
  it('diag(1, 1, 1.8) with σ = 10 %: every kept sample is physical; the rejection rate matches Φ(−0.2/(σ√5.24))', () => {
    const sigma = 0.1;
    const d = def({ inertia: { momentSigmaFraction: sigma, axisMisalignmentSigmaRad: 0 } });
    const nom = nominal([
      [1, 0, 0],
      [0, 1, 0],
      [0, 0, 1.8],
    ]);
    const cases = 3000;
    let rejections = 0;
    for (let i = 0; i < cases; i++) {
      const c = drawCase(d, nom, i);
      expect(c.inertiaRows).not.toBeNull();
      expect(validateInertia(c.inertiaRows, 'inertia').ok).toBe(true);
      rejections += c.inertiaRejections;
    }
    const attempts = cases + rejections;
    const pHat = rejections / attempts;
    const z = -0.2 / (sigma * Math.sqrt(1 + 1 + 1.8 * 1.8));
    const p = 0.5 * (1 + (erf(z / Math.SQRT2) as number));
    expect(p).toBeCloseTo(0.1912, 3);
    expect(Math.abs(pHat - p)).toBeLessThan(4 * Math.sqrt((p * (1 - p)) / attempts));
  });

  it('axis misalignment alone turns the principal axes and keeps the principal moments', () => {
    const d = def({ inertia: { momentSigmaFraction: 0, axisMisalignmentSigmaRad: 5 * RAD_PER_DEG } });
    const rows = [
      [0.1, 0.001, 0],
      [0.001, 0.12, 0],
      [0, 0, 0.08],
    ];
    const m0 = symmetricEigen3(m3FromRows(rows)).values;
    for (let i = 0; i < 30; i++) {
      const c = drawCase(d, nominal(rows), i);
      expect(c.inertiaRejections).toBe(0);
      const J = m3FromRows(c.inertiaRows!);
      const m = symmetricEigen3(J).values;
      for (let k = 0; k < 3; k++) expect(m[k]).toBeCloseTo(m0[k]!, 12);
      expect(Math.abs(J[3]! - 0.001) + Math.abs(J[6]!) + Math.abs(J[7]!)).toBeGreaterThan(1e-6);
    }
  });

  it('moment dispersion: sample mean and spread of each principal moment match J_i and σJ_i', () => {
    const sigma = 0.05;
    const d = def({ inertia: { momentSigmaFraction: sigma, axisMisalignmentSigmaRad: 0 } });
    const nom = nominal([
      [0.1, 0, 0],
      [0, 0.12, 0],
      [0, 0, 0.08],
    ]);
    const n = 2000;
    const xs = Array.from({ length: n }, (_, i) => drawCase(d, nom, i).inertiaRows![1]![1]!);
    const mean = xs.reduce((a, b) => a + b, 0) / n;
    const sd = Math.sqrt(xs.reduce((a, b) => a + (b - mean) ** 2, 0) / (n - 1));
    expect(Math.abs(mean - 0.12)).toBeLessThan((4 * (sigma * 0.12)) / Math.sqrt(n));
    expect(Math.abs(sd / (sigma * 0.12) - 1)).toBeLessThan(4 / Math.sqrt(2 * n));
  });
});

describe('wheel, sensor and rate dispersions', () => {
  it('degradation factors lie in [1 − max, 1]; a lost wheel is drawn with the given probability, uniformly over wheels', () => {
    const d = def({ wheels: { torqueDegradationMax: 0.2, momentumDegradationMax: 0.4, failOneWheelProbability: 0.25 } });
    const n = 4000;
    const lost = [0, 0, 0, 0];
    let failures = 0;
    for (let i = 0; i < n; i++) {
      const c = drawCase(d, nominal(), i);
      for (const f of c.wheelTorqueFactor) expect(f >= 0.8 && f <= 1).toBe(true);
      for (const f of c.wheelMomentumFactor) expect(f >= 0.6 && f <= 1).toBe(true);
      if (c.failedWheel >= 0) {
        failures++;
        lost[c.failedWheel]!++;
      }
    }
    expect(Math.abs(failures - 0.25 * n)).toBeLessThan(4 * Math.sqrt(n * 0.25 * 0.75));
    for (const k of lost) expect(Math.abs(k - failures / 4)).toBeLessThan(4 * Math.sqrt((failures * 3) / 16));
  });

  it('control rate and actuation are picked from their lists; noise scale within [min, max]', () => {
    const d = def({
      controlRateHz: [2, 5, 10],
      actuation: ['hold', 'pwm'],
      sensors: { attitudeNoiseScale: [0.5, 3], rateBiasSigmaRadPerS: 0, adversarialEta: 0.1 },
    });
    const seen = new Set<string>();
    for (let i = 0; i < 300; i++) {
      const c = drawCase(d, nominal(), i);
      seen.add(`${c.controlRateHz}/${c.actuation}`);
      expect(c.attitudeNoiseRad).toBeGreaterThanOrEqual(0.5e-5);
      expect(c.attitudeNoiseRad).toBeLessThanOrEqual(3e-5);
      expect(c.adversarialEta).toBe(0.1);
    }
    expect(seen.size).toBe(6);
  });
});
