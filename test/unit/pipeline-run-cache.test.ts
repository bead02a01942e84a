/**
 * Runs kept between passes (pipeline/runCache.ts, issue 12 "edit → updated plots"): a pass given
 * the run cache flies only the runs whose inputs changed and must equal a fresh pass bit for bit
 * (structured-clone bytes of the whole output, everything but the wall-clock elapsedMs), on the
 * demo and on a ten-run example with an orbit, for a gain edit (one controller's runs flown), a
 * vehicle edit (all flown) and no edit (none flown), also through the worker's resumable path.
 * The run key must miss for every changed input: each leaf of the resolved scenario (every number,
 * string, flag and array element) changed one at a time. (Plumbing, no outside source: the
 * reference is runPipeline's pass without a cache.)
 */
import fs from 'node:fs';
import { serialize } from 'node:v8';
import { describe, expect, it } from 'vitest';
import { resolveScenario } from '../../app/engine/scenario/resolve';
import { validateScenario } from '../../app/engine/scenario/validate';
import { pipelinePass, runPipeline } from '../../app/engine/pipeline/run';
import { copyData, createRunCache, exactText, runKey, type RunCache, type RunKeySettings } from '../../app/engine/pipeline/runCache';
import type { PipelineOutput } from '../../app/engine/pipeline/types';
import { createOrbitViewCache } from '../../app/engine/orbit/viewSamplesCache';
import { answerRun } from '../../app/ui/worker/answerRun';
import type { RunReply } from '../../app/ui/worker/protocol';

const load = (f: string): Record<string, unknown> =>
  JSON.parse(fs.readFileSync(new URL(`../../assets/${f}`, import.meta.url), 'utf8')) as Record<string, unknown>;
const value = (r: ReturnType<typeof runPipeline>): PipelineOutput => {
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
};
/**
 * The output written out exactly (runCache.ts exactText: every double by its shortest round-trip
 * text, −0 and NaN apart, typed arrays with their type), elapsedMs left out. (Not v8.serialize:
 * two fresh passes already differ there, as V8 stores some equal numbers as small integers.)
 */
const bits = (o: PipelineOutput): string => {
  const t = exactText({ ...o, elapsedMs: 0 });
  if (t === null) throw new Error('output not plain data');
  return t;
};
// (Not toStrictEqual as well: over 6 MB of traces it takes tens of seconds and checks less.)
const expectSame = (a: PipelineOutput, b: PipelineOutput) => expect(bits(a) === bits(b)).toBe(true);

/** A pass with the cache; returns the output and the labels of the runs flown. */
function cachedPass(json: unknown, cache: RunCache): { out: PipelineOutput; flown: string[] } {
  const flown: string[] = [];
  const out = value(runPipeline(json, { runCache: cache, onProgress: (_d, _t, label) => flown.push(label) }));
  return { out, flown };
}

type Json = Record<string, unknown>;
const gainEdit = (json: Json, index: number): Json => {
  const j = structuredClone(json);
  const c = (j.controllers as Json[])[index]!;
  const g = c.gains as Record<string, number>;
  const k = Object.keys(g)[0]!;
  g[k] = g[k]! * 1.25;
  return j;
};
const vehicleEdit = (json: Json): Json => {
  const j = structuredClone(json);
  const inertia = (j.vehicle as { inertiaKgm2: number[][] }).inertiaKgm2;
  inertia[0]![0] = inertia[0]![0]! * 1.1;
  return j;
};

