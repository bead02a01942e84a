/**
 * One pipeline pass shared by several workers: each flies every `of`-th run (runPipeline's
 * `runSlice`), and the parts are merged back into the output one worker would have given. Every
 * field but the runs is computed identically by each part (same scenario, same stages), so it is
 * taken from part 0; the comparison and the best marks are rebuilt over the merged runs.
 */
import type { Issue } from '../errors';
import { issue } from '../errors';
import { bestMarks, comparisonRow } from './comparison';
import type { ControllerRun, PipelineOutput } from './types';

export interface RunSlice {
  /** This part's index, 0 ≤ index < of. */
  index: number;
  /** Number of parts, ≥ 1. */
  of: number;
}

/** Runs in slice `s` of a pass of `total` runs (numbered 0 … total − 1; slice i has i, i + of, …). */
export function sliceLength(total: number, s: RunSlice): number {
  return s.index < total ? Math.floor((total - 1 - s.index) / s.of) + 1 : 0;
}

/** Problems with a slice (empty when it is usable). */
export function runSliceIssues(s: RunSlice): Issue[] {
  if (!Number.isInteger(s.of) || s.of < 1) return [issue('runSlice.of', 'integer ≥ 1', `runSlice.of must be an integer ≥ 1 (got ${s.of})`)];
  if (!Number.isInteger(s.index) || s.index < 0 || s.index >= s.of)
    return [issue('runSlice.index', 'integer in [0, of)', `runSlice.index must be an integer from 0 to ${s.of - 1} (got ${s.index})`)];
  return [];
}

/** The output of the whole pass from its parts, part i being slice { index: i, of: parts.length }. */
export function mergeRunSlices(parts: readonly PipelineOutput[]): PipelineOutput {
  const first = parts[0];
  if (!first) throw new Error('mergeRunSlices: no parts');
  if (parts.length === 1) return first;
  const total = parts.reduce((n, p) => n + p.runs.length, 0);
  const runs: ControllerRun[] = [];
  for (let k = 0; k < total; k++) {
    const run = parts[k % parts.length]!.runs[Math.floor(k / parts.length)];
    if (!run) throw new Error(`mergeRunSlices: run ${k} missing from part ${k % parts.length}`);
    runs.push(run);
  }
  const comparison = runs.map(comparisonRow);
  return {
    ...first,
    runs,
    comparison,
    best: bestMarks(comparison),
    // The parts ran side by side: the pass took as long as the slowest.
    elapsedMs: Math.max(...parts.map((p) => p.elapsedMs)),
  };
}
