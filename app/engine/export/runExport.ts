/**
 * One entry point for exporting a pipeline run in any of the three formats, used by the CLI and
 * the app's export dialog alike (so both write the same bytes for the same run). Everything it
 * writes comes from the pipeline output: the run and the scenario summary.
 */
import type { Result } from '../errors';
import type { ControllerRun, PipelineOutput } from '../pipeline/types';
import { runEndNote } from '../pipeline/outcome';
import { collectChunks, type ChunkedExport } from './chunks';
import { csvChunks } from './csv';
import { jsonChunks } from './json';
import { aemChunks } from './aem-write';
import type { ExportMeta } from './types';
import type { RunConstraintReport } from '../pipeline/constraints';
import type { ExportConstraint } from './constraintColumns';
import { fail } from '../errors';
import { displayTraceExportIssue } from '../pipeline/refly';

function exportConstraints(r: RunConstraintReport): ExportConstraint[] {
  return r.constraints.map((c, i) => ({
    name: c.name,
    kind: c.kind,
    marginRad: r.marginRad[i]!,
    minMarginRad: c.minMarginRad,
    minAtS: c.minAtS,
    violatedS: c.violatedS,
    violations: c.intervals.length,
  }));
}

export const EXPORT_FORMATS = ['csv', 'json', 'aem'] as const;
export type ExportFormat = (typeof EXPORT_FORMATS)[number];

export interface RunExportOptions {
  toolName: string;
  toolVersion: string;
  /** Export sample rate; default every stored sample. */
  sampleRateHz?: number;
  /** AEM CREATION_DATE; default now (UTC, whole seconds). */
  creationDateUtc?: string;
  /** AEM MESSAGE_ID; default the writer's (object name and creation date). */
  messageId?: string;
}

/** The whole export as one string (the app's download, tests); the CLI streams exportRunChunks. */
export function exportRun(format: ExportFormat, run: ControllerRun, out: PipelineOutput, o: RunExportOptions): Result<string> {
  return collectChunks(exportRunChunks(format, run, out, o));
}

/** The export as a chunk source (chunks.ts): checked first, then the text piece by piece. */
export function exportRunChunks(format: ExportFormat, run: ControllerRun, out: PipelineOutput, o: RunExportOptions): ChunkedExport {
  // A long run's display trace is a subset: exports take the full run (pipeline/refly.ts fullRun).
  const partial = displayTraceExportIssue(run);
  if (partial) return fail([partial]);
  const meta: ExportMeta = {
    toolName: o.toolName,
    toolVersion: o.toolVersion,
    controllerLabel: `${run.label} (${run.mode})`,
    controllerId: run.controllerId,
    jumpEvents: run.jumps,
    metrics: run.metrics,
    metricInputs: run.metricInputs,
    monitor: run.monitor,
    outcome: run.outcome,
    verdict: run.verdict,
    plan: out.plan,
    incomplete: runEndNote(run),
    wheels: { axes: out.vehicle.wheelAxes, maxTorqueNm: out.vehicle.maxTorqueNm, maxMomentumNms: out.vehicle.maxMomentumNms },
    ...(run.constraints && run.constraints.marginRad.length ? { constraints: exportConstraints(run.constraints) } : {}),
  };
  if (format === 'csv') return csvChunks(run.trace, out.scenario, meta, { sampleRateHz: o.sampleRateHz });
  if (format === 'json') return jsonChunks(run.trace, out.scenario, meta, { sampleRateHz: o.sampleRateHz });
  const created = o.creationDateUtc ?? new Date().toISOString().replace(/\.\d{3}Z$/, 'Z');
  return aemChunks(run.trace, out.scenario, meta, { creationDateUtc: created, sampleRateHz: o.sampleRateHz, messageId: o.messageId });
}
