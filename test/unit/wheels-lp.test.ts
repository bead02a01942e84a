/**
 * The wheels module's small simplex solver (app/engine/wheels/lp.ts).
 *
 * Sources:
 * - V. Chvátal, Linear Programming, Freeman 1983, ch. 2: max 5x₁+4x₂+3x₃ s.t. 2x₁+3x₂+x₃ ≤ 5,
 *   4x₁+x₂+2x₃ ≤ 11, 3x₁+4x₂+2x₃ ≤ 8 has optimum 13 at (2, 0, 1) (from memory; re-derived below by
 *   enumeration).
 * - The same book's degenerate example that cycles under the largest-coefficient rule:
 *   max 10x₁−57x₂−9x₃−24x₄ s.t. 0.5x₁−5.5x₂−2.5x₃+9x₄ ≤ 0, 0.5x₁−1.5x₂−0.5x₃+x₄ ≤ 0, x₁ ≤ 1;
 *   optimum 1 (from memory; re-derived below by enumeration). Bland's rule must terminate.
 * - Independent check: every vertex of {Az ≤ b, z ≥ 0} enumerated with mathjs 15.2.0 `lusolve`.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import * as math from 'mathjs';
import { lpMinimize } from '../../app/engine/wheels/lp';

/** Brute force: min cᵀz over vertices of {Az ≤ b, z ≥ 0}; null if no vertex is feasible. */
function bruteLp(A: number[][], b: number[], c: number[]): number | null {
  const m = A.length,
    nv = c.length;
  // All constraints as rows: A z ≤ b and −z ≤ 0.
  const rows = [...A, ...[...Array(nv).keys()].map((j) => c.map((_, k) => (k === j ? -1 : 0)))];
  const rhs = [...b, ...new Array(nv).fill(0)];
  let best: number | null = null;
  const choose = (start: number, picked: number[]): void => {
    if (picked.length === nv) {
      const M = picked.map((r) => rows[r]!);
      if (Math.abs(math.det(M)) < 1e-10) return;
      const z = (
        math.lusolve(
          M,
          picked.map((r) => rhs[r]),
        ) as number[][]
      ).map((r) => r[0]!);
      for (let r = 0; r < m + nv; r++) if (math.dot(rows[r]!, z) > rhs[r] + 1e-9) return;
      const v = math.dot(c, z);
      if (best === null || v < best) best = v;
      return;
    }
    for (let r = start; r < m + nv; r++) choose(r + 1, [...picked, r]);
  };
  choose(0, []);
  return best;
}

function solve(A: number[][], b: number[], c: number[]) {
  const z = new Float64Array(c.length);
  const status = lpMinimize(z, A.length, c.length, A.flat(), b, c);
  return { status, z: Array.from(z), value: math.dot(c, Array.from(z)) };
}

describe('lpMinimize on textbook problems', () => {
  it('Chvátal ch. 2 example: optimum 13 at (2, 0, 1)', () => {
    const A = [
      [2, 3, 1],
      [4, 1, 2],
      [3, 4, 2],
    ];
    const r = solve(A, [5, 11, 8], [-5, -4, -3]);
    expect(r.status).toBe('optimal');
    expect(-r.value).toBeCloseTo(13, 12);
    expect(r.z[0]).toBeCloseTo(2, 12);
    expect(r.z[1]).toBeCloseTo(0, 12);
    expect(r.z[2]).toBeCloseTo(1, 12);
    expect(bruteLp(A, [5, 11, 8], [-5, -4, -3])).toBeCloseTo(-13, 10);
  });
  it('degenerate cycling example terminates with optimum 1 (Bland rule)', () => {
    const A = [
      [0.5, -5.5, -2.5, 9],
      [0.5, -1.5, -0.5, 1],
      [1, 0, 0, 0],
    ];
    const c = [-10, 57, 9, 24];
    const r = solve(A, [0, 0, 1], c);
    expect(r.status).toBe('optimal');
    expect(-r.value).toBeCloseTo(1, 12);
    expect(bruteLp(A, [0, 0, 1], c)).toBeCloseTo(-1, 10);
  });
  it('phase 1: x + y ≥ 2 (as −x − y ≤ −2), x ≤ 3, y ≤ 3, minimise x + 2y → 2 at (2, 0)', () => {
    const r = solve(
      [
        [-1, -1],
        [1, 0],
        [0, 1],
      ],
      [-2, 3, 3],
      [1, 2],
    );
    expect(r.status).toBe('optimal');
    expect(r.value).toBeCloseTo(2, 12);
    expect(r.z[0]).toBeCloseTo(2, 12);
  });
  it('infeasible: x ≤ 1 and x ≥ 2', () => {
    expect(solve([[1], [-1]], [1, -2], [1]).status).toBe('infeasible');
  });
  it('unbounded: minimise −x with only x − y ≤ 1', () => {
    expect(solve([[1, -1]], [1], [-1, 0]).status).toBe('unbounded');
  });
});

describe('lpMinimize against vertex enumeration (fast-check, 1,000 random bounded LPs)', () => {
  it('same optimal value, or both infeasible', () => {
    const coef = fc.integer({ min: -4, max: 4 });
    const arb = fc.record({ nv: fc.integer({ min: 1, max: 3 }), m: fc.integer({ min: 1, max: 5 }) }).chain(({ nv, m }) =>
      fc.record({
        A: fc.array(fc.array(coef, { minLength: nv, maxLength: nv }), { minLength: m, maxLength: m }),
        b: fc.array(fc.integer({ min: -3, max: 6 }), { minLength: m, maxLength: m }),
        c: fc.array(coef, { minLength: nv, maxLength: nv }),
        nv: fc.constant(nv),
      }),
    );
    fc.assert(
      fc.property(arb, ({ A, b, c, nv }) => {
        // A box z ≤ 5 keeps every problem bounded so that vertex enumeration is a complete answer.
        const Ab = [...A, ...[...Array(nv).keys()].map((j) => c.map((_, k) => (k === j ? 1 : 0)))];
        const bb = [...b, ...new Array(nv).fill(5)];
        const r = solve(Ab, bb, c);
        const ref = bruteLp(Ab, bb, c);
        if (ref === null) expect(r.status).toBe('infeasible');
        else {
          expect(r.status).toBe('optimal');
          expect(r.value).toBeCloseTo(ref, 8);
          for (let i = 0; i < Ab.length; i++) expect(math.dot(Ab[i]!, r.z)).toBeLessThanOrEqual(bb[i] + 1e-9);
        }
      }),
      { numRuns: 1000 },
    );
  });
});
