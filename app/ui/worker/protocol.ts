/** Messages between the renderer and the pipeline worker (structured-clonable data only). */
import type { Result } from '../../engine/errors';
import type { PipelineOutput } from '../../engine/pipeline/types';

export interface RunRequest {
  type: 'run';
  id: number;
  scenario: unknown;
  /** Passed through to runPipeline as its options. */
  options: Record<string, unknown>;
  /** Post a 'partial' reply after this many runs (runPipeline's `partial`); absent: only the result. */
  partialAfterRuns?: number;
  /** With partialAfterRuns: fly the rest only when a 'continue' for this id comes (answerPass.ts). */
  partialWait?: boolean;
}

/** The renderer has shown the partial reply of pass `id`: fly the rest (go) or drop it (a newer edit came). */
export interface ContinueRequest {
  type: 'continue';
  id: number;
  go: boolean;
}

export type WorkerMessage = RunRequest | ContinueRequest;

export type RunReply =
  | { type: 'result'; id: number; result: Result<PipelineOutput> }
  | { type: 'crash'; id: number; message: string }
  /** The first runs of pass `id` (copied, not transferred: the same runs come again in the result). */
  | { type: 'partial'; id: number; output: PipelineOutput; total: number };

/** The typed-array buffers of an output, each once, for a zero-copy transfer. */
export function transferables(out: PipelineOutput): ArrayBuffer[] {
  const seen = new Set<ArrayBuffer>();
  const add = (a: unknown) => {
    if (ArrayBuffer.isView(a) && a.buffer instanceof ArrayBuffer) seen.add(a.buffer);
  };
  for (const run of out.runs) for (const v of Object.values(run.trace)) add(v);
  for (const v of Object.values(out.vehicle)) add(v);
  add(out.vehicle.torqueEnvelope.vertices);
  add(out.vehicle.torqueEnvelope.triangles);
  add(out.vehicle.momentumEnvelope.vertices);
  add(out.vehicle.momentumEnvelope.triangles);
  add(out.targets);
  add(out.initialQ);
  if (out.orbitView) for (const v of Object.values(out.orbitView)) add(v);
  return [...seen];
}
