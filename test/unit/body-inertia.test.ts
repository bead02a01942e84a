/**
 * Inertia validation rules. Sources: the eigenvalues of [[2,1,0],[1,2,0],[0,0,3]] are 1, 3, 3
 * (hand algebra: the upper block has eigenvalues 2 ± 1); the triangle inequality J1 + J2 ≥ J3 of
 * principal moments is standard rigid-body mechanics (in principal axes J1 + J2 − J3 = 2∫z² dm;
 * Landau & Lifshitz, Mechanics, §32 [from memory]); the demo inertia is the invented Lumen-6.
 */
import { describe, expect, it } from 'vitest';
import { validateInertia } from '../../app/engine/body/inertia';
import { m3Determinant } from '../../app/engine/math/mat3';
import type { Issue } from '../../app/engine/errors';

function errorsOf(rows: unknown, path?: string): Issue[] {
  const r = validateInertia(rows, path);
  if (r.ok) throw new Error('expected errors');
  return r.errors;
}

describe('validateInertia: accepted matrices', () => {
  it('Lumen-6 style inertia with small products: column-major, symmetric, moments ascending, proper axes', () => {
    const rows = [
      [0.11, 0.002, -0.001],
      [0.002, 0.12, 0.0015],
      [-0.001, 0.0015, 0.08],
    ];
    const r = validateInertia(rows);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const { J, moments, axes } = r.value;
    // column-major: element (0, 1) is at 3·1 + 0.
    expect(J[3]).toBe(0.002);
    expect(J[1]).toBe(0.002);
    expect(J[6]).toBe(-0.001);
    expect(moments[0]).toBeLessThanOrEqual(moments[1]!);
    expect(moments[1]).toBeLessThanOrEqual(moments[2]!);
    expect(m3Determinant(axes)).toBeCloseTo(1, 12);
    // J a_i = λ_i a_i (definition of principal axes)
    for (let i = 0; i < 3; i++) {
      for (let r0 = 0; r0 < 3; r0++) {
        let s = 0;
        for (let c = 0; c < 3; c++) s += J[3 * c + r0]! * axes[3 * i + c]!;
        expect(s).toBeCloseTo(moments[i]! * axes[3 * i + r0]!, 14);
      }
    }
    // trace is invariant
    expect(moments[0]! + moments[1]! + moments[2]!).toBeCloseTo(0.31, 14);
  });

  it('[[2,1,0],[1,2,0],[0,0,3]] has principal moments 1, 3, 3 (hand algebra)', () => {
    const r = validateInertia([
      [2, 1, 0],
      [1, 2, 0],
      [0, 0, 3],
    ]);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.value.moments[0]).toBeCloseTo(1, 14);
    expect(r.value.moments[1]).toBeCloseTo(3, 14);
    expect(r.value.moments[2]).toBeCloseTo(3, 14);
  });

  it('accepts typed-array rows and the thin-disk limit J1 + J2 = J3', () => {
    expect(validateInertia([new Float64Array([1, 0, 0]), new Float64Array([0, 1, 0]), new Float64Array([0, 0, 2])]).ok).toBe(true);
    // within the 1e-9 relative triangle tolerance
    expect(
      validateInertia([
        [1, 0, 0],
        [0, 1, 0],
        [0, 0, 2 * (1 + 1e-10)],
      ]).ok,
    ).toBe(true);
  });

  it('accepts an asymmetry below 1e-6 of the largest entry and returns the exactly symmetric part', () => {
    const r = validateInertia([
      [1, 1e-8, 0],
      [0, 1, 0],
      [0, 0, 1.5],
    ]);
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.value.J[3]).toBe(r.value.J[1]);
  });
});

