/**
 * resolveScenario against independent computations:
 * - Euler sequences: the npm `quaternion` package 2.2.0 `fromEuler(φ, θ, ψ, order)`, whose source
 *   documents the product axisAngle(order[0], φ)·axisAngle(order[1], θ)·axisAngle(order[2], ψ)
 *   (scalar first). That is our intrinsic convention R = R_i(a) R_j(b) R_k(c); the test checks
 *   the package's order against its own `fromAxisAngle` products first, so a differing convention
 *   would show up as a failure of that check rather than a silent pass.
 * - pointing: the defining properties of the two-vector (TRIAD) attitude (Black, AIAA Journal
 *   2(7), 1964): R·b = r exactly, and the secondary misalignment is the least possible,
 *   |∠(b, b₂) − ∠(r, r₂)|, checked also by rotating about r.
 * - relative: q_k = q_(k−1) ⊗ q_rel with the `quaternion` package's `mul` and `fromAxisAngle`.
 * - unit conversions (deg, arcsec, mN·m, mN·m·s) by definition.
 * - the synergistic example parameters against the scaling (A, k) → (cA, k/c) and the warp bound
 *   k < 1/(tr A − λ_min) (method: Berkane & Tayebi, IEEE TAC 62(1), 2017; the certified values
 *   A = diag(1, 2, 3), k = 0.15, δ* = 0.249989 were derived for this project, methods note §4.3).
 */
import { potentialMatrix } from '../../app/engine/control/laws/synergistic/definition';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import Quaternion from 'quaternion';
import { EULER_SEQUENCES, qAngleBetween, qRotate } from '../../app/engine/math/rotation';
import { m3Get } from '../../app/engine/math/mat3';
import { makeRng } from '../../app/engine/math/prng';
import { loadScenario } from '../../app/engine/scenario/load';
import type { ResolvedScenario } from '../../app/engine/scenario/resolve';
import { loadExample } from '../unit/scenario-fixtures';
import { DEG_PER_RAD, RAD_PER_DEG } from '../../app/engine/units';

function resolved(json: unknown): ResolvedScenario {
  const r = loadScenario(json);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

/** |⟨a, b⟩| close to 1: same attitude up to the quaternion sign. */
function expectSameAttitude(ours: ArrayLike<number>, ref: { w: number; x: number; y: number; z: number }, tol = 1e-12) {
  const d = ours[0]! * ref.x + ours[1]! * ref.y + ours[2]! * ref.z + ours[3]! * ref.w;
  expect(1 - Math.abs(d)).toBeLessThan(tol);
}

type V3 = [number, number, number];
const axisOf = (c: string): V3 => (c === 'X' ? [1, 0, 0] : c === 'Y' ? [0, 1, 0] : [0, 0, 1]);

describe('Euler targets', () => {
  it('the quaternion package composes fromEuler as a product of its own axis-angle rotations (all 12 orders)', () => {
    for (const seq of EULER_SEQUENCES) {
      const [a, b, c] = [0.3, -1.1, 2.2];
      const ref = Quaternion.fromEuler(a, b, c, seq);
      const prod = Quaternion.fromAxisAngle(axisOf(seq[0]!), a)
        .mul(Quaternion.fromAxisAngle(axisOf(seq[1]!), b))
        .mul(Quaternion.fromAxisAngle(axisOf(seq[2]!), c));
      expectSameAttitude([prod.x, prod.y, prod.z, prod.w], ref, 1e-14);
    }
  });

  it('all 12 sequences match quaternion.fromEuler on random angles', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...EULER_SEQUENCES),
        fc.tuple(
          fc.double({ min: -360, max: 360, noNaN: true }),
          fc.double({ min: -360, max: 360, noNaN: true }),
          fc.double({ min: -360, max: 360, noNaN: true }),
        ),
        (seq, angles) => {
          const s = loadExample('tern12-reversal');
          s.initial.attitude = { euler: { sequence: seq, anglesDeg: angles } };
          s.targets[0].attitude = { euler: { sequence: seq, anglesDeg: angles } };
          const r = resolved(s);
          const ref = Quaternion.fromEuler(angles[0] * RAD_PER_DEG, angles[1] * RAD_PER_DEG, angles[2] * RAD_PER_DEG, seq);
          expectSameAttitude(r.initial.qInertialFromBody, ref);
          expectSameAttitude(r.targets[0]!.qInertialFromBody, ref);
        },
      ),
      { numRuns: 200, seed: 7 },
    );
  });

  it('a hand case: ZYX (90°, 0, 0) turns body +X onto inertial +Y (right-hand rule about Z)', () => {
    const s = loadExample('tern12-reversal');
    s.initial.attitude = { euler: { sequence: 'ZYX', anglesDeg: [90, 0, 0] } };
    const q = resolved(s).initial.qInertialFromBody;
    const v = qRotate(new Float64Array(3), q, [1, 0, 0]);
    expect(Array.from(v).map((x) => Math.round(x * 1e12) / 1e12 + 0)).toEqual([0, 1, 0]);
  });
});

