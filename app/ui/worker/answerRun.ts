/**
 * The pipeline worker's answer to one request (pipeline.worker.ts posts what this gives), kept
 * apart from the worker global so tests can fly it in Node with structured cloning.
 *
 * With `partialAfterRuns`, a 'partial' reply (the first runs) is posted during the pass, cloned
 * rather than transferred: the same runs come again in the result, whose buffers are transferred.
 */
import { runPipeline } from '../../engine/pipeline/run';
import type { OrbitViewCache } from '../../engine/orbit/viewSamplesCache';
import type { PipelineOutput } from '../../engine/pipeline/types';
import type { RunReply, RunRequest } from './protocol';
import { transferables } from './protocol';

export type PostReply = (reply: RunReply, transfer: ArrayBuffer[]) => void;

export function answerRun(req: RunRequest, post: PostReply, orbitViewCache: OrbitViewCache): void {
  let reply: RunReply;
  let transfer: ArrayBuffer[] = [];
  try {
    const partial =
      req.partialAfterRuns !== undefined
        ? {
            afterRuns: req.partialAfterRuns,
            post: (output: PipelineOutput, total: number) => post({ type: 'partial', id: req.id, output, total }, []),
          }
        : undefined;
    const result = runPipeline(req.scenario, { ...(req.options as object), orbitViewCache, ...(partial ? { partial } : {}) });
    reply = { type: 'result', id: req.id, result };
    if (result.ok) transfer = transferables(result.value);
  } catch (e) {
    // A throw here is an engine bug, not bad input (bad input comes back as errors); say so.
    reply = { type: 'crash', id: req.id, message: e instanceof Error ? `${e.name}: ${e.message}` : String(e) };
  }
  post(reply, transfer);
}
