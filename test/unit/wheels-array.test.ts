/**
 * Wheel-array validation: every rule fires with its path, all problems come back together, and
 * garbage never throws. Thresholds are our own (array.ts); singular values of G checked against
 * mathjs 15.2.0 `eigs` of GGᵀ (σ = √λ) as an independent computation.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import * as math from 'mathjs';
import { MAX_WHEELS, makeWheelArray, orthogonalTriad, pyramid } from '../../app/engine/wheels';
import type { Issue } from '../../app/engine/errors';

const lim = { maxTorqueNm: 0.002, maxMomentumNms: 0.006, rotorInertiaKgm2: 2e-5 };
const wheel = (axis: unknown, extra: Record<string, unknown> = {}) => ({ ...lim, axis, ...extra });
const triad = () => orthogonalTriad(lim) as unknown[];

function errorsOf(input: unknown, path?: string): Issue[] {
  const r = makeWheelArray(input, path);
  expect(r.ok).toBe(false);
  return r.ok ? [] : r.errors;
}
const has = (issues: Issue[], path: string, rule: string) => issues.some((i) => i.path === path && i.rule === rule);

describe('makeWheelArray accepts good arrays', () => {
  it('triad: identity pinv, no null space, no warnings', () => {
    const r = makeWheelArray(orthogonalTriad(lim));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.warnings).toEqual([]);
    expect(Array.from(r.value.pinv)).toEqual([1, 0, 0, 0, 1, 0, 0, 0, 1]);
    expect(r.value.nullBasis.length).toBe(0);
    expect(r.value.n).toBe(3);
  });
  it('accepts Float64Array axes and nearly-unit axes (normalised, with a warning naming the path)', () => {
    const specs = [wheel(new Float64Array([1, 0, 0])), wheel([0, 1 + 5e-7, 0]), wheel([0, 0, 1])];
    const r = makeWheelArray(specs, 'vehicle.wheels');
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.warnings.map((w) => [w.path, w.rule])).toEqual([['vehicle.wheels[1].axis', 'unit-norm']]);
    expect(r.value.axes[4]).toBe(1);
  });
  it('singular values match √eig(GGᵀ) from mathjs', () => {
    const r = makeWheelArray(pyramid({ ...lim, count: 5, cantAngleRad: 0.9, azimuthOffsetRad: 0.3 }));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const n = r.value.n;
    const G = [0, 1, 2].map((row) => [...Array(n).keys()].map((i) => r.value.axes[3 * i + row]!));
    const ev = (math.eigs(math.multiply(G, math.transpose(G)) as number[][]).values as number[]).map(Math.sqrt).sort((a, b) => b - a);
    for (let k = 0; k < 3; k++) expect(r.value.singularValues[k]).toBeCloseTo(ev[k]!, 12);
  });
});

describe('each validation rule, with its path', () => {
  it('array: not a list', () => {
    expect(has(errorsOf({ a: 1 }), 'wheels', 'array')).toBe(true);
    expect(has(errorsOf(null, 'v.w'), 'v.w', 'array')).toBe(true);
  });
  it('min-wheels: fewer than 3', () => {
    expect(has(errorsOf([wheel([1, 0, 0]), wheel([0, 1, 0])]), 'wheels', 'min-wheels')).toBe(true);
    expect(has(errorsOf([]), 'wheels', 'min-wheels')).toBe(true);
  });
  it('max-wheels: more than MAX_WHEELS', () => {
    const many = pyramid({ ...lim, count: MAX_WHEELS + 1, cantAngleRad: 1 });
    expect(many.length).toBe(MAX_WHEELS + 1);
    expect(has(errorsOf(many), 'wheels', 'max-wheels')).toBe(true);
  });
  it('object: an entry that is not an object', () => {
    const s = triad();
    s[1] = 7;
    expect(has(errorsOf(s), 'wheels[1]', 'object')).toBe(true);
  });
  it('vector3 / finite: malformed axes', () => {
    const s = triad();
    s[0] = wheel([1, 0]);
    s[1] = wheel([0, NaN, 1]);
    s[2] = wheel('z');
    const e = errorsOf(s);
    expect(has(e, 'wheels[0].axis', 'vector3')).toBe(true);
    expect(has(e, 'wheels[1].axis[1]', 'finite')).toBe(true);
    expect(has(e, 'wheels[2].axis', 'vector3')).toBe(true);
  });
  it('nonzero-axis and unit-norm (rejected beyond 1e-6 relative)', () => {
    const s = triad();
    s[0] = wheel([0, 0, 0]);
    s[2] = wheel([0, 0, 1.001]);
    const e = errorsOf(s);
    expect(has(e, 'wheels[0].axis', 'nonzero-axis')).toBe(true);
    expect(has(e, 'wheels[2].axis', 'unit-norm')).toBe(true);
    expect(e.find((i) => i.rule === 'unit-norm')?.message).toMatch(/1\.001/);
  });
  it('finite / positive: limits and rotor inertia', () => {
    const s = triad();
    s[0] = wheel([1, 0, 0], { maxTorqueNm: 0 });
    s[1] = wheel([0, 1, 0], { maxMomentumNms: -1, rotorInertiaKgm2: Infinity });
    s[2] = wheel([0, 0, 1], { maxTorqueNm: '2' });
    const e = errorsOf(s);
    expect(has(e, 'wheels[0].maxTorqueNm', 'positive')).toBe(true);
    expect(has(e, 'wheels[1].maxMomentumNms', 'positive')).toBe(true);
    expect(has(e, 'wheels[1].rotorInertiaKgm2', 'finite')).toBe(true);
    expect(has(e, 'wheels[2].maxTorqueNm', 'finite')).toBe(true);
  });
  it('axes-span-3d: coplanar axes, with rank and smallest singular value in the message', () => {
    const c = Math.SQRT1_2;
    const e = errorsOf([wheel([1, 0, 0]), wheel([0, 1, 0]), wheel([c, c, 0]), wheel([c, -c, 0])]);
    const span = e.find((i) => i.rule === 'axes-span-3d');
    expect(span?.path).toBe('wheels');
    expect(span?.message).toMatch(/rank 2/);
    expect(span?.message).toMatch(/smallest singular value of G \d\.\d+e[-+]\d+/);
  });
  it('axes-span-3d: all wheels on one line gives rank 1', () => {
    const e = errorsOf([wheel([1, 0, 0]), wheel([-1, 0, 0]), wheel([1, 0, 0])]);
    expect(e.find((i) => i.rule === 'axes-span-3d')?.message).toMatch(/rank 1/);
  });
  it('reports all problems together', () => {
    const e = errorsOf([wheel([0, 0, 0], { maxTorqueNm: -1 }), 5]);
    expect(e.map((i) => i.rule).sort()).toEqual(['min-wheels', 'nonzero-axis', 'object', 'positive']);
  });
  it('warnings: nearly coplanar (axes-conditioning) and parallel axes (parallel-axes)', () => {
    const t = 1e-3;
    const n = Math.hypot(1, t);
    const r = makeWheelArray([wheel([1, 0, 0]), wheel([0, 1, 0]), wheel([0, 1 / n, t / n]), wheel([0, -1, 0])]);
    expect(r.ok).toBe(true);
    const rules = r.warnings.map((w) => `${w.path}:${w.rule}`);
    expect(rules).toContain('wheels:axes-conditioning');
    expect(rules).toContain('wheels[3].axis:parallel-axes');
  });
});

describe('garbage never throws', () => {
  it('fast-check anything() (2,000 cases) gives a Result, every issue with path/rule/message', () => {
    fc.assert(
      fc.property(fc.anything(), (x) => {
        const r = makeWheelArray(x);
        if (!r.ok) for (const i of r.errors) expect(typeof i.path === 'string' && i.rule.length > 0 && i.message.length > 0).toBe(true);
      }),
      { numRuns: 2000 },
    );
  });
  it('fast-check: lists of loosely wheel-shaped records (2,000 cases)', () => {
    const num = fc.oneof(fc.double(), fc.constant(0), fc.constant(NaN), fc.string(), fc.constant(undefined));
    const rec = fc.record({
      axis: fc.oneof(fc.array(num, { maxLength: 4 }), num),
      maxTorqueNm: num,
      maxMomentumNms: num,
      rotorInertiaKgm2: num,
    });
    fc.assert(
      fc.property(fc.array(rec, { maxLength: 8 }), (x) => {
        const r = makeWheelArray(x);
        if (r.ok) {
          for (const v of r.value.pinv) expect(Number.isFinite(v)).toBe(true);
        } else {
          expect(r.errors.length).toBeGreaterThan(0);
        }
      }),
      { numRuns: 2000 },
    );
  });
  it('a huge list is rejected with bounded work', () => {
    const big = new Array(1_000_000).fill(0);
    const e = errorsOf(big);
    expect(has(e, 'wheels', 'max-wheels')).toBe(true);
    expect(e.length).toBeLessThanOrEqual(100);
  });
  it('pyramid with a nonsense count gives a list that makeWheelArray rejects', () => {
    expect(pyramid({ ...lim, count: NaN, cantAngleRad: 1 })).toEqual([]);
    expect(has(errorsOf(pyramid({ ...lim, count: 2.7, cantAngleRad: 1 })), 'wheels', 'min-wheels')).toBe(true);
    expect(has(errorsOf(pyramid({ ...lim, count: 1e9, cantAngleRad: 1 })), 'wheels', 'max-wheels')).toBe(true);
    expect(has(errorsOf(pyramid({ ...lim, cantAngleRad: NaN })), 'wheels[0].axis[0]', 'finite')).toBe(true);
    // cant 0: all four axes along +Z.
    expect(errorsOf(pyramid({ ...lim, cantAngleRad: 0 })).some((i) => i.rule === 'axes-span-3d')).toBe(true);
  });
});
