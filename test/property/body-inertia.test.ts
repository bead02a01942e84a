/**
 * Property tests of validateInertia: garbage in → a Result with errors (never a throw, never NaN);
 * physically valid inertias (moments satisfying the triangle inequality, rotated by a uniform
 * random attitude, Shoemake 1992) are accepted and their moments recovered, since similarity
 * transforms preserve eigenvalues (standard linear algebra).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { validateInertia } from '../../app/engine/body/inertia';
import { makeRng } from '../../app/engine/math/prng';
import { qRandomUniform, qToMat3 } from '../../app/engine/math/rotation';
import { m3Multiply, m3Transpose, m3Diag, m3ToRows } from '../../app/engine/math/mat3';

function checkResultShape(rows: unknown): void {
  const r = validateInertia(rows);
  if (r.ok) {
    for (const v of [...r.value.J, ...r.value.moments, ...r.value.axes]) expect(Number.isFinite(v)).toBe(true);
  } else {
    expect(r.errors.length).toBeGreaterThan(0);
    for (const i of r.errors) {
      expect(i.path.startsWith('inertia')).toBe(true);
      expect(i.rule.length).toBeGreaterThan(0);
      expect(typeof i.message).toBe('string');
      expect(i.message).not.toMatch(/undefined/);
    }
  }
}

describe('validateInertia on garbage (fast-check)', () => {
  it('anything at all', () => {
    fc.assert(
      fc.property(fc.anything(), (v) => checkResultShape(v)),
      { numRuns: 500 },
    );
  });

  it('3×3-ish arrays of arbitrary doubles, NaN and infinities included', () => {
    const entry = fc.oneof(fc.double(), fc.constantFrom(NaN, Infinity, -Infinity, 0, -0, 1e-320), fc.anything());
    const row = fc.array(entry, { minLength: 0, maxLength: 4 });
    fc.assert(
      fc.property(fc.array(row, { minLength: 0, maxLength: 4 }), (rows) => checkResultShape(rows)),
      { numRuns: 1000 },
    );
  });

  it('finite 3×3 arrays: valid or rejected with a named rule, never NaN', () => {
    const entry = fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e6, max: 1e6 });
    fc.assert(
      fc.property(fc.array(fc.array(entry, { minLength: 3, maxLength: 3 }), { minLength: 3, maxLength: 3 }), (rows) => {
        checkResultShape(rows);
        const r = validateInertia(rows);
        if (!r.ok) for (const i of r.errors) expect(['symmetric', 'positive-definite', 'triangle-inequality', 'range']).toContain(i.rule);
      }),
      { numRuns: 1000 },
    );
  });
});

describe('validateInertia on physical inertias', () => {
  it('R diag(J1,J2,J3) Rᵀ with J1 + J2 ≥ J3 is accepted and the moments recovered', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 2 ** 31 - 1 }),
        fc.double({ min: 0.01, max: 10, noNaN: true }),
        fc.double({ min: 0.01, max: 10, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        (seed, a, b, u) => {
          // J3 anywhere in [|a − b|, a + b] keeps all three triangle inequalities.
          const c = Math.abs(a - b) + u * (a + b - Math.abs(a - b));
          if (!(c > 1e-3)) return;
          const q = qRandomUniform(new Float64Array(4), makeRng(seed));
          const R = qToMat3(new Float64Array(9), q);
          const J = m3Multiply(
            new Float64Array(9),
            m3Multiply(new Float64Array(9), R, m3Diag(a, b, c)),
            m3Transpose(new Float64Array(9), R),
          );
          // symmetrise the rounding of the product
          const rows = m3ToRows(J).map((row, r) => row.map((v, k) => (r <= k ? v : m3ToRows(J)[k]![r])));
          const res = validateInertia(rows);
          expect(res.ok).toBe(true);
          if (!res.ok) return;
          const sorted = [a, b, c].sort((x, y) => x - y);
          for (let i = 0; i < 3; i++) expect(Math.abs(res.value.moments[i]! - sorted[i]!)).toBeLessThan(1e-12 * (a + b + c));
        },
      ),
      { numRuns: 300 },
    );
  });
});
