/**
 * Rotation module against outside references:
 * - the npm `quaternion` package 2.2.0 (scalar-first Hamilton algebra) on random cases;
 * - CCSDS 504.0-B-2 (Attitude Data Messages, Blue Book Issue 2, 2024) Annex F2: the +90° about Z
 *   example and the constant-rate propagation vector quoted in references.md §1.6;
 * - Euler sequences against products of elementary rotation matrices and mathjs `expm` of skew
 *   matrices (Moler & Van Loan's Padé scaling-and-squaring, as implemented by mathjs 15.2.0).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import Quaternion from 'quaternion';
import * as math from 'mathjs';
import {
  EULER_SEQUENCES,
  qConjugate,
  qFromAxisAngle,
  qFromEuler,
  qFromMat3,
  qFromRotationVector,
  qFromValues,
  qMultiply,
  qPropagateBodyRate,
  qRotate,
  qRotateInverse,
  qToEuler,
  qToMat3,
  qToRotationVector,
} from '../../app/engine/math/rotation';

const unitQuat = fc
  .tuple(
    fc.double({ min: -1, max: 1, noNaN: true }),
    fc.double({ min: -1, max: 1, noNaN: true }),
    fc.double({ min: -1, max: 1, noNaN: true }),
    fc.double({ min: -1, max: 1, noNaN: true }),
  )
  .filter(([a, b, c, d]) => Math.hypot(a, b, c, d) > 0.1)
  .map(([a, b, c, d]) => {
    const n = Math.hypot(a, b, c, d);
    return qFromValues(a / n, b / n, c / n, d / n);
  });
const vec = fc.tuple(
  fc.double({ min: -10, max: 10, noNaN: true }),
  fc.double({ min: -10, max: 10, noNaN: true }),
  fc.double({ min: -10, max: 10, noNaN: true }),
);

/** Our [x, y, z, w] to the library's scalar-first object. */
const lib = (q: ArrayLike<number>) => new Quaternion(q[3], q[0], q[1], q[2]);

describe('quaternion algebra vs npm `quaternion` 2.2.0 (independent implementation)', () => {
  it('Hamilton product matches on 1,000 random pairs', () => {
    fc.assert(
      fc.property(unitQuat, unitQuat, (a, b) => {
        const ours = qMultiply(new Float64Array(4), a, b);
        const theirs = lib(a).mul(lib(b));
        expect(ours[3]).toBeCloseTo(theirs.w, 14);
        expect(ours[0]).toBeCloseTo(theirs.x, 14);
        expect(ours[1]).toBeCloseTo(theirs.y, 14);
        expect(ours[2]).toBeCloseTo(theirs.z, 14);
      }),
      { numRuns: 1000 },
    );
  });

  it('vector rotation q v q* and its inverse match on 1,000 random cases', () => {
    fc.assert(
      fc.property(unitQuat, vec, (q, v) => {
        const ours = qRotate(new Float64Array(3), q, v);
        const theirs = lib(q).rotateVector(v) as number[];
        for (let i = 0; i < 3; i++) expect(ours[i]).toBeCloseTo(theirs[i]!, 12);
        const back = qRotateInverse(new Float64Array(3), q, ours);
        for (let i = 0; i < 3; i++) expect(back[i]).toBeCloseTo(v[i]!, 12);
        const conjTheirs = lib(q).conjugate().rotateVector(v) as number[];
        const conjOurs = qRotate(new Float64Array(3), qConjugate(new Float64Array(4), q), v);
        for (let i = 0; i < 3; i++) expect(conjOurs[i]).toBeCloseTo(conjTheirs[i]!, 12);
      }),
      { numRuns: 1000 },
    );
  });

  it('rotation matrix matches the library (row-major toMatrix) and round-trips', () => {
    fc.assert(
      fc.property(unitQuat, (q) => {
        const m = qToMat3(new Float64Array(9), q);
        const t = lib(q).toMatrix(false) as unknown as number[]; // row-major flat
        for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) expect(m[3 * c + r]).toBeCloseTo(t[3 * r + c]!, 13);
        const back = qFromMat3(new Float64Array(4), m);
        const d = Math.abs(back[0]! * q[0]! + back[1]! * q[1]! + back[2]! * q[2]! + back[3]! * q[3]!);
        expect(d).toBeCloseTo(1, 12);
        expect(back[3]).toBeGreaterThanOrEqual(0);
      }),
      { numRuns: 1000 },
    );
  });

  it('exponential and logarithm maps match the library exp/log', () => {
    fc.assert(
      fc.property(
        fc.tuple(
          fc.double({ min: -3, max: 3, noNaN: true }),
          fc.double({ min: -3, max: 3, noNaN: true }),
          fc.double({ min: -3, max: 3, noNaN: true }),
        ),
        (phi) => {
          if (Math.hypot(...phi) > Math.PI - 1e-3) return;
          const ours = qFromRotationVector(new Float64Array(4), phi);
          // exp of the pure quaternion (0, phi/2)
          const theirs = new Quaternion(0, phi[0] / 2, phi[1] / 2, phi[2] / 2).exp();
          expect(ours[3]).toBeCloseTo(theirs.w, 13);
          for (let i = 0; i < 3; i++) expect(ours[i]).toBeCloseTo([theirs.x, theirs.y, theirs.z][i]!, 13);
          const log = qToRotationVector(new Float64Array(3), ours);
          for (let i = 0; i < 3; i++) expect(log[i]).toBeCloseTo(phi[i]!, 11);
        },
      ),
      { numRuns: 1000 },
    );
  });
});

