/**
 * A pass shown in two replies (issue 12, "edit → updated plots"): the worker posts the first run
 * early, then the whole output. Checks: the complete output is the undivided pass bit for bit;
 * the early output is the first run with the comparison over it; the store never lets a stale
 * reply (partial or complete) replace a newer pass; while partial, the runs still to come keep
 * their previous traces. (Plumbing, no outside source: the reference is runPipeline's undivided
 * pass itself, as in pipeline-slices.test.ts.)
 */
import fs from 'node:fs';
import { describe, expect, it } from 'vitest';
import { runPipeline } from '../../app/engine/pipeline/run';
import { comparisonRow } from '../../app/engine/pipeline/comparison';
import type { PipelineOutput } from '../../app/engine/pipeline/types';
import { createOrbitViewCache } from '../../app/engine/orbit/viewSamplesCache';
import { answerRun } from '../../app/ui/worker/answerRun';
import { createPipelineRunner, type WorkerLike } from '../../app/ui/worker/client';
import type { RunReply, RunRequest, WorkerMessage } from '../../app/ui/worker/protocol';
import { createAppStore } from '../../app/ui/store/document';
import { preflight } from '../../app/ui/preflight';

const load = (f: string): unknown => JSON.parse(fs.readFileSync(new URL(`../../assets/${f}`, import.meta.url), 'utf8'));
const value = (r: ReturnType<typeof runPipeline>): PipelineOutput => {
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
};
const sameButTime = (a: PipelineOutput, b: PipelineOutput) => expect({ ...a, elapsedMs: 0 }).toEqual({ ...b, elapsedMs: 0 });

/**
 * The worker of pipeline.worker.ts, in process: every message crosses a structured clone with its
 * transfer list; a pass waiting for 'continue' (partialWait) is resumed by that message.
 */
class InProcessWorker implements WorkerLike {
  onmessage: ((ev: MessageEvent<RunReply>) => void) | null = null;
  onerror: ((ev: ErrorEvent) => void) | null = null;
  private cache = createOrbitViewCache();
  private pending: { id: number; resume: (go: boolean) => void } | null = null;
  postMessage(m: WorkerMessage) {
    const req = structuredClone(m);
    if (req.type === 'continue') {
      const p = this.pending;
      this.pending = null;
      if (p && p.id === req.id) p.resume(req.go);
      return;
    }
    const post = (reply: RunReply, transfer: ArrayBuffer[]) =>
      this.onmessage?.({ data: structuredClone(reply, { transfer }) } as MessageEvent<RunReply>);
    answerRun(req, post, this.cache, req.partialWait ? (resume) => (this.pending = { id: req.id, resume }) : undefined);
  }
  terminate() {}
}

describe('runPipeline partial option', () => {
  for (const file of ['lumen6-imaging.scenario.json', 'tern12-reversal.scenario.json']) {
    it(`${file}: one early output of the first run; the final output equals the undivided pass`, () => {
      const json = load(file);
      const whole = value(runPipeline(json));
      const early: { out: PipelineOutput; total: number }[] = [];
      const final = value(runPipeline(json, { partial: { afterRuns: 1, post: (out, total) => early.push({ out, total }) } }));
      sameButTime(final, whole);
      if (whole.runs.length < 2) {
        expect(early).toHaveLength(0);
        return;
      }
      expect(early).toHaveLength(1);
      const e = early[0]!;
      expect(e.total).toBe(whole.runs.length);
      expect(e.out.runs).toEqual([whole.runs[0]]);
      expect(e.out.comparison).toEqual([comparisonRow(whole.runs[0]!)]);
      expect(e.out.plan).toEqual(whole.plan);
      expect(e.out.scenario).toEqual(whole.scenario);
    });
  }

  it('no early output when the pass has no more runs than afterRuns', () => {
    const json = load('lumen6-imaging.scenario.json');
    const n = value(runPipeline(json)).runs.length;
    let posts = 0;
    runPipeline(json, { partial: { afterRuns: n, post: () => posts++ } });
    expect(posts).toBe(0);
  });
});

