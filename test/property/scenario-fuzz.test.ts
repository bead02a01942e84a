/**
 * Issue 17's fuzz suites, seeded so every run is the same:
 *  - 10,000 generated scenario documents through the validator and the resolver: the bundled
 *    examples with one to three edits each (a field deleted, replaced by a wrong type, NaN, ±Infinity,
 *    1e308, 5e-324, a huge or negative number, deep nesting, an own `__proto__` key, a long array),
 *    plus documents that are not scenarios at all. Never a throw; a refusal lists issues each with a
 *    path, a rule and a message; an acceptance resolves to finite numbers only.
 *  - a sampled set of the same edits (short flights, one controller) through the whole pipeline and
 *    all three exporters: never a throw, never a NaN or Infinity in any export, and a run that did not
 *    complete carries its RUN FAILED / RUN TRUNCATED note in every export.
 * The pass criteria are the project's own rules (README, issue 17); no outside reference applies.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { validateScenario } from '../../app/engine/scenario/validate';
import { loadScenario } from '../../app/engine/scenario/load';
import { runPipeline } from '../../app/engine/pipeline/run';
import { exportRun, EXPORT_FORMATS } from '../../app/engine/export/runExport';
import { runEndNote } from '../../app/engine/pipeline/outcome';
import { EXAMPLE_FILES, loadExample } from '../unit/scenario-fixtures';

const VALIDATOR_RUNS = 10_000;
const PIPELINE_RUNS = 200;

type Key = string | number;
function allPaths(v: unknown, path: Key[] = [], out: Key[][] = []): Key[][] {
  out.push(path);
  if (Array.isArray(v)) v.forEach((x, i) => allPaths(x, [...path, i], out));
  else if (v !== null && typeof v === 'object') for (const [k, x] of Object.entries(v)) allPaths(x, [...path, k], out);
  return out;
}

function nested(depth: number): unknown {
  let v: unknown = 1;
  for (let i = 0; i < depth; i++) v = i % 2 ? [v] : { a: v };
  return v;
}

/** Values that broke validators elsewhere (issue 17's list). */
const nasty = fc.oneof(
  fc.constantFrom<unknown>(Number.NaN, Infinity, -Infinity, 1e308, -1e308, 5e-324, -5e-324, -0, 0, -1, 1e9, 1e200, 2 ** 53 + 1),
  fc.constantFrom<unknown>(
    '',
    'NaN',
    '1e3',
    '\u0000',
    'x'.repeat(5000),
    null,
    true,
    [],
    {},
    [0, 0, 0],
    [0, 0, 0, 0],
    [1e308, 1e308, 1e308],
  ),
  fc.constant(null).map(() => JSON.parse('{"__proto__": {"polluted": 1}, "constructor": {"prototype": 1}}') as unknown),
  fc.integer({ min: 1, max: 300 }).map(nested),
  fc.integer({ min: 0, max: 3000 }).map((n) => Array.from({ length: n }, () => ({}))),
  fc.jsonValue(),
  fc.double(),
);

interface Edit {
  at: number;
  del: boolean;
  value: unknown;
}
const editArb = fc.record({ at: fc.nat(), del: fc.boolean(), value: nasty });

/** A deep copy (structuredClone keeps NaN, -0 and an own "__proto__" key). */
function fresh(v: unknown): unknown {
  return v !== null && typeof v === 'object' ? structuredClone(v) : v;
}

function applyEdits(doc: any, edits: Edit[]): any {
  for (const e of edits) {
    const paths = allPaths(doc).filter((p) => p.length > 0);
    if (!paths.length) break;
    const p = paths[e.at % paths.length]!;
    let o = doc;
    for (const k of p.slice(0, -1)) o = o[k];
    const last = p[p.length - 1]!;
    if (e.del && !Array.isArray(o)) delete o[last];
    // A fresh copy each time: fast-check hands out the same constant objects again, and editing a
    // shared one inside a later case could make a cycle.
    else Object.defineProperty(o, last, { value: fresh(e.value), enumerable: true, writable: true, configurable: true });
  }
  return doc;
}

function nonFinite(v: unknown, where = '$'): string | null {
  if (typeof v === 'number') return Number.isFinite(v) ? null : where;
  if (ArrayBuffer.isView(v)) {
    const a = v as unknown as ArrayLike<number>;
    for (let i = 0; i < a.length; i++) if (typeof a[i] === 'number' && !Number.isFinite(a[i]!)) return `${where}[${i}]`;
    return null;
  }
  if (Array.isArray(v)) {
    for (let i = 0; i < v.length; i++) {
      const w = nonFinite(v[i], `${where}[${i}]`);
      if (w) return w;
    }
    return null;
  }
  if (v !== null && typeof v === 'object')
    for (const [k, x] of Object.entries(v)) {
      const w = nonFinite(x, `${where}.${k}`);
      if (w) return w;
    }
  return null;
}

const docArb = fc.oneof(
  { weight: 9, arbitrary: fc.tuple(fc.constantFrom(...EXAMPLE_FILES), fc.array(editArb, { minLength: 1, maxLength: 3 })) },
  { weight: 1, arbitrary: fc.anything({ withNullPrototype: true, withSparseArray: true }).map((x) => ['raw', x] as const) },
);

