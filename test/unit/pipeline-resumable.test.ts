/**
 * A resumable pass (pipelinePass, issue 12 "edit → updated plots"): the app's worker stops after
 * the first run, lets the renderer paint it, then goes on with the remaining runs of the same pass.
 * Checks: the resumed pass equals the undivided pass bit for bit (runs, comparison, best marks,
 * certificates, monitor results, warnings: everything but the wall-clock elapsedMs), on the demo and
 * on a ten-run example with an orbit; the first run is flown once, not twice; a dropped pass flies
 * nothing more and answers 'cancelled'; the paused time is not counted in elapsedMs.
 * (Plumbing, no outside source: the reference is runPipeline's undivided pass itself, as in
 * pipeline-slices.test.ts.)
 */
import fs from 'node:fs';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { pipelinePass, runPipeline } from '../../app/engine/pipeline/run';
import type { PipelineOutput } from '../../app/engine/pipeline/types';
import { createOrbitViewCache } from '../../app/engine/orbit/viewSamplesCache';
import { answerRun } from '../../app/ui/worker/answerRun';
import type { RunReply } from '../../app/ui/worker/protocol';

const load = (f: string): unknown => JSON.parse(fs.readFileSync(new URL(`../../assets/${f}`, import.meta.url), 'utf8'));
const value = (r: ReturnType<typeof runPipeline>): PipelineOutput => {
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
};
const sameButTime = (a: PipelineOutput, b: PipelineOutput) => expect({ ...a, elapsedMs: 0 }).toEqual({ ...b, elapsedMs: 0 });

/** answerRun as the worker calls it, replies structured-cloned as postMessage does; flights counted. */
function worker(json: unknown) {
  const replies: RunReply[] = [];
  const flown: string[] = [];
  let resume: ((go: boolean) => void) | null = null;
  answerRun(
    // onProgress cannot cross a real postMessage; here it counts the flights inside the worker.
    {
      type: 'run',
      id: 9,
      scenario: json,
      options: { onProgress: (_d: number, _t: number, label: string) => flown.push(label) },
      partialAfterRuns: 1,
    },
    (reply, transfer) => replies.push(structuredClone(reply, { transfer })),
    createOrbitViewCache(),
    (r) => (resume = r),
  );
  return { replies, flown, resume: (go: boolean) => resume!(go) };
}

describe('pipelinePass (resumable pass)', () => {
  afterEach(() => vi.useRealTimers());

  for (const file of ['lumen6-imaging.scenario.json', 'tern12-reversal.scenario.json']) {
    const json = load(file);
    const whole = value(runPipeline(json));

    it(`${file}: stepped one run at a time, with another pass flown during the pause, equals the undivided pass`, () => {
      expect(whole.runs.length).toBeGreaterThan(2);
      const early: PipelineOutput[] = [];
      const pass = pipelinePass(json, { partial: { afterRuns: 1, post: (o) => early.push(o) } });
      const first = pass.next();
      expect(first).toEqual({ done: false, value: { done: 1, total: whole.runs.length } });
      expect(early).toHaveLength(1);
      expect(early[0]!.runs).toEqual([whole.runs[0]]);
      // Whatever engine state a pass leaves behind (scratch buffers, caches) must not reach the paused one.
      value(runPipeline(load('petrel16-pointing.scenario.json')));
      let steps = 1;
      let step = pass.next();
      while (!step.done) {
        steps++;
        step = pass.next();
      }
      expect(steps).toBe(whole.runs.length);
      sameButTime(value(step.value), whole);
    });

    it(`${file}: the worker posts the first run, waits, then finishes the same pass (each run flown once)`, () => {
      const w = worker(json);
      expect(w.replies.map((r) => r.type)).toEqual(['partial']);
      expect(w.flown).toHaveLength(1);
      w.resume(true);
      expect(w.replies.map((r) => r.type)).toEqual(['partial', 'result']);
      // Before the resumable pass the first run was flown again: runs + 1 flights.
      expect(w.flown).toHaveLength(whole.runs.length);
      expect(new Set(w.flown).size).toBe(whole.runs.length);
      const last = w.replies[1]!;
      if (last.type !== 'result') throw new Error('no result');
      sameButTime(value(last.result), whole);
    });
  }

  it('a dropped pass (a newer edit came) flies nothing more and answers cancelled', () => {
    const w = worker(load('lumen6-imaging.scenario.json'));
    w.resume(false);
    expect(w.flown).toHaveLength(1);
    const last = w.replies[1]!;
    expect(last.type).toBe('result');
    if (last.type === 'result') expect(!last.result.ok && last.result.errors[0]!.rule).toBe('cancelled');
  });

  it('the time a pass spends paused is not counted in its elapsedMs', () => {
    vi.useFakeTimers({ toFake: ['Date'] });
    const pass = pipelinePass(load('lumen6-imaging.scenario.json'));
    const t0 = Date.now();
    pass.next();
    vi.setSystemTime(Date.now() + 3_600_000); // an hour's pause between two runs
    let step = pass.next();
    while (!step.done) step = pass.next();
    const out = value(step.value);
    // The clock only moves by the pause here, so the pass counts (about) nothing; without the
    // correction it would count the hour.
    expect(out.elapsedMs).toBeLessThan(60_000);
    expect(Date.now() - t0).toBeGreaterThanOrEqual(3_600_000);
  });
});
