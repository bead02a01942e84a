/**
 * The simulation half of `fly` and `compare`, as plain data in and out: the scenario text and the
 * options go in; the comparison (as text, CSV and JSON), the export files' contents and every
 * problem come out. Nothing here touches the disk or the process, so the same function runs inline
 * (tests, the in-process fuzz test) or in a worker thread (compute-thread.ts), which keeps the main
 * thread free to answer Ctrl-C while a long simulation runs.
 */
import type { Issue } from '../../app/engine/errors';
import { preparePipeline, runPipeline } from '../../app/engine/pipeline/run';
import type { RunMode } from '../../app/engine/pipeline/types';
import { CAUTION_TEXT } from '../../app/engine/caution';
import { exportRunChunks, type ExportFormat } from '../../app/engine/export/runExport';
import type { ChunkSource } from '../../app/engine/export/chunks';
import { runEnd, type RunEnd } from '../../app/engine/pipeline/outcome';
import { comparisonCsv, comparisonTable } from './format';
import { windowErrorText } from './orbitText';
import { violationLines } from './constraintStatus';
import { fullRunExports } from './fullRunExports';

export interface ComputeJob {
  command: 'fly' | 'compare';
  /** The scenario file's text (already checked to be a JSON object by the shared reader). */
  text: string;
  controllers?: string[];
  modes?: RunMode[];
  /** fly only: what to export, named `<base>.<controller>.<mode>.<format>`. */
  exports?: {
    formats: ExportFormat[];
    base: string;
    toolName: string;
    toolVersion: string;
    sampleRateHz?: number;
    creationDateUtc?: string;
    messageId?: string;
  };
}

export interface ExportText {
  /** File name (no folder). */
  name: string;
  /** The whole text (fakes in tests); real results stream it through `openFile` instead. */
  text?: string;
  /** Why the export was refused before any text. */
  errors?: Issue[];
}

/** The next piece of a file's text, or the end with the problems found while writing it (empty: complete). */
export type ChunkPull = () => Promise<{ chunk: string } | { done: Issue[] }>;

/** How one run ended, for the exit status and the closing lines. */
export interface RunEndLine {
  key: string;
  /** settled, unsettled or failed (pipeline/summarise.ts verdictOf). */
  verdict: 'settled' | 'unsettled' | 'failed';
  /** Whether the run reached its planned end (pipeline/outcome.ts). */
  end: RunEnd;
  /** The verdict in a sentence. */
  text: string;
}

export type ComputeResult =
  | { kind: 'invalid'; errors: Issue[] }
  /** An option that only the loaded scenario shows to be out of range (--rate above the control rate). */
  | { kind: 'option'; message: string }
  | {
      kind: 'ran';
      feasible: boolean;
      headline: string;
      table: string;
      csv: string;
      json: string;
      files: ExportText[];
      failedRuns: { key: string; message: string }[];
      /** Every run's verdict: the exit status is 0 only when all settled. */
      runs: RunEndLine[];
      /**
       * File i's text chunk by chunk, pulled by the writer (so a long export never becomes one
       * string and the producer waits for the disk). Set on the caller's side by the computer.
       */
      openFile?: (index: number) => ChunkPull;
      /** Frees what the computer keeps for `openFile` (the worker thread); call once done. */
      release?: () => void;
      /** Attitude-constraint violations of the plan and the runs, one line each (exit status 3 when any). */
      constraintViolations?: string[];
    };

export type ProgressSink = (line: string) => void;

/** `--rate` above the control rate asks for samples the trace does not have: refused by name. */
function rateProblem(job: ComputeJob, controlRateHz: number): string | null {
  const r = job.exports?.sampleRateHz;
  if (r === undefined || r <= controlRateHz) return null;
  return `--rate must be at most the scenario's control rate, ${controlRateHz} Hz (got ${r}); leave it out to export every control sample`;
}

/** A result and, for each of its files, the text source (undefined where the export was refused). */
export interface ComputedJob {
  result: ComputeResult;
  sources: (ChunkSource | undefined)[];
}

/** Pulls from a synchronous chunk source (what both the inline computer and the worker serve). */
export function pullFrom(src: ChunkSource | undefined): ChunkPull {
  return async () => {
    if (!src) return { done: [{ path: 'file', rule: 'internal', message: 'this export has no text' }] };
    const r = src.next();
    return r.done ? { done: r.value } : { chunk: r.value };
  };
}

