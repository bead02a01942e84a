/**
 * Structural sharing of a new output with the one shown (app/ui/store/shareOutput.ts, issue 12
 * "edit → updated plots"): after a gain edit the store's output must still equal the new pass
 * exactly (every value, −0 and NaN apart, typed arrays with their type; elapsedMs included), while
 * the runs the edit did not change, and the unchanged vehicle, plan and scenario summary, keep the
 * shown output's objects so the views can skip them. Any difference, however small, must not be
 * shared. (Plumbing, no outside source: the reference is the new pass itself.)
 */
import fs from 'node:fs';
import { describe, expect, it } from 'vitest';
import { runPipeline } from '../../app/engine/pipeline/run';
import { createRunCache, exactText } from '../../app/engine/pipeline/runCache';
import type { PipelineOutput } from '../../app/engine/pipeline/types';
import { shareOutput, shareUnchanged } from '../../app/ui/store/shareOutput';
import { createAppStore } from '../../app/ui/store/document';
import { preflight } from '../../app/ui/preflight';

type Json = Record<string, unknown>;
const demo = JSON.parse(fs.readFileSync(new URL('../../assets/lumen6-imaging.scenario.json', import.meta.url), 'utf8')) as Json;
const value = (r: ReturnType<typeof runPipeline>): PipelineOutput => {
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
};
const text = (x: unknown): string => {
  const t = exactText(x);
  if (t === null) throw new Error('not plain data');
  return t;
};
/** The demo with controller `index`'s bandwidth scaled (a gain edit of one law). */
const gainEdit = (index: number, factor: number): Json => {
  const j = structuredClone(demo);
  const g = (j.controllers as Json[])[index]!.gains as Record<string, number>;
  g.bandwidthRadPerS = g.bandwidthRadPerS! * factor;
  return j;
};

// One run cache, as the app's worker keeps: the second pass flies the hysteretic runs only.
const cache = createRunCache();
const before = value(runPipeline(demo, { runCache: cache }));
const after = value(runPipeline(gainEdit(1, 1.1), { runCache: cache }));
// As the worker's reply arrives: a structured clone, every object new.
const arrived = structuredClone(after);

describe('shareOutput on a gain edit of the demo', () => {
  const shared = shareOutput(before, arrived);

  it('equals the new pass exactly and leaves both inputs as they were', () => {
    const a = text(after);
    expect(text(shared) === a).toBe(true);
    expect(text(arrived) === a).toBe(true);
    expect(text({ ...before, elapsedMs: 0 }) === text({ ...value(runPipeline(demo)), elapsedMs: 0 })).toBe(true);
  });

  it('keeps the objects of the runs the edit did not change, and only those', () => {
    for (const r of shared.runs) {
      const old = before.runs.find((x) => x.key === r.key)!;
      if (r.controllerId === 'hysteretic') {
        expect(r).not.toBe(old);
        expect(r.trace.errorAngle).not.toBe(old.trace.errorAngle);
      } else {
        expect(r).toBe(old);
      }
    }
    expect(shared.runs.map((r) => r.key)).toEqual(after.runs.map((r) => r.key));
    expect(shared.vehicle).toBe(before.vehicle);
    expect(shared.plan).toBe(before.plan);
    expect(shared.targets).toBe(before.targets);
    // The scenario summary holds the file (with the edited gain); its targets are unchanged.
    expect(shared.scenario).not.toBe(before.scenario);
    expect(shared.scenario.file.targets).toBe(before.scenario.file.targets);
    expect(shared.scenario.targets).toBe(before.scenario.targets);
    expect(shared.comparison).not.toBe(before.comparison);
    expect(shared.comparison[0]).toBe(before.comparison[0]);
  });

  it('shares nothing of a pass whose every run changed but what is still equal', () => {
    const vehicle = structuredClone(demo);
    (vehicle.vehicle as { inertiaKgm2: number[][] }).inertiaKgm2[0]![0]! *= 1.05;
    const other = value(runPipeline(vehicle));
    const s = shareOutput(before, structuredClone(other));
    expect(text(s) === text(other)).toBe(true);
    for (const r of s.runs) expect(before.runs).not.toContain(r);
    expect(s.vehicle).not.toBe(before.vehicle);
  });

  it('matches runs by key in a partial output (fewer runs, another order)', () => {
    const partial = { ...structuredClone(after), runs: structuredClone([after.runs[4]!, after.runs[2]!]) };
    const s = shareOutput(before, partial);
    expect(s.runs[0]).toBe(before.runs[4]);
    expect(s.runs[1]).not.toBe(before.runs[2]);
    expect(text(s) === text(partial)).toBe(true);
  });
});