describe('validateInertia: each rule with its path', () => {
  it('shape: not an array, wrong row count, wrong row length', () => {
    expect(errorsOf(42)).toEqual([expect.objectContaining({ path: 'inertia', rule: 'shape' })]);
    expect(
      errorsOf([
        [1, 0, 0],
        [0, 1, 0],
      ]),
    ).toEqual([expect.objectContaining({ path: 'inertia', rule: 'shape' })]);
    const e = errorsOf([
      [1, 0, 0],
      [0, 1],
      [0, 0, 1],
    ]);
    expect(e).toEqual([expect.objectContaining({ path: 'inertia[1]', rule: 'shape' })]);
    expect(errorsOf([[1, 0, 0], 'row', [0, 0, 1]])).toEqual([expect.objectContaining({ path: 'inertia[1]', rule: 'shape' })]);
  });

  it('finite: NaN, Infinity, strings and null entries each named', () => {
    const e = errorsOf([
      [1, 0, NaN],
      [0, Infinity, 0],
      ['0', 0, null],
    ]);
    expect(e.map((i) => `${i.path}:${i.rule}`)).toEqual([
      'inertia[0][2]:finite',
      'inertia[1][1]:finite',
      'inertia[2][0]:finite',
      'inertia[2][2]:finite',
    ]);
  });

  it('symmetric: the offending pair is named in the message', () => {
    const e = errorsOf([
      [1, 0.01, 0],
      [0.02, 1, 0],
      [0, 0, 1.5],
    ]);
    expect(e).toHaveLength(1);
    expect(e[0]).toMatchObject({ path: 'inertia[0][1]', rule: 'symmetric' });
    expect(e[0]!.message).toContain('inertia[1][0]');
  });

  it('positive-definite: the message names the smallest eigenvalue', () => {
    const e = errorsOf([
      [1, 0, 0],
      [0, 2, 0],
      [0, 0, 0],
    ]);
    expect(e.map((i) => i.rule)).toContain('positive-definite');
    const pd = e.find((i) => i.rule === 'positive-definite')!;
    expect(pd.path).toBe('inertia');
    expect(pd.message).toMatch(/smallest eigenvalue is 0 /);
    const neg = errorsOf([
      [2, 0, 0],
      [0, 3, 0],
      [0, 0, -0.5],
    ]).find((i) => i.rule === 'positive-definite')!;
    expect(neg.message).toContain('-0.5');
  });

  it('triangle-inequality: diag(1, 1, 3) and diag(1, 1, 2·(1 + 1e-8))', () => {
    const e = errorsOf([
      [1, 0, 0],
      [0, 1, 0],
      [0, 0, 3],
    ]);
    expect(e).toEqual([expect.objectContaining({ path: 'inertia', rule: 'triangle-inequality' })]);
    expect(
      errorsOf([
        [1, 0, 0],
        [0, 1, 0],
        [0, 0, 2 * (1 + 1e-8)],
      ])[0]!.rule,
    ).toBe('triangle-inequality');
    // any ordering: the large moment on the first axis
    expect(
      errorsOf([
        [5, 0, 0],
        [0, 1, 0],
        [0, 0, 2],
      ])[0]!.rule,
    ).toBe('triangle-inequality');
  });

  it('all problems together: asymmetry and the triangle inequality of the symmetric part', () => {
    // symmetric part [[1,.25,0],[.25,1,0],[0,0,3]]: moments 0.75, 1.25, 3 → 0.75 + 1.25 < 3
    const e = errorsOf([
      [1, 0.5, 0],
      [0, 1, 0],
      [0, 0, 3],
    ]);
    expect(e.map((i) => `${i.path}:${i.rule}`)).toEqual(['inertia[0][1]:symmetric', 'inertia:triangle-inequality']);
  });

  it('all problems together: shape and finiteness in several rows, under a custom path', () => {
    const e = errorsOf(
      [
        [1, NaN, 0],
        [0, 1, 0, 7],
        [0, 'x', 1],
        [9, 9, 9],
      ],
      'vehicle.inertia',
    );
    expect(e.map((i) => `${i.path}:${i.rule}`)).toEqual([
      'vehicle.inertia:shape',
      'vehicle.inertia[0][1]:finite',
      'vehicle.inertia[1]:shape',
      'vehicle.inertia[2][1]:finite',
    ]);
  });

  it('indefinite matrices get both positive-definite and triangle-inequality', () => {
    const rules = errorsOf([
      [1, 0, 0],
      [0, 1, 0],
      [0, 0, -1],
    ])
      .map((i) => i.rule)
      .sort();
    expect(rules).toEqual(['positive-definite', 'triangle-inequality']);
  });

  it('huge entries: analysed after scaling, no overflow', () => {
    const r = validateInertia([
      [1e300, 0, 0],
      [0, 1e300, 0],
      [0, 0, 1.5e300],
    ]);
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.value.moments[2]).toBeCloseTo(1.5e300, -285);
    const big = validateInertia([
      [1.7e308, 1.7e308, 0],
      [1.7e308, 1.7e308, 0],
      [0, 0, 1.7e308],
    ]);
    expect(big.ok).toBe(false);
  });
});
