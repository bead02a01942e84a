/**
 * Running a study in one thread: a chunk runner (what a worker does with the cases it is handed:
 * a Web Worker in the renderer or a worker thread in the CLI) and a whole-study runner built on
 * it. Synchronous; progress and cancellation through callbacks, as in pipeline/run.ts.
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import type { StudyContext, StudyOverrides } from './context';
import { makeStudyContext } from './context';
import type { CaseRecord } from './runCase';
import { runCase } from './runCase';
import type { MapPoint, StudyInfo, StudySummary } from './summary';
import { studySummaryOf } from './summary';
import type { StudyAccumulator } from './accumulate';
import { accumulateCase, createStudyAccumulator } from './accumulate';

export interface StudyProgress {
  done: number;
  total: number;
  /** Runs (case × controller) that did not settle or failed, so far. */
  notSettled: number;
  unflyable: number;
  elapsedMs: number;
  /** Estimated time to finish, ms (null before the first case). */
  remainingMs: number | null;
}

export interface StudyResult {
  info: StudyInfo;
  summary: StudySummary;
  /** The outcome map of the summary (the first MAP_SAMPLE_CASES cases). */
  map: MapPoint[];
  /** The mergeable state the summary was made from. */
  accumulator: StudyAccumulator;
  /** Finished cases in case order (empty when the runner was told not to keep them). */
  records: CaseRecord[];
  warnings: Issue[];
}

export function studyInfo(ctx: StudyContext): StudyInfo {
  return {
    scenarioName: ctx.prepared.scenario.name,
    scenario: ctx.json,
    def: ctx.def,
    controllers: ctx.controllers.map((c) => ({ id: c.id, label: c.label, law: c.law })),
  };
}

/**
 * Run the given case indices in order; `onCase` sees each finished case. Stops between (and
 * inside) cases when `shouldStop` returns true; an interrupted case is dropped.
 */
export function runStudyChunk(
  ctx: StudyContext,
  indices: readonly number[],
  onCase: (r: CaseRecord) => void,
  shouldStop?: () => boolean,
): number {
  let n = 0;
  for (const i of indices) {
    if (shouldStop?.()) break;
    const r = runCase(ctx, i, shouldStop);
    if (!r) break;
    onCase(r);
    n++;
  }
  return n;
}

/** Counts for progress reports. */
export class ProgressCounter {
  done = 0;
  notSettled = 0;
  unflyable = 0;
  private readonly t0 = Date.now();
  constructor(readonly total: number) {}
  add(r: CaseRecord): void {
    this.done++;
    for (const x of r.runs) {
      if (x.status === 'unsettled' || x.status === 'failed') this.notSettled++;
    }
    if (r.runs.length && r.runs.every((x) => x.status === 'unflyable')) this.unflyable++;
  }
  snapshot(): StudyProgress {
    const elapsedMs = Date.now() - this.t0;
    const remainingMs = this.done > 0 ? (elapsedMs / this.done) * (this.total - this.done) : null;
    return { done: this.done, total: this.total, notSettled: this.notSettled, unflyable: this.unflyable, elapsedMs, remainingMs };
  }
}

export interface RunStudyOptions {
  onProgress?: (p: StudyProgress) => void;
  shouldStop?: () => boolean;
}

/** The whole study in this thread (small studies, tests, a single Web Worker). */
export function runStudy(json: unknown, overrides: StudyOverrides = {}, opts: RunStudyOptions = {}): Result<StudyResult> {
  const c = makeStudyContext(json, overrides);
  if (!c.ok) return fail(c.errors, c.warnings);
  const ctx = c.value;
  const info = studyInfo(ctx);
  const acc = createStudyAccumulator(info);
  const records: CaseRecord[] = [];
  const progress = new ProgressCounter(ctx.def.runs);
  const all = Array.from({ length: ctx.def.runs }, (_, i) => i);
  runStudyChunk(
    ctx,
    all,
    (r) => {
      accumulateCase(acc, r);
      records.push(r);
      progress.add(r);
      opts.onProgress?.(progress.snapshot());
    },
    opts.shouldStop,
  );
  return ok({ info, summary: studySummaryOf(info, acc), map: acc.map, accumulator: acc, records, warnings: ctx.warnings }, ctx.warnings);
}
