/**
 * Study starts for a pointing-only first target (app/engine/study/pointingCase.ts, sample.ts),
 * against distributions stated outside the project:
 * - A uniform unit vector has each component uniform on [−1, 1], and on a spherical cap of
 *   half-angle w about a pole the cosine of the polar angle is uniform on [cos w, 1] (Archimedes'
 *   hat-box theorem: a zone's area is proportional to its height; from memory). The azimuth about
 *   the pole is uniform on [0, 2π) by symmetry.
 * - Under the Haar measure on SO(3) the image R(q)b of a fixed unit vector is uniform on S²
 *   (Miles, "On random rotations in R³", Biometrika 52(3/4), 1965: the axis of a Haar rotation is
 *   uniform and the measure is invariant; from memory).
 * - Kolmogorov–Smirnov one-sample test, asymptotic critical value 1.9495/√n at α = 0.001 (standard
 *   KS table, from memory; as in study-sampling.test.ts).
 * Directions are recomputed from the drawn quaternions with the npm `quaternion` package.
 */
import Quaternion from 'quaternion';
import { describe, expect, it } from 'vitest';
import type { StudyDefinition } from '../../app/engine/scenario/study';
import { m3FromRows } from '../../app/engine/math/mat3';
import { drawCase, type NominalCase } from '../../app/engine/study/sample';
import { caseTarget } from '../../app/engine/study/pointingCase';
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

type V3 = [number, number, number];
const unit = (v: number[]): V3 => {
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  return [v[0]! / n, v[1]! / n, v[2]! / n];
};
const dot = (a: number[], b: number[]) => a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!;
const cross = (a: number[], b: number[]): V3 => [
  a[1]! * b[2]! - a[2]! * b[1]!,
  a[2]! * b[0]! - a[0]! * b[2]!,
  a[0]! * b[1]! - a[1]! * b[0]!,
];
const rot = (q: readonly number[], v: V3) => new Quaternion(q[3]!, q[0]!, q[1]!, q[2]!).rotateVector(v) as V3;
const ang = (a: number[], b: number[]) => Math.atan2(Math.hypot(...cross(a, b)), dot(a, b));

const b = unit([0.6, 0, 0.8]);
const r = unit([-0.2, 0.7, 0.4]);
const qStart = [0.1, -0.3, 0.2, Math.sqrt(1 - 0.14)];
const nominal: NominalCase = {
  qInitial: qStart,
  qTarget: [0, 0, 0, 1],
  omega0: [0, 0, 0],
  inertia: m3FromRows([
    [0.1, 0, 0],
    [0, 0.12, 0],
    [0, 0, 0.08],
  ]),
  nWheels: 4,
  attitudeNoiseRad: 0,
  rateBiasRadPerS: [0, 0, 0],
  controlRateHz: 10,
  actuation: 'hold',
  pointing: { bodyAxis: Float64Array.from(b), inertialDirection: Float64Array.from(r), qHeldRoll: Float64Array.of(0, 0, 0, 1) },
};
function def(attitude: StudyDefinition['attitude']): StudyDefinition {
  return {
    runs: 1,
    seed: 7,
    controllers: null,
    durationS: 60,
    mode: 'step-target',
    stopAfterSettledForS: 20,
    worstCases: 5,
    attitude,
    rateSigmaRadPerS: 0,
    inertia: { momentSigmaFraction: 0, axisMisalignmentSigmaRad: 0 },
    wheels: { torqueDegradationMax: 0, momentumDegradationMax: 0, failOneWheelProbability: 0 },
    sensors: { attitudeNoiseScale: [1, 1], rateBiasSigmaRadPerS: 0, adversarialEta: 0, antipodalNoiseRad: 0.02 },
    controlRateHz: null,
    actuation: null,
    torqueQuantumNm: null,
  };
}
/** A frame ⊥ n, fixed for all draws (from a fixed vector not parallel to n). */
function frame(n: V3): [V3, V3] {
  const c: V3 = [0.3, 0.5, -0.8];
  const e1 = unit(c.map((x, i) => x - dot(c, n) * n[i]!));
  return [e1, cross(n, e1)];
}

describe('near-antipode starts', () => {
  const W = 3 * RAD_PER_DEG;
  const N = 4000;
  const d = def({ mode: 'near-antipode', withinRad: W });
  const draws = Array.from({ length: N }, (_, i) => drawCase(d, nominal, i));
  const minusR: V3 = [-r[0], -r[1], -r[2]];

  it('the pointed axis lies within w of −r, area-uniform over the cap and uniform in azimuth', () => {
    const [e1, e2] = frame(minusR);
    const cosPsi: number[] = [];
    const az: number[] = [];
    for (const c of draws) {
      const x0 = rot(c.q0, b);
      const psi = ang(x0, minusR);
      expect(psi).toBeLessThanOrEqual(W + 1e-12);
      cosPsi.push(Math.cos(psi));
      az.push(Math.atan2(dot(x0, e2), dot(x0, e1)) + Math.PI);
    }
    const c0 = Math.cos(W);
    expect(ks(cosPsi, (x) => (x - c0) / (1 - c0))).toBeLessThan(KS_001(N));
    expect(ks(az, (x) => x / (2 * Math.PI))).toBeLessThan(KS_001(N));
  });

  it('the roll about the pointed axis is uniform', () => {
    // the image of a body axis s ⊥ b, as an azimuth about the drawn pointing x0 in a frame fixed to −r
    const s = unit(cross(b, [0, 1, 0]));
    const [e1] = frame(minusR);
    const roll: number[] = draws.map((c) => {
      const x0 = rot(c.q0, b);
      const f1 = unit(e1.map((x, i) => x - dot(e1, x0) * x0[i]!));
      const f2 = cross(x0, f1);
      const si = rot(c.q0, s);
      return Math.atan2(dot(si, f2), dot(si, f1)) + Math.PI;
    });
    expect(ks(roll, (x) => x / (2 * Math.PI))).toBeLessThan(KS_001(N));
  });

  it("each case's target is its own reduced target, and the drawn error is the pointing error π − ψ", () => {
    const target = {
      label: 'A',
      form: 'pointing' as const,
      qInertialFromBody: Float64Array.of(0, 0, 0, 1),
      holdS: 0,
      pointingOnly: nominal.pointing!,
    };
    for (const c of draws.slice(0, 200)) {
      const t = caseTarget(target, c.q0);
      expect(ang(rot(Array.from(t.qInertialFromBody), b), r)).toBeLessThan(1e-12);
      const pointing = ang(rot(c.q0, b), r);
      expect(Math.abs(c.errorAngleRad - pointing)).toBeLessThan(1e-9);
      expect(c.antipodalNoiseRad).toBe(0.02);
    }
  });
});

describe('uniform starts', () => {
  it('put the pointed axis uniformly over the sphere (each component uniform on [−1, 1])', () => {
    const N = 4000;
    const d = def({ mode: 'uniform' });
    const xs = Array.from({ length: N }, (_, i) => rot(drawCase(d, nominal, i).q0, b));
    for (const axis of [0, 1, 2])
      expect(
        ks(
          xs.map((x) => x[axis]!),
          (z) => (z + 1) / 2,
        ),
      ).toBeLessThan(KS_001(N));
    expect(
      ks(
        xs.map((x) => dot(x, r)),
        (z) => (z + 1) / 2,
      ),
    ).toBeLessThan(KS_001(N));
  });
});
