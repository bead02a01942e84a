/**
 * The pipeline worker's answer to one request (pipeline.worker.ts posts what this gives), kept
 * apart from the worker global so tests can fly it in Node with structured cloning.
 *
 * With `partialAfterRuns`, a 'partial' reply (the first runs) is posted during the pass, cloned
 * rather than transferred: the same runs come again in the result, whose buffers are transferred.
 *
 * With `wait` as well, the pass stops after the partial reply and the rest waits until `wait`
 * calls back (the renderer has painted the first run, so the two do not compete for the cores);
 * the whole pass is then flown from the start, so the result is the undivided pass by
 * construction. `wait` calling back with go = false drops the rest (a newer edit replaced it):
 * the result is then a 'cancelled' failure, which the client discards as stale.
 */
import { fail } from '../../engine/errors';
import { runPipeline } from '../../engine/pipeline/run';
import type { OrbitViewCache } from '../../engine/orbit/viewSamplesCache';
import type { PipelineOutput } from '../../engine/pipeline/types';
import type { RunReply, RunRequest } from './protocol';
import { transferables } from './protocol';

export type PostReply = (reply: RunReply, transfer: ArrayBuffer[]) => void;
export type WaitForRest = (resume: (go: boolean) => void) => void;

function crash(id: number, e: unknown): RunReply {
  // A throw here is an engine bug, not bad input (bad input comes back as errors); say so.
  return { type: 'crash', id, message: e instanceof Error ? `${e.name}: ${e.message}` : String(e) };
}

function whole(
  req: RunRequest,
  post: PostReply,
  orbitViewCache: OrbitViewCache,
  partial?: { afterRuns: number; post: (o: PipelineOutput, total: number) => void },
): void {
  let reply: RunReply;
  let transfer: ArrayBuffer[] = [];
  try {
    const result = runPipeline(req.scenario, { ...(req.options as object), orbitViewCache, ...(partial ? { partial } : {}) });
    reply = { type: 'result', id: req.id, result };
    if (result.ok) transfer = transferables(result.value);
  } catch (e) {
    reply = crash(req.id, e);
  }
  post(reply, transfer);
}

export function answerRun(req: RunRequest, post: PostReply, orbitViewCache: OrbitViewCache, wait?: WaitForRest): void {
  const afterRuns = req.partialAfterRuns;
  const postPartial = (output: PipelineOutput, total: number) => post({ type: 'partial', id: req.id, output, total }, []);
  if (afterRuns === undefined) return whole(req, post, orbitViewCache);
  if (!wait) return whole(req, post, orbitViewCache, { afterRuns, post: postPartial });
  let early: { output: PipelineOutput; total: number } | null = null;
  let first;
  try {
    first = runPipeline(req.scenario, {
      ...(req.options as object),
      orbitViewCache,
      partial: { afterRuns, post: (output, total) => (early = { output, total }) },
      shouldStop: () => early !== null,
    });
  } catch (e) {
    return post(crash(req.id, e), []);
  }
  const got = early as { output: PipelineOutput; total: number } | null;
  if (!got) {
    // No partial output (a failure, or a pass of no more runs than afterRuns): this is the whole pass.
    return post({ type: 'result', id: req.id, result: first }, first.ok ? transferables(first.value) : []);
  }
  postPartial(got.output, got.total);
  wait((go) => {
    if (go) whole(req, post, orbitViewCache);
    else
      post({ type: 'result', id: req.id, result: fail([{ path: '', rule: 'cancelled', message: 'A newer edit replaced this pass' }]) }, []);
  });
}