describe('CCSDS 504.0-B-2 Annex F2 quaternion examples', () => {
  it('B = A turned +90° about Z gives (Q1,Q2,Q3,QC) = (0, 0, 0.7071, 0.7071)', () => {
    // Our attitude quaternion for "body turned +90° about inertial Z" rotates body vectors to inertial.
    const q = qFromAxisAngle(new Float64Array(4), [0, 0, 1], Math.PI / 2);
    expect(q[2]).toBeCloseTo(Math.SQRT1_2, 15);
    expect(q[3]).toBeCloseTo(Math.SQRT1_2, 15);
    // Annex F2: X_A = (1,0,0) has body coordinates X_B = M_BA X_A = (0, -1, 0).
    const xB = qRotateInverse(new Float64Array(3), q, [1, 0, 0]);
    expect(xB[0]).toBeCloseTo(0, 15);
    expect(xB[1]).toBeCloseTo(-1, 15);
    expect(xB[2]).toBeCloseTo(0, 15);
  });

  it('constant body rate propagation q(t) = q(0) ⊗ exp(½ ω t) matches the §1.6 vector (and not the reversed order)', () => {
    const q0 = qFromAxisAngle(new Float64Array(4), [1 / 3, 2 / 3, 2 / 3], 0.7);
    // q0 as printed: (0.1142993, 0.2285985, 0.2285985, 0.9393727)
    expect(Array.from(q0).map((v) => +v.toFixed(7))).toEqual([0.1142993, 0.2285985, 0.2285985, 0.9393727]);
    const q = qPropagateBodyRate(new Float64Array(4), q0, [0.02, -0.03, 0.05], 12);
    const expected = [0.3239846166, 0.0411789922, 0.4416515247, 0.8356328079];
    for (let i = 0; i < 4; i++) expect(q[i]).toBeCloseTo(expected[i]!, 9);
    // Wrong product order (exp ⊗ q0) gives (0.1094995, 0.0545843, 0.5354888, 0.8356328): must differ.
    const dq = qFromRotationVector(new Float64Array(4), [0.24, -0.36, 0.6]);
    const wrong = qMultiply(new Float64Array(4), dq, q0);
    expect(wrong[0]).toBeCloseTo(0.1094995, 6);
    expect(Math.abs(wrong[0]! - q[0]!)).toBeGreaterThan(0.1);
  });

  it('the same propagation via mathjs expm of the 4×4 scalar-last kinematics matrix', () => {
    const w = [0.02, -0.03, 0.05];
    const Om = [
      [0, w[2]!, -w[1]!, w[0]!],
      [-w[2]!, 0, w[0]!, w[1]!],
      [w[1]!, -w[0]!, 0, w[2]!],
      [-w[0]!, -w[1]!, -w[2]!, 0],
    ];
    const E = math.expm(math.multiply(math.matrix(Om), 6) as math.Matrix) as math.Matrix; // ½ Ω t, t = 12
    const q0 = Array.from(qFromAxisAngle(new Float64Array(4), [1 / 3, 2 / 3, 2 / 3], 0.7));
    const viaExpm = (math.multiply(E, q0) as math.Matrix).toArray() as number[];
    const ours = qPropagateBodyRate(new Float64Array(4), q0, w, 12);
    for (let i = 0; i < 4; i++) expect(ours[i]).toBeCloseTo(viaExpm[i]!, 12);
  });
});