describe('runner + worker with partial replies (structured clone, transfer)', () => {
  it('the partial comes first, then the result equal to the undivided pass', () => {
    const json = load('lumen6-imaging.scenario.json');
    const whole = value(runPipeline(json));
    const events: string[] = [];
    let final: PipelineOutput | null = null;
    let early: PipelineOutput | null = null;
    const painted: (() => void)[] = [];
    const runner = createPipelineRunner({
      spawn: () => new InProcessWorker(),
      partialAfterRuns: 1,
      afterPaint: (fn) => painted.push(fn),
      onPartial: (out, total) => {
        events.push(`partial ${out.runs.length}/${total}`);
        early = out;
      },
      onResult: (r) => {
        events.push('result');
        final = value(r);
      },
      onCrash: (m) => events.push(`crash ${m}`),
    });
    runner.runNow(json);
    // The rest of the pass waits for the renderer's paint.
    expect(events).toEqual([`partial 1/${whole.runs.length}`]);
    expect(runner.busy).toBe(true);
    painted.shift()!();
    expect(events).toEqual([`partial 1/${whole.runs.length}`, 'result']);
    sameButTime(final!, whole);
    expect(early!.runs[0]).toEqual(whole.runs[0]);
  });

  it('a newer edit drops the rest of a pass waiting after its partial; only the newer result arrives', () => {
    const json = load('tern12-reversal.scenario.json');
    const edited = structuredClone(json) as { name: string };
    edited.name = `${edited.name} (edited)`;
    const events: string[] = [];
    const painted: (() => void)[] = [];
    const results: PipelineOutput[] = [];
    const runner = createPipelineRunner({
      spawn: () => new InProcessWorker(),
      partialAfterRuns: 1,
      afterPaint: (fn) => painted.push(fn),
      onPartial: (_o, _t, _s, id) => events.push(`partial ${id}`),
      onResult: (r, _s, id) => {
        events.push(`result ${id}`);
        results.push(value(r));
      },
      onCrash: (m) => events.push(`crash ${m}`),
    });
    runner.runNow(json);
    runner.runNow(edited); // waits: pass 1 is in flight (held after its partial)
    painted.shift()!(); // pass 1 is no longer wanted: its rest is dropped, pass 2 starts
    expect(events).toEqual(['partial 1', 'partial 2']);
    painted.shift()!();
    expect(events).toEqual(['partial 1', 'partial 2', 'result 2']);
    sameButTime(results[0]!, value(runPipeline(edited)));
  });

  it('with several workers no partial is asked for (a shared pass is already divided)', () => {
    const sent: RunRequest[] = [];
    const runner = createPipelineRunner({
      spawn: () => ({ postMessage: (m: RunRequest) => sent.push(m), terminate() {}, onmessage: null, onerror: null }),
      workers: 2,
      partialAfterRuns: 1,
      onPartial: () => {},
      onResult: () => {},
      onCrash: () => {},
    });
    runner.runNow({});
    expect(sent).toHaveLength(2);
    expect(sent.every((m) => m.partialAfterRuns === undefined)).toBe(true);
  });

  it('partialSkipsFirstPass: the first pass (the cold start) is flown whole, later passes ask for the early output', () => {
    const sent: RunRequest[] = [];
    const worker: WorkerLike = { postMessage: (m: RunRequest) => sent.push(m), terminate() {}, onmessage: null, onerror: null };
    const runner = createPipelineRunner({
      spawn: () => worker,
      workers: 1,
      partialAfterRuns: 1,
      partialSkipsFirstPass: true,
      onPartial: () => {},
      onResult: () => {},
      onCrash: () => {},
    });
    runner.runNow({});
    expect(sent).toHaveLength(1);
    expect(sent[0]!.partialAfterRuns).toBeUndefined();
    // The first pass answers; the next one is sent with the early output asked for.
    worker.onmessage!({ data: { type: 'result', id: sent[0]!.id, result: { ok: false, errors: [] } } } as MessageEvent);
    runner.runNow({});
    expect(sent).toHaveLength(2);
    expect(sent[1]!.partialAfterRuns).toBe(1);
  });
});

describe('store partial state', () => {
  const json = load('lumen6-imaging.scenario.json');
  const whole = value(runPipeline(json));
  const early = (() => {
    let e: PipelineOutput | null = null;
    runPipeline(json, { partial: { afterRuns: 1, post: (o) => (e = o) } });
    return e! as PipelineOutput;
  })();
  const total = whole.runs.length;
  const fresh = () => createAppStore(json, { validate: preflight });

  it('a partial shows the arrived run first and keeps the previous traces of the runs to come, in pass order', () => {
    const store = fresh();
    const sc = store.getState().scenario;
    store.setOutput(whole, sc, 1);
    store.selectRuns([whole.runs[3]!.key, whole.runs[0]!.key]);
    expect(store.setPartialOutput(early, sc, { passId: 2, done: 1, total })).toBe(true);
    const s = store.getState();
    expect(s.partial).toEqual({ passId: 2, done: 1, total });
    expect(s.output!.runs.map((r) => r.key)).toEqual(whole.runs.map((r) => r.key));
    // The arrived run equals the shown one (same scenario): the store keeps the shown object (shareOutput.ts).
    expect(s.output!.runs[0]).toBe(whole.runs[0]);
    expect(s.output!.runs[3]).toBe(whole.runs[3]);
    expect(s.selectedRunKeys).toEqual([whole.runs[3]!.key, whole.runs[0]!.key]);
    expect(s.completeOutput).toBe(whole);
  });

  it('the complete pass replaces the partial and is the undivided pass', () => {
    const store = fresh();
    const sc = store.getState().scenario;
    store.setPartialOutput(early, sc, { passId: 4, done: 1, total });
    const final = value(runPipeline(json));
    store.setOutput(final, sc, 4);
    const s = store.getState();
    expect(s.partial).toBeNull();
    // The final output, sharing the partial's equal run (shareOutput.ts).
    expect(s.output).toEqual(final);
    expect(s.output!.runs[0]).toBe(early.runs[0]);
    expect(s.completeOutput).toBe(s.output);
    sameButTime(s.output!, whole);
  });

  it('a stale partial never overwrites a newer pass, complete or partial', () => {
    const store = fresh();
    const sc = store.getState().scenario;
    store.setOutput(whole, sc, 5);
    expect(store.setPartialOutput(early, sc, { passId: 5, done: 1, total })).toBe(false); // same pass, already complete
    expect(store.setPartialOutput(early, sc, { passId: 3, done: 1, total })).toBe(false);
    expect(store.getState().partial).toBeNull();
    expect(store.getState().output).toBe(whole);
    expect(store.setPartialOutput(early, sc, { passId: 7, done: 1, total })).toBe(true);
    expect(store.setPartialOutput(early, sc, { passId: 6, done: 1, total })).toBe(false);
    expect(store.getState().partial!.passId).toBe(7);
    // A complete output of an older pass does not replace the newer partial one either.
    const older = { ...whole };
    store.setOutput(older, sc, 6);
    expect(store.getState().output).not.toBe(older);
    expect(store.getState().partial!.passId).toBe(7);
  });
});