describe('pointing targets', () => {
  const rng = makeRng(11, 3);
  const gauss = (): V3 => [rng.normal(), rng.normal(), rng.normal()];
  const unit = (v: number[]) => {
    const n = Math.hypot(...v);
    return v.map((x) => x / n);
  };
  const angle = (a: number[], b: number[]) =>
    Math.atan2(
      Math.hypot(a[1]! * b[2]! - a[2]! * b[1]!, a[2]! * b[0]! - a[0]! * b[2]!, a[0]! * b[1]! - a[1]! * b[0]!),
      a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!,
    );
  const sinA = (a: number[], b: number[]) => Math.sin(angle(a, b));

  it('R·b = r exactly and the secondary misalignment is the least possible', () => {
    for (let run = 0; run < 300; run++) {
      const [b, r, b2, r2] = [gauss(), gauss(), gauss(), gauss()];
      if (sinA(b, b2) < 0.05 || sinA(r, r2) < 0.05) continue;
      const s = loadExample('lumen6-imaging');
      s.targets[3].attitude = { pointing: { bodyAxis: b, inertialDirection: r, bodySecondary: b2, inertialSecondary: r2 } };
      const q = resolved(s).targets[3]!.qInertialFromBody;
      const Rb = Array.from(qRotate(new Float64Array(3), q, b));
      const ru = unit(r).map((x) => x * Math.hypot(...b));
      for (let i = 0; i < 3; i++) expect(Math.abs(Rb[i]! - ru[i]!)).toBeLessThan(1e-12);
      const Rb2 = Array.from(qRotate(new Float64Array(3), q, b2));
      const mis = angle(Rb2, r2);
      // Rotating about r keeps ∠(R b2, r) = ∠(b, b2); the closest R b2 can come to r2 is the
      // difference of the two cone angles about r.
      expect(Math.abs(mis - Math.abs(angle(b, b2) - angle(r, r2)))).toBeLessThan(1e-9);
      // And any extra rotation about r makes it worse.
      for (const d of [-0.02, 0.02]) {
        const qr = Quaternion.fromAxisAngle(r, d);
        const v = qr.rotateVector(Rb2 as V3) as V3;
        expect(angle(v, r2)).toBeGreaterThan(mis - 1e-12);
      }
    }
  });

  it('Lumen-6 starts Sun-pointing: body −Z on the Sun direction, body +X as near celestial north as it can be', () => {
    const r = resolved(loadExample('lumen6-imaging'));
    const sun = unit([0.9922, -0.1148, -0.0488]);
    const v = Array.from(qRotate(new Float64Array(3), r.initial.qInertialFromBody, [0, 0, -1]));
    for (let i = 0; i < 3; i++) expect(v[i]).toBeCloseTo(sun[i]!, 14);
    const x = Array.from(qRotate(new Float64Array(3), r.initial.qInertialFromBody, [1, 0, 0]));
    expect(angle(x, [0, 0, 1])).toBeCloseTo(Math.abs(Math.PI / 2 - angle(sun, [0, 0, 1])), 12);
  });
});