describe('run cache: a pass flies only the changed runs and equals a fresh pass', () => {
  for (const file of ['lumen6-imaging.scenario.json', 'tern12-reversal.scenario.json']) {
    const json = load(file);
    const controllers = (json.controllers as Json[]).length;

    it(`${file}: gain edit, vehicle edit, no edit`, () => {
      const cache = createRunCache();
      const first = cachedPass(json, cache);
      expectSame(first.out, value(runPipeline(json)));
      const runs = first.out.runs.length;
      const perController = runs / controllers;
      expect(first.flown).toHaveLength(runs);

      const same = cachedPass(json, cache);
      expect(same.flown).toHaveLength(0);
      expectSame(same.out, first.out);

      const gain = gainEdit(json, 1);
      const g = cachedPass(gain, cache);
      expect(g.flown).toHaveLength(perController);
      expect(new Set(g.flown.map((l) => l.replace(/ \(.*\)$/, ''))).size).toBe(1);
      const fresh = value(runPipeline(gain));
      expectSame(g.out, fresh);
      // The edit changed that controller's runs (else the test would prove nothing).
      expect(bits(fresh) === bits(first.out)).toBe(false);

      const veh = cachedPass(vehicleEdit(gain), cache);
      expect(veh.flown).toHaveLength(runs);
      expectSame(veh.out, value(runPipeline(vehicleEdit(gain))));

      // Back to the start: the vehicle edit's pass dropped the older runs, so all fly again.
      const back = cachedPass(json, cache);
      expect(back.flown).toHaveLength(runs);
      expectSame(back.out, first.out);
      expect(cache.stats.held).toBe(runs);
    });

    it(`${file}: through the worker (partial reply, paused, resumed) after a gain edit`, () => {
      const caches = { orbitViewCache: createOrbitViewCache(), runCache: createRunCache() };
      const replies: RunReply[] = [];
      const flown: string[] = [];
      let resume: ((go: boolean) => void) | null = null;
      const ask = (scenario: unknown, id: number) =>
        answerRun(
          {
            type: 'run',
            id,
            scenario,
            options: { onProgress: (_d: number, _t: number, label: string) => flown.push(label) },
            partialAfterRuns: 1,
            partialWait: true,
          },
          (reply, transfer) => replies.push(structuredClone(reply, { transfer })),
          caches,
          (r) => (resume = r),
        );
      ask(json, 1);
      resume!(true);
      const runs = flown.length;
      flown.length = 0;
      replies.length = 0;
      const gain = gainEdit(json, controllers - 1);
      ask(gain, 2);
      // The partial reply holds the first changed run only (the renderer keeps the previous traces of
      // the others until the result).
      expect(replies.map((r) => r.type)).toEqual(['partial']);
      const partial = replies[0]!;
      if (partial.type !== 'partial') throw new Error('no partial');
      expect(partial.total).toBe(runs);
      expect(partial.output.runs.map((r) => r.controllerId)).toEqual([
        value(runPipeline(gain)).runs[runs - runs / controllers]!.controllerId,
      ]);
      resume!(true);
      expect(flown).toHaveLength(runs / controllers);
      const last = replies[1]!;
      if (last.type !== 'result') throw new Error('no result');
      expectSame(value(last.result), value(runPipeline(gain)));
    });
  }

  it('a pass cut short by shouldStop keeps no run, and a pass of cached runs has no step', () => {
    const json = load('lumen6-imaging.scenario.json');
    const cache = createRunCache();
    let calls = 0;
    runPipeline(json, { runCache: cache, shouldStop: () => ++calls > 3 });
    expect(cache.stats.stored).toBe(0);
    cachedPass(json, cache);
    const pass = pipelinePass(json, { runCache: cache });
    expect(pass.next().done).toBe(true);
  });

  it('copies cached runs and stores the flown one only after the early reply is posted; a claim outlives its eviction', () => {
    const json = load('lumen6-imaging.scenario.json');
    const cache = createRunCache();
    cachedPass(json, cache);
    const events: string[] = [];
    const watched: RunCache = {
      stats: cache.stats,
      take: (k) => cache.take(k),
      claim: (k) => {
        const c = cache.claim(k);
        return c && (() => (events.push('copy'), c()));
      },
      put: (k, r) => (events.push('put'), cache.put(k, r)),
      keepOnly: (keys) => cache.keepOnly(keys),
    };
    const gain = gainEdit(json, 1);
    const out = value(runPipeline(gain, { runCache: watched, partial: { afterRuns: 1, post: () => events.push('post') } }));
    expect(events).toEqual(['post', 'put', 'put', 'copy', 'copy', 'copy', 'copy']);
    expectSame(out, value(runPipeline(gain)));
    // A claim made before the cache drops its run still copies that run.
    const run = out.runs[0]!;
    const small = createRunCache();
    small.put('a', run);
    const claim = small.claim('a')!;
    small.keepOnly(new Set());
    expect(small.stats.held).toBe(0);
    expect(exactText(claim())).toBe(exactText(run));
    expect(small.claim('a')).toBeNull();
  });

  it('a full cache drops the oldest runs; a run over the limit is not kept', () => {
    const json = load('lumen6-imaging.scenario.json');
    const out = value(runPipeline(json));
    const one = createRunCache(1);
    one.put('a', out.runs[0]!);
    expect(one.stats.held).toBe(0);
    const small = createRunCache(Math.ceil(2.5 * serialize(out.runs[0]!.trace).length));
    small.put('a', out.runs[0]!);
    small.put('b', out.runs[1]!);
    small.put('c', out.runs[2]!);
    expect(small.take('a')).toBeNull();
    expect(small.take('c')).toStrictEqual(out.runs[2]);
  });
});