describe('shareUnchanged on small values', () => {
  it('shares equal plain data, returns the shown object when all is equal', () => {
    const prev = { a: [1, 2, { b: 'x' }], c: new Float64Array([1, NaN, -0]) };
    const next = structuredClone(prev);
    expect(shareUnchanged(prev, next)).toBe(prev);
    const edited = { ...structuredClone(prev), d: 1 };
    const s = shareUnchanged(prev, edited);
    expect(s).not.toBe(prev);
    expect(s.a).toBe(prev.a);
    expect(s.c).toBe(prev.c);
    expect(text(s) === text(edited)).toBe(true);
  });

  it('never shares what differs: −0 and 0, NaN payloads, element type, length, key order, a hole', () => {
    expect(shareUnchanged({ x: 0 }, { x: -0 }).x).toBe(-0);
    expect(shareUnchanged([0], [-0])[0]).toBe(-0);
    const nan1 = new Float64Array([NaN]);
    const nan2 = new Float64Array(1);
    new DataView(nan2.buffer).setBigUint64(0, 0x7ff8000000000001n, true);
    expect(Number.isNaN(nan2[0]!)).toBe(true);
    expect(shareUnchanged(nan1, nan2)).toBe(nan2);
    const f32 = new Float32Array([1, 2]);
    expect(shareUnchanged(new Int32Array(f32.buffer.slice(0)), f32)).toBe(f32);
    expect(shareUnchanged(new Float64Array([1, 2]), new Float64Array([1, 2, 3])).length).toBe(3);
    const reordered = { b: 1, a: 2 };
    expect(shareUnchanged({ a: 2, b: 1 }, reordered)).toBe(reordered);
    // eslint-disable-next-line no-sparse-arrays
    const holey = [1, , 3];
    expect(shareUnchanged([1, undefined, 3], holey)).toBe(holey);
    const extraKey = { a: 1, b: undefined };
    expect(shareUnchanged({ a: 1 }, extraKey)).toBe(extraKey);
  });

  it('does not share a Map or a class instance', () => {
    const m = new Map([[1, 2]]);
    expect(shareUnchanged(new Map([[1, 2]]), m)).toBe(m);
    class P {
      x = 1;
    }
    const p = new P();
    expect(shareUnchanged(new P(), p)).toBe(p);
  });
});

describe('the store keeps unchanged runs across a partial and a complete reply', () => {
  it('shows exactly the new pass, with the unchanged runs as the previous objects', () => {
    const store = createAppStore(demo, { validate: preflight });
    store.setOutput(structuredClone(before), demo, 1);
    const shown = store.getState().output!;
    const edited = gainEdit(1, 1.1);
    // The worker's partial reply: the run flown first (hysteretic's first; the cached ones are left out).
    const early = { ...structuredClone(after), runs: structuredClone(after.runs.slice(2, 3)) };
    expect(store.setPartialOutput(early, edited, { passId: 2, done: 1, total: 6 })).toBe(true);
    const mid = store.getState().output!;
    // Shown in the pass's order (a run's colour is its place), the others as before.
    expect(mid.runs.map((r) => r.key)).toEqual(after.runs.map((r) => r.key));
    expect(mid.runs[0]).toBe(shown.runs[0]);
    expect(mid.runs[2]).not.toBe(shown.runs[2]);
    expect(mid.runs[5]).toBe(shown.runs[5]); // still to come: the previous trace
    store.setOutput(structuredClone(after), edited, 2);
    const done = store.getState().output!;
    expect(text(done) === text(after)).toBe(true);
    expect(store.getState().completeOutput).toBe(done);
    expect(done.runs[0]).toBe(shown.runs[0]);
    expect(done.runs[2]).toBe(mid.runs[2]);
    expect(done.runs[3]).not.toBe(shown.runs[3]);
    expect(done.runs[4]).toBe(shown.runs[4]);
  });
});
