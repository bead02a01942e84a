/**
 * The pipeline worker's answer to one request (pipeline.worker.ts posts what this gives), kept
 * apart from the worker global so tests can fly it in Node with structured cloning. The scenario
 * validator is an argument (the worker loads it only for an input that is not the bundled demo:
 * workerValidator.ts); answerRun.ts binds validateScenario.
 *
 * With `partialAfterRuns`, a 'partial' reply (the first runs) is posted during the pass, cloned
 * rather than transferred: the same runs come again in the result, whose buffers are transferred.
 *
 * With `wait` as well, the pass stops after the partial reply and the rest waits until `wait`
 * calls back (the renderer has painted the first run, so the two do not compete for the cores);
 * the same pass then goes on with the remaining runs (pipelinePass, a generator that stops after
 * each run), so its result is runPipeline's undivided pass, the first run flown once
 * (test/unit/pipeline-resumable.test.ts). `wait` calling back with go = false drops the rest (a
 * newer edit replaced it): the result is then a 'cancelled' failure, which the client discards
 * as stale.
 */
import { fail } from '../../engine/errors';
import { passWith, runWith, type ScenarioValidator } from '../../engine/pipeline/pass';
import type { Result } from '../../engine/errors';
import type { OrbitViewCache } from '../../engine/orbit/viewSamplesCache';
import type { RunCache } from '../../engine/pipeline/runCache';
import type { PipelineOutput } from '../../engine/pipeline/types';
import type { RunReply, RunRequest } from './protocol';
import { transferables } from './protocol';

export type PostReply = (reply: RunReply, transfer: ArrayBuffer[]) => void;
export type WaitForRest = (resume: (go: boolean) => void) => void;

export function crash(id: number, e: unknown): RunReply {
  // A throw here is an engine bug, not bad input (bad input comes back as errors); say so.
  return { type: 'crash', id, message: e instanceof Error ? `${e.name}: ${e.message}` : String(e) };
}

/** What the worker keeps between passes: orbit view samples, and the runs of the last pass (both optional to the engine). */
export interface WorkerCaches {
  orbitViewCache: OrbitViewCache;
  runCache?: RunCache;
}

function whole(
  validate: ScenarioValidator,
  req: RunRequest,
  post: PostReply,
  caches: WorkerCaches,
  partial?: { afterRuns: number; post: (o: PipelineOutput, total: number) => void },
): void {
  let reply: RunReply;
  let transfer: ArrayBuffer[] = [];
  try {
    const result = runWith(validate, req.scenario, { ...(req.options as object), ...caches, ...(partial ? { partial } : {}) });
    reply = { type: 'result', id: req.id, result };
    if (result.ok) transfer = transferables(result.value);
  } catch (e) {
    reply = crash(req.id, e);
  }
  post(reply, transfer);
}

export function answerRunWith(
  validate: ScenarioValidator,
  req: RunRequest,
  post: PostReply,
  caches: OrbitViewCache | WorkerCaches,
  wait?: WaitForRest,
): void {
  const kept: WorkerCaches = 'orbitViewCache' in caches ? caches : { orbitViewCache: caches };
  const afterRuns = req.partialAfterRuns;
  const postPartial = (output: PipelineOutput, total: number) => post({ type: 'partial', id: req.id, output, total }, []);
  if (afterRuns === undefined) return whole(validate, req, post, kept);
  if (!wait) return whole(validate, req, post, kept, { afterRuns, post: postPartial });
  let early: { output: PipelineOutput; total: number } | null = null;
  const pass = passWith(validate, req.scenario, {
    ...(req.options as object),
    ...kept,
    partial: { afterRuns, post: (output, total) => (early = { output, total }) },
  });
  // Flies runs until the pass ends (its result) or `stop` says so after a run (null).
  const flyOn = (stop: () => boolean): Result<PipelineOutput> | null => {
    for (;;) {
      const step = pass.next();
      if (step.done) return step.value;
      if (stop()) return null;
    }
  };
  const answer = (result: Result<PipelineOutput>) =>
    post({ type: 'result', id: req.id, result }, result.ok ? transferables(result.value) : []);
  let first: Result<PipelineOutput> | null;
  try {
    first = flyOn(() => early !== null);
  } catch (e) {
    return post(crash(req.id, e), []);
  }
  // No partial output (a failure, or a pass of no more runs than afterRuns): this is the whole pass.
  if (first) return answer(first);
  const got = early as unknown as { output: PipelineOutput; total: number };
  postPartial(got.output, got.total);
  wait((go) => {
    if (!go)
      return post(
        { type: 'result', id: req.id, result: fail([{ path: '', rule: 'cancelled', message: 'A newer edit replaced this pass' }]) },
        [],
      );
    let rest: Result<PipelineOutput> | null;
    try {
      rest = flyOn(() => false);
    } catch (e) {
      return post(crash(req.id, e), []);
    }
    if (rest) answer(rest);
  });
}