/** computeJob with the export sources kept beside the (structured-cloneable) result. */
export function computeJobSources(job: ComputeJob, progress: ProgressSink): ComputedJob {
  const json: unknown = JSON.parse(job.text);
  const prep = preparePipeline(json, job.controllers);
  if (!prep.ok) return { result: { kind: 'invalid', errors: prep.errors }, sources: [] };
  const s = prep.value.scenario;
  // The run-length and memory limits are the engine's resource budget (runPipeline refuses first).
  const rate = rateProblem(job, s.vehicle.controlRateHz);
  if (rate) return { result: { kind: 'option', message: rate }, sources: [] };
  const verb = job.command === 'fly' ? 'simulated ' : '';
  const r = runPipeline(json, {
    controllers: job.controllers,
    modes: job.modes,
    onProgress: (d, n, l) => progress(`[${d}/${n}] ${verb}${l}`),
  });
  if (!r.ok) return { result: { kind: 'invalid', errors: r.errors }, sources: [] };
  const o = r.value;
  const files: ExportText[] = [];
  const sources: (ChunkSource | undefined)[] = [];
  const x = job.exports;
  if (x) {
    // A long run kept a display trace: its files fly it again when opened (fullRunExports.ts).
    const reflown = fullRunExports(o);
    for (const run of o.runs)
      for (const f of x.formats) {
        const text = (run.traceKind === 'display' ? reflown : exportRunChunks)(f, run, o, {
          toolName: x.toolName,
          toolVersion: x.toolVersion,
          sampleRateHz: x.sampleRateHz,
          creationDateUtc: x.creationDateUtc,
          messageId: x.messageId,
        });
        const name = `${x.base}.${run.controllerId}.${run.mode}.${f}`;
        files.push(text.ok ? { name } : { name, errors: text.errors });
        sources.push(text.ok ? text.value : undefined);
      }
  }
  const headline = `Comparison for "${o.vehicle.name}" (plan ${o.plan.feasible ? 'feasible' : o.plan.constraints?.clear === false && prep.value.plan.feasible ? 'VIOLATES A CONSTRAINT' : 'INFEASIBLE'}, ${o.plan.totalTimeS.toFixed(1)} s)`;
  const result: ComputeResult = {
    kind: 'ran',
    feasible: prep.value.plan.feasible,
    headline,
    table: o.orbit ? `${comparisonTable(o.comparison, o.best)}\n\n${windowErrorText(o.runs)}` : comparisonTable(o.comparison, o.best),
    csv: comparisonCsv(o.comparison, CAUTION_TEXT),
    json: JSON.stringify({ caution: CAUTION_TEXT, comparison: o.comparison, best: o.best }, null, 2),
    files,
    failedRuns: o.runs.filter((x) => x.outcome.status !== 'completed').map((x) => ({ key: x.key, message: x.outcome.message })),
    runs: o.runs.map((x) => ({ key: x.key, verdict: x.verdict.kind, end: runEnd(x.outcome), text: x.verdict.text })),
    constraintViolations: [
      ...violationLines('plan', o.plan.constraints),
      ...o.runs.flatMap((x) => violationLines(`run ${x.key}`, x.constraints)),
    ],
  };
  return { result, sources };
}

/** The job in this thread: the result with `openFile` reading the sources directly. */
export function computeJob(job: ComputeJob, progress: ProgressSink): ComputeResult {
  const { result, sources } = computeJobSources(job, progress);
  if (result.kind !== 'ran') return result;
  return { ...result, openFile: (i) => pullFrom(sources[i]), release: () => sources.splice(0) };
}

/** Runs a job somewhere and reports progress; resolves null when the signal stopped it. */
export type Computer = (job: ComputeJob, progress: ProgressSink, signal?: AbortSignal) => Promise<ComputeResult | null>;

/** In this thread: simple and fast to start, but Ctrl-C is only seen after the job ends. */
export const inlineComputer: Computer = async (job, progress, signal) => {
  if (signal?.aborted) return null;
  const r = computeJob(job, progress);
  return signal?.aborted ? null : r;
};
