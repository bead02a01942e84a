/**
 * One entry point for exporting a pipeline run in any of the three formats, used by the CLI and
 * the app's export dialog alike (so both write the same bytes for the same run). Everything it
 * writes comes from the pipeline output: the run and the scenario summary.
 */
import type { Result } from '../errors';
import type { ControllerRun, PipelineOutput } from '../pipeline/types';
import { writeCsv } from './csv';
import { writeJson } from './json';
import { writeAem } from './aem-write';
import type { ExportMeta } from './types';
import type { RunConstraintReport } from '../pipeline/constraints';
import type { ExportConstraint } from './constraintColumns';

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

export function exportRun(format: ExportFormat, run: ControllerRun, out: PipelineOutput, o: RunExportOptions): Result<string> {
  const meta: ExportMeta = {
    toolName: o.toolName,
    toolVersion: o.toolVersion,
    controllerLabel: `${run.label} (${run.mode})`,
    controllerId: run.controllerId,
    jumpEvents: run.jumps,
    metrics: run.metrics,
    plan: out.plan,
    wheels: { axes: out.vehicle.wheelAxes, maxTorqueNm: out.vehicle.maxTorqueNm, maxMomentumNms: out.vehicle.maxMomentumNms },
    ...(run.constraints && run.constraints.marginRad.length ? { constraints: exportConstraints(run.constraints) } : {}),
  };
  if (format === 'csv') return writeCsv(run.trace, out.scenario, meta, { sampleRateHz: o.sampleRateHz });
  if (format === 'json') return writeJson(run.trace, out.scenario, meta, { sampleRateHz: o.sampleRateHz });
  const created = o.creationDateUtc ?? new Date().toISOString().replace(/\.\d{3}Z$/, 'Z');
  return writeAem(run.trace, out.scenario, meta, { creationDateUtc: created, sampleRateHz: o.sampleRateHz, messageId: o.messageId });
}