describe('scenario validator fuzz', () => {
  it(`${VALIDATOR_RUNS.toLocaleString('en')} generated documents: issues with paths, or finite resolved values; never a throw`, () => {
    const t0 = performance.now();
    let accepted = 0;
    fc.assert(
      fc.property(docArb, (c) => {
        const doc = c[0] === 'raw' ? c[1] : applyEdits(loadExample(c[0]), c[1] as Edit[]);
        const v = validateScenario(doc);
        if (!v.ok) {
          expect(v.errors.length).toBeGreaterThan(0);
          for (const i of v.errors) {
            expect(typeof i.path).toBe('string');
            expect(i.rule).toMatch(/^[a-z][a-z0-9-]*$/);
            expect(i.message.length).toBeGreaterThan(5);
            expect(i.message).not.toContain('[object Object]');
          }
          return;
        }
        accepted++;
        const r = loadScenario(doc);
        expect(r.ok).toBe(true);
        if (r.ok) expect(nonFinite(r.value)).toBeNull();
        // The polluting key never reaches a prototype.
        expect(({} as Record<string, unknown>).polluted).toBeUndefined();
      }),
      { numRuns: VALIDATOR_RUNS, seed: 17_0001 },
    );
    const s = (performance.now() - t0) / 1000;
    console.log(`validator fuzz: ${VALIDATOR_RUNS} cases (${accepted} accepted) in ${s.toFixed(1)} s`);
  }, 240_000);
});

describe('pipeline and exporter fuzz', () => {
  it(`${PIPELINE_RUNS} short flights of edited examples: no throw, no non-finite number in any export, incomplete runs say so`, () => {
    const t0 = performance.now();
    const tally = { refused: 0, flown: 0, incomplete: 0, exports: 0 };
    fc.assert(
      fc.property(fc.constantFrom(...EXAMPLE_FILES), fc.array(editArb, { minLength: 0, maxLength: 2 }), fc.nat(), (name, edits, pick) => {
        const doc = applyEdits(loadExample(name), edits);
        if (doc && typeof doc === 'object' && doc.simulation && typeof doc.simulation === 'object') doc.simulation.durationS = 8;
        const controllers =
          Array.isArray(doc?.controllers) && doc.controllers.length ? [doc.controllers[pick % doc.controllers.length]?.id] : undefined;
        const r = runPipeline(doc, {
          controllers: controllers?.every((x) => typeof x === 'string') ? (controllers as string[]) : undefined,
          modes: ['step-target'],
          budget: { maxSamplesPerRun: 20_000, maxComputeS: 5 },
        });
        if (!r.ok) {
          tally.refused++;
          for (const i of r.errors) expect(typeof i.path === 'string' && i.message.length > 5).toBe(true);
          return;
        }
        tally.flown++;
        for (const run of r.value.runs) {
          const note = runEndNote(run);
          if (note) tally.incomplete++;
          for (const f of EXPORT_FORMATS) {
            const x = exportRun(f, run, r.value, { toolName: 'Slewsmith', toolVersion: 'fuzz', creationDateUtc: '2030-01-01T00:00:00Z' });
            if (!x.ok) {
              for (const i of x.errors) expect(typeof i.path === 'string' && i.message.length > 5).toBe(true);
              continue;
            }
            tally.exports++;
            expect(x.value).not.toMatch(/\bNaN\b|Infinity/);
            if (note) expect(x.value).toMatch(/RUN (FAILED|TRUNCATED)/);
          }
        }
      }),
      { numRuns: PIPELINE_RUNS, seed: 17_0002 },
    );
    const s = (performance.now() - t0) / 1000;
    console.log(`pipeline fuzz: ${PIPELINE_RUNS} cases (${JSON.stringify(tally)}) in ${s.toFixed(1)} s`);
  }, 600_000);
});

describe('minimal failing inputs the fuzz found (regressions)', () => {
  // A direction's length does not change the attitude it defines (the pointing and axis-angle
  // definitions use directions only; schema.ts: "any non-zero length").
  it('a pointing axis of length 5e-324 or 1.7e308·√3 resolves like the same axis of length 1', () => {
    const j = loadExample('kestrel60-momentum');
    const k = (j.targets as any[]).findIndex((t) => t.attitude?.pointing);
    expect(k).toBeGreaterThanOrEqual(0);
    const q = (axis: number[]) => {
      const d = loadExample('kestrel60-momentum');
      const dir = d.targets[k].attitude.pointing.bodyAxis as number[];
      const big = Math.max(...dir.map(Math.abs));
      d.targets[k].attitude.pointing.bodyAxis = dir.map((x, i) => (x / big) * axis[i]!);
      const r = loadScenario(d);
      if (!r.ok) throw new Error(JSON.stringify(r.errors));
      return Array.from(r.value.targets[k]!.qInertialFromBody);
    };
    const ref = q([1, 1, 1]);
    for (const s of [5e-324, 1.7e308]) {
      const got = q([s, s, s]);
      for (let i = 0; i < 4; i++) expect(got[i]).toBeCloseTo(ref[i]!, 12);
    }
  });

  it('a custom wheel axis with three components of 1.7e308 is a finite unit axis', () => {
    const d = loadExample('kestrel60-momentum');
    d.vehicle.wheels.wheels[0].axis = [1.7e308, 1.7e308, 1.7e308];
    const r = loadScenario(d);
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    expect(nonFinite(r.value)).toBeNull();
  });
});
