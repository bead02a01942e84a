/**
 * The bundled demo's validation made at build time (main/demo-validation.ts; planted by the page
 * and the pipeline worker through engine/scenario/knownValidation.ts): the module the build emits
 * evaluates to the demo and a validation equal to one made here; validateScenario answers from a
 * planted entry only for an input equal to it in every value, key and key order (-0, NaN, an
 * undefined key, another key order, any edit: validated again, same field-named messages); a
 * caller changing what it got does not change the next answer; the demo's pass and the page's
 * preflight are the same with and without the planted entry. (Plumbing, no outside source: the
 * reference is the validator itself, unplanted.)
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { afterEach, describe, expect, it } from 'vitest';
import type { Result } from '../../app/engine/errors';
import { runPipeline } from '../../app/engine/pipeline/run';
import { clearKnownValidations, copyJson, knownValidation, plantValidation, sameJson } from '../../app/engine/scenario/knownValidation';
import type { Scenario } from '../../app/engine/scenario/schema';
import { validateScenario, validateScenarioAfresh } from '../../app/engine/scenario/validate';
import { preflight } from '../../app/ui/preflight';
import { validationModuleSource } from '../../main/demo-validation';

const demoText = fs.readFileSync(new URL('../../assets/lumen6-imaging.scenario.json', import.meta.url), 'utf8');
const demo = (): Record<string, unknown> => JSON.parse(demoText) as Record<string, unknown>;

/** Imports generated module source the way the bundle does (an ES module with a default export). */
async function importSource(source: string): Promise<[unknown, Result<Scenario>]> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'slewsmith-validation-'));
  try {
    const file = path.join(dir, 'validation.mjs');
    fs.writeFileSync(file, source);
    return ((await import(pathToFileURL(file).href)) as { default: [unknown, Result<Scenario>] }).default;
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

/** A validation no real input gives, to tell a planted answer from a computed one. */
const MARKER: Result<Scenario> = { ok: false, errors: [{ path: 'marker', rule: 'planted', message: 'planted' }], warnings: [] };

afterEach(() => clearKnownValidations());

describe('sameJson', () => {
  it('tells apart what JSON.stringify would not', () => {
    expect(sameJson({ a: [1, 'x', null, true] }, { a: [1, 'x', null, true] })).toBe(true);
    expect(sameJson(0, -0)).toBe(false);
    expect(sameJson(NaN, NaN)).toBe(true);
    expect(sameJson(NaN, null)).toBe(false);
    expect(sameJson({ a: 1 }, { a: 1, b: undefined })).toBe(false);
    expect(sameJson({ a: 1, b: 2 }, { b: 2, a: 1 })).toBe(false);
    const holed = [1, 2, 3];
    delete holed[1];
    expect(sameJson(holed, [1, undefined, 3])).toBe(false);
    expect(sameJson([1, 2], [1, 2, 3])).toBe(false);
    expect(sameJson({ d: new Date(0) }, { d: new Date(0) })).toBe(false);
    expect(sameJson(new Float64Array([1]), new Float64Array([1]))).toBe(false);
    expect(sameJson([], {})).toBe(false);
  });

  it('copyJson keeps -0, NaN, undefined keys and key order', () => {
    const v = { b: -0, a: [NaN, { z: undefined, y: 'y' }] };
    const c = copyJson(v);
    expect(c).not.toBe(v);
    expect(sameJson(c, v)).toBe(true);
  });
});

describe('build-time validation of the bundled demo', () => {
  it('the emitted module is the demo and a validation equal to an unplanted one', async () => {
    const [json, result] = await importSource(validationModuleSource(demo()));
    expect(sameJson(json, demo())).toBe(true);
    const fresh = validateScenario(demo());
    expect(fresh.ok).toBe(true);
    expect(sameJson(result, fresh)).toBe(true);
    expect(result).toEqual(fresh);
  });

  it('only an input equal to the planted one takes the planted answer', () => {
    plantValidation(demo(), MARKER);
    expect(validateScenario(demo())).toEqual(MARKER);
    // Each of these differs from the demo in one value or key: validated again (the demo is valid).
    const differing: [string, (d: Record<string, unknown>) => unknown][] = [
      ['another name', (d) => ({ ...d, name: 'Renamed' })],
      ['an extra undefined key', (d) => ({ ...d, extra: undefined })],
      ['the keys in another order', ({ format, ...rest }) => ({ ...rest, format })],
      ['a zero written -0', (d) => (zeroToMinusZero(d) ? d : null)],
    ];
    for (const [what, change] of differing) {
      const d = change(demo());
      expect(d, what).not.toBe(null);
      expect(sameJson(d, demo()), what).toBe(false);
      expect(validateScenario(d), what).not.toEqual(MARKER);
    }
  });

  it('validateScenarioAfresh (the idle warm-up) ignores what was planted', () => {
    const real = validateScenario(demo());
    plantValidation(demo(), MARKER);
    expect(validateScenario(demo())).toEqual(MARKER);
    expect(validateScenarioAfresh(demo())).toEqual(real);
  });

  it('an edited demo still gets the validator’s field-named messages', () => {
    plantValidation(demo(), MARKER);
    const d = demo() as { vehicle: { inertiaKgm2: unknown } };
    d.vehicle.inertiaKgm2 = 'heavy';
    const bad = validateScenario(d);
    const unplanted = (clearKnownValidations(), validateScenario(d));
    expect(bad.ok).toBe(false);
    expect(bad).toEqual(unplanted);
    if (!bad.ok) expect(bad.errors.some((e) => e.path.startsWith('vehicle.inertiaKgm2'))).toBe(true);
    plantValidation(demo(), validateScenario(demo()));
    expect(preflight(d)).toEqual((clearKnownValidations(), preflight(d)));
  });

  it('a caller changing its answer does not change the next one', () => {
    const real = validateScenario(demo());
    plantValidation(demo(), real);
    const first = validateScenario(demo());
    if (!first.ok) throw new Error('demo invalid');
    first.value.name = 'changed';
    first.warnings.push({ path: 'x', rule: 'y', message: 'z' });
    expect(validateScenario(demo())).toEqual(real);
    expect(knownValidation(demo())).toEqual(real);
  });

  it('refuses to plant what is not plain JSON data', () => {
    expect(() => plantValidation({ when: new Date(0) }, MARKER)).toThrow(/plain JSON/);
  });

  it('the page’s preflight and the demo’s pass are the same with the planted validation', () => {
    const unplannedPreflight = preflight(demo());
    const unplanted = runPipeline(demo());
    plantValidation(demo(), validateScenario(demo()));
    expect(preflight(demo())).toEqual(unplannedPreflight);
    const planted = runPipeline(demo());
    if (!planted.ok || !unplanted.ok) throw new Error('demo pass failed');
    expect({ ...planted.value, elapsedMs: 0 }).toEqual({ ...unplanted.value, elapsedMs: 0 });
  });
});

/** Writes the first numeric 0 found (depth first) as -0. */
function zeroToMinusZero(v: unknown): boolean {
  if (Array.isArray(v)) {
    for (let i = 0; i < v.length; i++) {
      if (Object.is(v[i], 0)) return ((v[i] = -0), true);
      if (zeroToMinusZero(v[i])) return true;
    }
  } else if (v !== null && typeof v === 'object') {
    const o = v as Record<string, unknown>;
    for (const k of Object.keys(o)) {
      if (Object.is(o[k], 0)) return ((o[k] = -0), true);
      if (zeroToMinusZero(o[k])) return true;
    }
  }
  return false;
}
