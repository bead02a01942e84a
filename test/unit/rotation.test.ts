/**
 * Rotation helpers: checks from methods.md §1.1 (standard quaternion identities; i ⊗ j = k, the
 * 90°-about-Z matrix), Shoemake's uniform sampler (Graphics Gems III, 1992), TRIAD (Black 1964),
 * and the gl-matrix aliasing habit (out may alias an input).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  qAngle,
  qAngleBetween,
  qConjMultiply,
  qConjugate,
  qDerivative,
  qError,
  qFromAxisAngle,
  qFromTwoVectors,
  qFromValues,
  qMultiply,
  qNormalize,
  qRandomUniform,
  qRotate,
  qToAxisAngle,
  qToMat3,
} from '../../app/engine/math/rotation';
import { makeRng } from '../../app/engine/math/prng';
import { symmetricEigen3, m3FromRows, m3Invert, m3Multiply, m3Identity } from '../../app/engine/math/mat3';

describe('quaternion basics (methods.md §1.1, standard identities)', () => {
  it('i ⊗ j = k', () => {
    const k = qMultiply(new Float64Array(4), qFromValues(1, 0, 0, 0), qFromValues(0, 1, 0, 0));
    expect(Array.from(k)).toEqual([0, 0, 1, 0]);
  });

  it('90° about Z gives R = [[0,-1,0],[1,0,0],[0,0,1]] (body to inertial)', () => {
    const q = qFromAxisAngle(new Float64Array(4), [0, 0, 1], Math.PI / 2);
    const m = qToMat3(new Float64Array(9), q);
    const rows = [
      [0, -1, 0],
      [1, 0, 0],
      [0, 0, 1],
    ];
    for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) expect(m[3 * c + r]).toBeCloseTo(rows[r]![c]!, 15);
  });

  it('product may alias its inputs (gl-matrix habit)', () => {
    const a = qFromAxisAngle(new Float64Array(4), [1, 2, 3], 0.4);
    const b = qFromAxisAngle(new Float64Array(4), [-1, 0, 2], 1.1);
    const ref = qMultiply(new Float64Array(4), a, b);
    const a2 = Float64Array.from(a);
    qMultiply(a2, a2, b);
    expect(Array.from(a2)).toEqual(Array.from(ref));
    const b2 = Float64Array.from(b);
    qConjMultiply(b2, a, b2);
    const ref2 = qMultiply(new Float64Array(4), qConjugate(new Float64Array(4), a), b);
    for (let i = 0; i < 4; i++) expect(b2[i]).toBeCloseTo(ref2[i]!, 15);
  });

  it('error quaternion: q_e = q_d* ⊗ q is the identity at the target and the same attitude for ±q', () => {
    const qd = qFromAxisAngle(new Float64Array(4), [0.3, -0.2, 0.9], 2.2);
    const e = qError(new Float64Array(4), qd, qd);
    expect(Math.abs(e[3]!)).toBeCloseTo(1, 15);
    const neg = Float64Array.from(qd, (v) => -v);
    expect(qAngle(qError(new Float64Array(4), qd, neg))).toBeCloseTo(0, 7);
  });

  it('shortest angle is accurate near 0 and π (no unclamped acos)', () => {
    const tiny = qFromAxisAngle(new Float64Array(4), [1, 0, 0], 1e-9);
    expect(qAngle(tiny)).toBeCloseTo(1e-9, 20);
    const nearPi = qFromAxisAngle(new Float64Array(4), [0, 1, 0], Math.PI - 1e-9);
    expect(qAngle(nearPi)).toBeCloseTo(Math.PI - 1e-9, 12);
    const over = qFromAxisAngle(new Float64Array(4), [0, 1, 0], Math.PI + 0.5);
    expect(qAngle(over)).toBeCloseTo(Math.PI - 0.5, 12);
    expect(qAngleBetween(tiny, qFromValues(0, 0, 0, 1))).toBeCloseTo(1e-9, 18);
  });

  it('axis–angle round trip over random rotations', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.001, max: Math.PI - 0.001, noNaN: true }),
        fc.tuple(
          fc.double({ min: -1, max: 1, noNaN: true }),
          fc.double({ min: -1, max: 1, noNaN: true }),
          fc.double({ min: -1, max: 1, noNaN: true }),
        ),
        (ang, ax) => {
          if (Math.hypot(...ax) < 1e-3) return;
          const q = qFromAxisAngle(new Float64Array(4), ax, ang);
          const axis = new Float64Array(3);
          expect(qToAxisAngle(axis, q)).toBeCloseTo(ang, 10);
          const n = Math.hypot(...ax);
          for (let i = 0; i < 3; i++) expect(axis[i]).toBeCloseTo(ax[i]! / n, 9);
        },
      ),
      { numRuns: 500 },
    );
  });

  it('normalising a zero quaternion has a defined result and says so', () => {
    const out = new Float64Array(4);
    expect(qNormalize(out, [0, 0, 0, 0])).toBe(false);
    expect(Array.from(out)).toEqual([0, 0, 0, 1]);
    expect(qNormalize(out, [NaN, 0, 0, 1])).toBe(false);
  });

  it('kinematics q̇ = ½ q ⊗ (ω, 0) matches a finite difference of q ⊗ exp(½ ω dt)', () => {
    const q = qFromAxisAngle(new Float64Array(4), [0.2, 0.5, -0.1], 1.3);
    const w = [0.03, -0.02, 0.07];
    const d = new Float64Array(4);
    qDerivative(d, q, w);
    const h = 1e-6;
    const dq = qFromAxisAngle(new Float64Array(4), w, Math.hypot(...w) * h);
    const q2 = qMultiply(new Float64Array(4), q, dq);
    for (let i = 0; i < 4; i++) expect((q2[i]! - q[i]!) / h).toBeCloseTo(d[i]!, 8);
  });
});

describe('uniform random attitudes (Shoemake 1992)', () => {
  it('unit norm and a seeded, repeatable sequence', () => {
    const a = makeRng(42, 7),
      b = makeRng(42, 7),
      c = makeRng(42, 8);
    const qa = new Float64Array(4),
      qb = new Float64Array(4),
      qc = new Float64Array(4);
    let differs = false;
    for (let i = 0; i < 100; i++) {
      qRandomUniform(qa, a);
      qRandomUniform(qb, b);
      qRandomUniform(qc, c);
      expect(Math.hypot(...qa)).toBeCloseTo(1, 14);
      expect(Array.from(qa)).toEqual(Array.from(qb));
      if (qa[0] !== qc[0]) differs = true;
    }
    expect(differs).toBe(true);
  });

  it('mean of R over many samples is ≈ 0 (Haar measure has zero mean matrix)', () => {
    const rng = makeRng(3);
    const q = new Float64Array(4),
      m = new Float64Array(9),
      acc = new Float64Array(9);
    const N = 20000;
    for (let i = 0; i < N; i++) {
      qToMat3(m, qRandomUniform(q, rng));
      for (let k = 0; k < 9; k++) acc[k]! += m[k]! / N;
    }
    // Each entry has variance 1/3 per sample, so the standard error is √(1/(3N)) ≈ 0.004.
    for (let k = 0; k < 9; k++) expect(Math.abs(acc[k]!)).toBeLessThan(0.02);
  });
});

describe('two-vector attitude (TRIAD, Black 1964)', () => {
  it('points the primary exactly and minimises the secondary angle', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -1, max: 1, noNaN: true }), { minLength: 12, maxLength: 12 }), (v) => {
        const b = v.slice(0, 3),
          r = v.slice(3, 6),
          b2 = v.slice(6, 9),
          r2 = v.slice(9, 12);
        const n = (x: number[]) => Math.hypot(...x);
        const cr = (x: number[], y: number[]) =>
          n([x[1]! * y[2]! - x[2]! * y[1]!, x[2]! * y[0]! - x[0]! * y[2]!, x[0]! * y[1]! - x[1]! * y[0]!]) / (n(x) * n(y));
        if (n(b) < 0.1 || n(r) < 0.1 || n(b2) < 0.1 || n(r2) < 0.1 || cr(b, b2) < 0.05 || cr(r, r2) < 0.05) return;
        const q = new Float64Array(4);
        expect(qFromTwoVectors(q, b, r, b2, r2)).toBe(true);
        const rb = qRotate(new Float64Array(3), q, b);
        for (let i = 0; i < 3; i++) expect(rb[i]! / n(b)).toBeCloseTo(r[i]! / n(r), 10);
        // Secondary: the rotated b2 lies in the plane of r and r2, on r2's side.
        const rb2 = qRotate(new Float64Array(3), q, b2);
        const nrm = [r[1]! * r2[2]! - r[2]! * r2[1]!, r[2]! * r2[0]! - r[0]! * r2[2]!, r[0]! * r2[1]! - r[1]! * r2[0]!];
        const off = (rb2[0]! * nrm[0]! + rb2[1]! * nrm[1]! + rb2[2]! * nrm[2]!) / (n(nrm) * n(b2));
        expect(Math.abs(off)).toBeLessThan(1e-9);
      }),
      { numRuns: 300 },
    );
  });

  it('refuses parallel pairs', () => {
    expect(qFromTwoVectors(new Float64Array(4), [1, 0, 0], [0, 1, 0], [2, 0, 0], [0, 0, 1])).toBe(false);
    expect(qFromTwoVectors(new Float64Array(4), [1, 0, 0], [0, 1, 0], [0, 1, 0], [0, -3, 0])).toBe(false);
    expect(qFromTwoVectors(new Float64Array(4), [0, 0, 0], [0, 1, 0], [0, 1, 0], [1, 0, 0])).toBe(false);
  });
});

describe('symmetric eigen-decomposition (Jacobi; checked against A v = λ v)', () => {
  it('reconstructs random symmetric matrices', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -5, max: 5, noNaN: true }), { minLength: 6, maxLength: 6 }), (e) => {
        const A = m3FromRows([
          [e[0]!, e[1]!, e[2]!],
          [e[1]!, e[3]!, e[4]!],
          [e[2]!, e[4]!, e[5]!],
        ]);
        const { values, vectors } = symmetricEigen3(A);
        expect(values[0]).toBeLessThanOrEqual(values[1]!);
        expect(values[1]).toBeLessThanOrEqual(values[2]!);
        for (let k = 0; k < 3; k++) {
          for (let r = 0; r < 3; r++) {
            let av = 0;
            for (let c = 0; c < 3; c++) av += A[3 * c + r]! * vectors[3 * k + c]!;
            expect(av).toBeCloseTo(values[k]! * vectors[3 * k + r]!, 9);
          }
        }
      }),
      { numRuns: 500 },
    );
  });

  it('inverse times matrix is the identity; singular refused', () => {
    const A = m3FromRows([
      [4, 1, 0.5],
      [1, 3, 0.2],
      [0.5, 0.2, 2],
    ]);
    const inv = new Float64Array(9);
    expect(m3Invert(inv, A)).toBe(true);
    const P = m3Multiply(new Float64Array(9), A, inv);
    const I = m3Identity(new Float64Array(9));
    for (let k = 0; k < 9; k++) expect(P[k]).toBeCloseTo(I[k]!, 14);
    expect(
      m3Invert(
        inv,
        m3FromRows([
          [1, 2, 3],
          [2, 4, 6],
          [0, 0, 1],
        ]),
      ),
    ).toBe(false);
  });
});