describe('relative targets', () => {
  it('compose on the previous target: q_k = q_(k−1) ⊗ q_rel (quaternion package)', () => {
    const s = loadExample('lumen6-imaging');
    s.targets.splice(2, 0, { label: 'extra', attitude: { relative: { axis: [0.3, -2, 0.5], angleDeg: 33 } }, holdS: 0 });
    const r = resolved(s);
    const q1 = r.targets[0]!.qInertialFromBody;
    const prev = new Quaternion(q1[3], q1[0], q1[1], q1[2]);
    const k2 = prev.mul(Quaternion.fromAxisAngle([1, 0, 0], -14 * RAD_PER_DEG));
    const k3 = k2.mul(Quaternion.fromAxisAngle([0.3, -2, 0.5], 33 * RAD_PER_DEG));
    expectSameAttitude(r.targets[1]!.qInertialFromBody, k2, 1e-14);
    expectSameAttitude(r.targets[2]!.qInertialFromBody, k3, 1e-14);
    expect(qAngleBetween(r.targets[1]!.qInertialFromBody, r.targets[0]!.qInertialFromBody)).toBeCloseTo(14 * RAD_PER_DEG, 12);
  });

  it('the first target composes on the initial attitude (Tern-12 reversal is 175°)', () => {
    const r = resolved(loadExample('tern12-reversal'));
    expect(qAngleBetween(r.initial.qInertialFromBody, r.targets[0]!.qInertialFromBody) * DEG_PER_RAD).toBeCloseTo(175, 10);
    const q0 = r.initial.qInertialFromBody;
    const ref = new Quaternion(q0[3], q0[0], q0[1], q0[2]).mul(Quaternion.fromAxisAngle([0.15, 0.2, 0.97], 175 * RAD_PER_DEG));
    expectSameAttitude(r.targets[0]!.qInertialFromBody, ref, 1e-14);
  });
});

