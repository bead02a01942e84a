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
import { exportRun, type ExportFormat } from '../../app/engine/export/runExport';
import { comparisonCsv, comparisonTable } from './format';
import { violationLines } from './constraintStatus';

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
  text?: string;
  errors?: Issue[];
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

/**
 * The CLI's bound on one run's length. The schema leaves holds and the tail unbounded, and a run
 * keeps every sample in memory (about 0.5 kB each: 200 000 samples took 5 s and 220 MB here), so
 * a hold of 1e9 s would run for days and then exhaust memory. One million samples is 28 h at 10 Hz.
 */
const MAX_SAMPLES_PER_RUN = 1_000_000;

function runLengthIssue(endS: number, rateHz: number): Issue[] {
  const samples = endS * rateHz;
  if (samples <= MAX_SAMPLES_PER_RUN) return [];
  return [
    {
      path: '',
      rule: 'run-length',
      message: `each run would simulate ${endS.toPrecision(4)} s at ${rateHz} Hz (${Number.isFinite(samples) ? samples.toPrecision(3) : 'too many'} samples); the CLI simulates at most ${MAX_SAMPLES_PER_RUN} samples per run: shorten the holds (targets[].holdS) or simulation.tailS`,
    },
  ];
}

export function computeJob(job: ComputeJob, progress: ProgressSink): ComputeResult {
  const json: unknown = JSON.parse(job.text);
  const prep = preparePipeline(json, job.controllers);
  if (!prep.ok) return { kind: 'invalid', errors: prep.errors };
  const s = prep.value.scenario;
  const tooLong = runLengthIssue(
    s.simulation.durationS ?? Math.max(prep.value.plan.totalS, 1) + s.simulation.tailS,
    s.vehicle.controlRateHz,
  );
  if (tooLong.length) return { kind: 'invalid', errors: tooLong };
  const rate = rateProblem(job, s.vehicle.controlRateHz);
  if (rate) return { kind: 'option', message: rate };
  const verb = job.command === 'fly' ? 'simulated ' : '';
  const r = runPipeline(json, {
    controllers: job.controllers,
    modes: job.modes,
    onProgress: (d, n, l) => progress(`[${d}/${n}] ${verb}${l}`),
  });
  if (!r.ok) return { kind: 'invalid', errors: r.errors };
  const o = r.value;
  const files: ExportText[] = [];
  const x = job.exports;
  if (x) {
    for (const run of o.runs)
      for (const f of x.formats) {
        const text = exportRun(f, run, o, {
          toolName: x.toolName,
          toolVersion: x.toolVersion,
          sampleRateHz: x.sampleRateHz,
          creationDateUtc: x.creationDateUtc,
          messageId: x.messageId,
        });
        const name = `${x.base}.${run.controllerId}.${run.mode}.${f}`;
        files.push(text.ok ? { name, text: text.value } : { name, errors: text.errors });
      }
  }
  const headline = `Comparison for "${o.vehicle.name}" (plan ${o.plan.feasible ? 'feasible' : o.plan.constraints?.clear === false && prep.value.plan.feasible ? 'VIOLATES A CONSTRAINT' : 'INFEASIBLE'}, ${o.plan.totalTimeS.toFixed(1)} s)`;
  return {
    kind: 'ran',
    feasible: prep.value.plan.feasible,
    headline,
    table: comparisonTable(o.comparison, o.best),
    csv: comparisonCsv(o.comparison, CAUTION_TEXT),
    json: JSON.stringify({ caution: CAUTION_TEXT, comparison: o.comparison, best: o.best }, null, 2),
    files,
    failedRuns: o.runs.filter((x) => x.outcome.status !== 'completed').map((x) => ({ key: x.key, message: x.outcome.message })),
    constraintViolations: [
      ...violationLines('plan', o.plan.constraints),
      ...o.runs.flatMap((x) => violationLines(`run ${x.key}`, x.constraints)),
    ],
  };
}

/** Runs a job somewhere and reports progress; resolves null when the signal stopped it. */
export type Computer = (job: ComputeJob, progress: ProgressSink, signal?: AbortSignal) => Promise<ComputeResult | null>;

/** In this thread: simple and fast to start, but Ctrl-C is only seen after the job ends. */
export const inlineComputer: Computer = async (job, progress, signal) => {
  if (signal?.aborted) return null;
  const r = computeJob(job, progress);
  return signal?.aborted ? null : r;
};
