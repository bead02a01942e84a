/**
 * validateScenario / loadScenario on garbage: random JSON-like values, and example files with a
 * random field replaced by a random value. Never a throw; a failure always lists issues with a
 * path, a rule and a message; a success never carries NaN into the resolved scenario.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { validateScenario } from '../../app/engine/scenario/validate';
import { loadScenario } from '../../app/engine/scenario/load';
import { EXAMPLE_FILES, loadExample } from '../unit/scenario-fixtures';

function leafPaths(v: unknown, path: (string | number)[] = [], out: (string | number)[][] = []): (string | number)[][] {
  out.push(path);
  if (Array.isArray(v)) v.forEach((x, i) => leafPaths(x, [...path, i], out));
  else if (v !== null && typeof v === 'object') for (const [k, x] of Object.entries(v)) leafPaths(x, [...path, k], out);
  return out;
}

function setAt(root: any, path: (string | number)[], value: unknown): any {
  if (path.length === 0) return value;
  let o = root;
  for (const k of path.slice(0, -1)) o = o[k];
  o[path[path.length - 1]!] = value;
  return root;
}

function noNaN(v: unknown, where = '$'): void {
  if (typeof v === 'number') {
    if (!Number.isFinite(v)) throw new Error(`non-finite number at ${where}`);
  } else if (ArrayBuffer.isView(v)) {
    Array.from(v as unknown as ArrayLike<number>).forEach((x, i) => noNaN(x, `${where}[${i}]`));
  } else if (Array.isArray(v)) v.forEach((x, i) => noNaN(x, `${where}[${i}]`));
  else if (v !== null && typeof v === 'object') for (const [k, x] of Object.entries(v)) noNaN(x, `${where}.${k}`);
}

function checkResult(input: unknown): void {
  const r = loadScenario(input);
  const v = validateScenario(input);
  if (r.ok) {
    noNaN(r.value);
    expect(v.ok).toBe(true);
  } else {
    expect(r.errors.length).toBeGreaterThan(0);
    for (const i of r.errors) {
      expect(typeof i.path).toBe('string');
      expect(i.rule).toMatch(/^[a-z][a-z-]*$/);
      expect(i.message.length).toBeGreaterThan(5);
    }
  }
}

describe('garbage in, issues out', () => {
  it('random values are rejected with issues, never a throw', () => {
    fc.assert(
      fc.property(
        fc.anything({
          withNullPrototype: true,
          withBigInt: true,
          withDate: true,
          withMap: true,
          withTypedArray: true,
          withSparseArray: true,
        }),
        (x) => {
          const r = validateScenario(x);
          expect(r.ok).toBe(false);
          if (!r.ok) expect(r.errors.length).toBeGreaterThan(0);
        },
      ),
      { numRuns: 500, seed: 1 },
    );
  });

  it('random objects that claim the format are rejected with paths', () => {
    fc.assert(
      fc.property(fc.dictionary(fc.string(), fc.jsonValue()), (d) => {
        checkResult({ ...d, format: 'slewsmith-scenario', version: 1 });
      }),
      { numRuns: 300, seed: 2 },
    );
  });

  for (const name of EXAMPLE_FILES) {
    it(`${name}: one field replaced by garbage never throws`, () => {
      const paths = leafPaths(loadExample(name)).filter((p) => p.length > 0);
      fc.assert(
        fc.property(
          fc.integer({ min: 0, max: paths.length - 1 }),
          fc.oneof(
            fc.jsonValue(),
            fc.constantFrom(Number.NaN, Infinity, -0, 0, -1, 1e308, '', [], {}, null, undefined, [0, 0, 0], [0, 0, 0, 0]),
          ),
          (k, garbage) => {
            checkResult(setAt(loadExample(name), paths[k]!, garbage));
          },
        ),
        { numRuns: 400, seed: 3 },
      );
    });
  }
});
