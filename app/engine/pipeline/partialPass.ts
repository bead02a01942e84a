/**
 * An early look at a pass (runPipeline's `partial` option): the app's worker posts the output of
 * the first run(s) so the plots can change before the last run of the pass has flown, then the
 * whole output. The early output is assembled exactly as the final one, over fewer runs; the
 * final output does not depend on whether an early one was taken.
 */
import type { PipelineOutput } from './types';

export interface PartialPass {
  /** Post after this many runs (≥ 1); nothing is posted when the pass has no more runs than this. */
  afterRuns: number;
  /** `total`: the number of runs the whole pass (or slice) will have. */
  post(output: PipelineOutput, total: number): void;
}