describe('run key', () => {
  const file = load('lumen6-imaging.scenario.json');
  const v = validateScenario(file);
  if (!v.ok) throw new Error('demo invalid');
  const s = resolveScenario(v.value);
  const settings: RunKeySettings = { modes: ['follow-plan', 'step-target'], maxSteps: 1e6, displayTraceLimit: { maxSamples: 1e5 } };
  const id = s.controllers[1]!.id;
  const base = runKey(s, id, 'follow-plan', settings)!;

  /** Every leaf of x: a path and a function that returns a copy of the root with that leaf changed. */
  function leaves(x: unknown, path: string, at: (root: unknown) => unknown, out: { path: string; change: (root: unknown) => unknown }[]) {
    if (x !== null && typeof x === 'object') {
      const keys = ArrayBuffer.isView(x) ? [...Array((x as unknown as ArrayLike<number>).length).keys()] : Object.keys(x);
      for (const k of keys) leaves((x as Record<string, unknown>)[k], `${path}.${k}`, (r) => (at(r) as Record<string, unknown>)[k], out);
      return;
    }
    const changed = (old: unknown): unknown =>
      typeof old === 'number'
        ? old === 0
          ? Number.MIN_VALUE
          : Number.isFinite(old)
            ? old * (1 + 2 ** -52)
            : 0
        : typeof old === 'string'
          ? `${old}x`
          : typeof old === 'boolean'
            ? !old
            : 0;
    out.push({
      path,
      change: (root) => {
        const parts = path.split('.').slice(1);
        const last = parts.pop()!;
        let o = root as Record<string, unknown>;
        for (const p of parts) o = o[p] as Record<string, unknown>;
        o[last] = changed(o[last]);
        return root;
      },
    });
    void at;
  }

  it('misses for every changed leaf of the resolved scenario, its own controller included', () => {
    const all: { path: string; change: (root: unknown) => unknown }[] = [];
    leaves(s, '', (r) => r, all);
    const own = all.filter((l) => !/^\.controllers\.\d+\./.test(l.path) || l.path.startsWith('.controllers.1.'));
    expect(own.length).toBeGreaterThan(100);
    for (const l of own) {
      const edited = l.change(copyData(s)) as typeof s;
      const key = runKey(edited, id, 'follow-plan', settings);
      expect.soft(key, l.path).not.toBe(base);
    }
  });

  it('hits when only another controller changes; misses for the mode and every pass setting', () => {
    const other = copyData(s);
    (other.controllers[0]!.gains as unknown as Record<string, number>)[Object.keys(other.controllers[0]!.gains)[0]!]! *= 2;
    other.controllers.push({ ...other.controllers[2]!, id: 'extra' });
    expect(runKey(other, id, 'follow-plan', settings)).toBe(base);
    expect(runKey(s, id, 'step-target', settings)).not.toBe(base);
    expect(runKey(s, id, 'follow-plan', { ...settings, modes: ['follow-plan'] })).not.toBe(base);
    expect(runKey(s, id, 'follow-plan', { ...settings, maxSteps: 1e6 + 1 })).not.toBe(base);
    expect(runKey(s, id, 'follow-plan', { ...settings, displayTraceLimit: { maxSamples: 2e5 } })).not.toBe(base);
    expect(runKey(s, 'nobody', 'follow-plan', settings)).toBeNull();
  });

  it('writes numbers, undefined and kinds apart; refuses what it cannot write', () => {
    const texts = [
      0,
      -0,
      NaN,
      Infinity,
      -Infinity,
      null,
      undefined,
      '0',
      [0],
      { a: 0 },
      { a: undefined },
      {},
      new Float64Array([0]),
      new Float32Array([0]),
    ].map((x) => exactText({ x }));
    expect(new Set(texts).size).toBe(texts.length);
    expect(exactText(new Map())).toBeNull();
    expect(exactText({ f: () => 0 })).toBeNull();
    expect(exactText(new Array(2))).toBeNull();
  });

  it('copyData keeps views of one buffer on one copied buffer', () => {
    const buf = new ArrayBuffer(32);
    const a = new Float64Array(buf, 0, 2);
    const b = new Float64Array(buf, 16, 2);
    b[1] = -0;
    const c = copyData({ a, b });
    expect(c.a.buffer).toBe(c.b.buffer);
    expect(c.a.buffer).not.toBe(buf);
    expect(Object.is(c.b[1], -0)).toBe(true);
  });
});