describe('Euler sequences (all 12, intrinsic) against elementary rotations and mathjs expm', () => {
  const elem = (axis: number, a: number): number[][] => {
    const c = Math.cos(a),
      s = Math.sin(a);
    if (axis === 0)
      return [
        [1, 0, 0],
        [0, c, -s],
        [0, s, c],
      ];
    if (axis === 1)
      return [
        [c, 0, s],
        [0, 1, 0],
        [-s, 0, c],
      ];
    return [
      [c, -s, 0],
      [s, c, 0],
      [0, 0, 1],
    ];
  };
  const idx = (ch: string) => (ch === 'X' ? 0 : ch === 'Y' ? 1 : 2);
  const hat = (axis: number, a: number) => {
    const v = [0, 0, 0];
    v[axis] = a;
    return [
      [0, -v[2]!, v[1]!],
      [v[2]!, 0, -v[0]!],
      [-v[1]!, v[0]!, 0],
    ];
  };

  for (const seq of EULER_SEQUENCES) {
    it(`${seq}: R = R_i(a) R_j(b) R_k(c) and angles round-trip`, () => {
      fc.assert(
        fc.property(
          fc.double({ min: -3.1, max: 3.1, noNaN: true }),
          fc.double({ min: -1.5, max: 1.5, noNaN: true }),
          fc.double({ min: -3.1, max: 3.1, noNaN: true }),
          (a, b0, c) => {
            const proper = seq[0] === seq[2];
            const b = proper ? Math.abs(b0) * 2 + 0.01 : b0; // proper: (0, π); Tait–Bryan: (−π/2, π/2)
            const q = qFromEuler(new Float64Array(4), seq, a, b, c);
            const m = qToMat3(new Float64Array(9), q);
            const Rm = math.multiply(math.multiply(elem(idx(seq[0]!), a), elem(idx(seq[1]!), b)), elem(idx(seq[2]!), c)) as number[][];
            const Re = math.multiply(
              math.multiply(math.expm(math.matrix(hat(idx(seq[0]!), a))), math.expm(math.matrix(hat(idx(seq[1]!), b)))),
              math.expm(math.matrix(hat(idx(seq[2]!), c))),
            ) as math.Matrix;
            const ReA = Re.toArray() as number[][];
            for (let r = 0; r < 3; r++)
              for (let k = 0; k < 3; k++) {
                expect(m[3 * k + r]).toBeCloseTo(Rm[r]![k]!, 12);
                expect(m[3 * k + r]).toBeCloseTo(ReA[r]![k]!, 11);
              }
            const e = qToEuler(new Float64Array(3), seq, q);
            const q2 = qFromEuler(new Float64Array(4), seq, e[0]!, e[1]!, e[2]!);
            const d = Math.abs(q[0]! * q2[0]! + q[1]! * q2[1]! + q[2]! * q2[2]! + q[3]! * q2[3]!);
            expect(d).toBeCloseTo(1, 12);
            expect(e[0]).toBeCloseTo(a, 9);
            expect(e[1]).toBeCloseTo(b, 9);
            expect(e[2]).toBeCloseTo(c, 9);
          },
        ),
        { numRuns: 200 },
      );
    });
  }

  it('gimbal lock gives a consistent attitude (third angle 0)', () => {
    for (const seq of EULER_SEQUENCES) {
      const b = seq[0] === seq[2] ? 0 : Math.PI / 2;
      const q = qFromEuler(new Float64Array(4), seq, 0.3, b, 0.2);
      const e = qToEuler(new Float64Array(3), seq, q);
      expect(e[2]).toBe(0);
      const q2 = qFromEuler(new Float64Array(4), seq, e[0]!, e[1]!, e[2]!);
      expect(Math.abs(q[0]! * q2[0]! + q[1]! * q2[1]! + q[2]! * q2[2]! + q[3]! * q2[3]!)).toBeCloseTo(1, 10);
    }
  });
});