describe('SI conversion and the example vehicles', () => {
  it('Lumen-6 units', () => {
    const r = resolved(loadExample('lumen6-imaging'));
    const v = r.vehicle;
    expect(m3Get(v.inertiaKgm2, 0, 1)).toBe(0.0012);
    expect(m3Get(v.inertiaKgm2, 2, 0)).toBe(-0.0008);
    expect(m3Get(v.inertiaKgm2, 1, 1)).toBe(0.12);
    expect(v.wheelLayout).toBe('pyramid');
    expect(v.wheels).toHaveLength(4);
    for (const w of v.wheels) {
      expect(w.maxTorqueNm).toBeCloseTo(0.002, 15);
      expect(w.maxMomentumNms).toBeCloseTo(0.006, 15);
      // Cant on cube diagonals: cos β = 1/√3 (references: Markley et al., JGCD 33(5), 2010 geometry).
      expect(w.axis[2]).toBeCloseTo(1 / Math.sqrt(3), 11);
    }
    // Azimuths 45° + 90°k (references §3: the cube-diagonal pyramid).
    expect(Math.atan2(v.wheels[0]!.axis[1]!, v.wheels[0]!.axis[0]!)).toBeCloseTo(Math.PI / 4, 15);
    expect(v.sensors.attitudeNoiseRad).toBeCloseTo((10 / 3600) * RAD_PER_DEG, 18);
    expect(v.sensors.rateBiasRadPerS[0]).toBeCloseTo(0.0011 * RAD_PER_DEG, 18);
    expect(v.controlRateHz).toBe(10);
    expect(v.wheelFriction!.coulombNm).toBeCloseTo(1e-6, 18);
    expect(Array.from(r.initial.hWheelNms)).toEqual([0.0005, -0.0005, 0.0005, -0.0005]);
    expect(r.initial.omegaBody[1]).toBeCloseTo(-0.01 * RAD_PER_DEG, 18);
    expect(r.planning.slewRateLimitRadPerS).toBeCloseTo(3 * RAD_PER_DEG, 15);
    expect(r.simulation.settleAngleRad).toBeCloseTo(0.1 * RAD_PER_DEG, 15);
    expect(r.keepOut[0]!.halfAngleRad).toBeCloseTo(40 * RAD_PER_DEG, 15);
    expect(Math.hypot(...r.keepOut[0]!.inertialDirection)).toBeCloseTo(1, 15);
    expect(r.epoch.unixMs).toBe(Date.UTC(2030, 2, 14, 10, 0, 0));
  });

  it('Lumen-6 uses all four attitude forms and the 6U ranges of common practice', () => {
    const r = resolved(loadExample('lumen6-imaging'));
    const forms = new Set([r.initial.form, ...r.targets.map((t) => t.form)]);
    expect([...forms].sort()).toEqual(['euler', 'pointing', 'quaternion', 'relative']);
    // 6U inertia ≈ 0.05–0.2 kg·m² (references §5, common practice, no source).
    for (let i = 0; i < 3; i++) expect(m3Get(r.vehicle.inertiaKgm2, i, i)).toBeGreaterThan(0.05);
    expect(r.targets.slice(0, 3).every((t) => t.holdS === 30)).toBe(true);
    expect(r.controllers.map((c) => c.law)).toEqual(['quaternion-pd', 'hysteretic', 'synergistic']);
  });

  it('synergistic examples are the certified set scaled by c: (A, k, δ) = (c·diag(1,2,3), 0.15/c, 0.2c)', () => {
    for (const name of ['lumen6-imaging', 'tern12-reversal'] as const) {
      const r = resolved(loadExample(name));
      const syn = r.controllers.find((c) => c.law === 'synergistic');
      if (!syn || syn.law !== 'synergistic') throw new Error('no synergistic controller');
      const c = syn.potentialWeights[0]!;
      expect(syn.potentialWeights[1]! / c).toBeCloseTo(2, 14);
      expect(syn.potentialWeights[2]! / c).toBeCloseTo(3, 14);
      expect(syn.warpGain * c).toBeCloseTo(0.15, 14);
      // Jump threshold below the scaled certified gap 0.249989·c (80 % of it, methods §5 step 6).
      expect(syn.gapThreshold).toBeLessThan(0.249989 * c);
      expect(syn.gapThreshold / c).toBeCloseTo(0.2, 14);
      // Warp bound k < 1/(tr A − λ_min) keeps each warp a diffeomorphism.
      const tr = syn.potentialWeights[0]! + syn.potentialWeights[1]! + syn.potentialWeights[2]!;
      expect(syn.warpGain).toBeLessThan(1 / (tr - c));
      // Default and explicit axes agree: A = diag(λ) in the error-frame axes.
      const A = potentialMatrix(syn.potentialWeights, syn.potentialAxes);
      expect(m3Get(A, 1, 1)).toBeCloseTo(2 * c, 15);
      expect(m3Get(A, 0, 2)).toBe(0);
      expect(syn.warpDirections.map((u) => Array.from(u))).toEqual([
        [1, 0, 0],
        [0, 1, 0],
        [0, 0, 1],
      ]);
    }
  });

  it('Kestrel-60: custom axes normalised, quantized torque in N·m, ~60 kg-class inertia', () => {
    const r = resolved(loadExample('kestrel60-momentum'));
    const w = r.vehicle.wheels;
    expect(r.vehicle.wheelLayout).toBe('custom');
    expect(w).toHaveLength(4);
    for (const i of [0, 1, 2]) expect(w[3]!.axis[i]).toBeCloseTo(1 / Math.sqrt(3), 15);
    expect(w[0]!.maxMomentumNms).toBeCloseTo(0.25, 15);
    const act = r.vehicle.actuation;
    expect(act.mode === 'quantized' ? act.quantumNm : NaN).toBeCloseTo(5e-5, 18);
    // 50–100 kg smallsat ≈ 2–10 kg·m² (references §5, common practice, no source).
    for (let i = 0; i < 3; i++) expect(m3Get(r.vehicle.inertiaKgm2, i, i)).toBeGreaterThan(2);
    expect(r.epoch.unixMs).toBe(Date.UTC(2030, 10, 20, 22, 15, 30, 500));
    expect(Array.from(r.initial.hWheelNms).map((x) => Math.round(x * 1e6) / 1e6)).toEqual([0.06, -0.04, 0.035, 0.02]);
  });
});
