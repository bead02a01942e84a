/**
 * The store's rules for a pass that arrives in two replies (the worker's 'partial' reply with the
 * first run(s), then the whole output). Pass ids are the runner's, increasing with each request.
 *
 * - A reply of a pass older than the one shown is dropped: a partial never replaces a newer pass
 *   (complete or partial), and a complete output never replaces a newer partial one.
 * - A complete output of the pass shown as partial replaces it (same id is allowed); a partial of
 *   the pass already shown complete is dropped.
 * - While a pass is partial the plots keep the previous output's runs that are still to come, so a
 *   line does not vanish for the tens of milliseconds until its new trace arrives (no flicker);
 *   the runs keep the previous output's order (the complete output's when the run list is unchanged).
 */
import type { ControllerRun, PipelineOutput } from '../../engine/pipeline/types';
import type { AppState } from './document';

/** True when a reply of pass `passId` must not replace what the store shows. */
export function isStalePass(s: Pick<AppState, 'outputPassId' | 'partial'>, passId: number, complete: boolean): boolean {
  if (complete) return passId < s.outputPassId;
  // A partial reply: only for a pass newer than every pass shown so far.
  return passId <= s.outputPassId;
}

/**
 * The partial output with the previous output's runs that have not arrived yet, in the previous
 * output's order with the arrived runs in their places (the worker's early reply holds the runs
 * flown so far, not those its run cache had: a gain edit's run can arrive alone from the middle
 * of the pass, and a run's colour is its place). Arrived runs the previous output did not have
 * come after, in pass order.
 */
export function withComingRuns(partial: PipelineOutput, previous: PipelineOutput | null): PipelineOutput {
  if (!previous) return partial;
  const arrived = new Map(partial.runs.map((r) => [r.key, r]));
  const runs: ControllerRun[] = previous.runs.map((r) => arrived.get(r.key) ?? r);
  const had = new Set(previous.runs.map((r) => r.key));
  for (const r of partial.runs) if (!had.has(r.key)) runs.push(r);
  return runs.length > partial.runs.length ? { ...partial, runs } : partial;
}
