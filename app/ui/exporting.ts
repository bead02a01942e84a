/**
 * Export of one run through the engine's writers (app/engine/export) — the UI only gathers the
 * inputs (the run, the resolved scenario it came from, the options) and names the file.
 */
import type { Result } from '../engine/errors';
import { fail } from '../engine/errors';
import type { ControllerRun, PipelineOutput } from '../engine/pipeline/types';
import { loadScenario } from '../engine/scenario/resolve';
import { writeCsv } from '../engine/export/csv';
import { writeJson } from '../engine/export/json';
import type { ExportMeta } from '../engine/export/types';

export type ExportFormat = 'csv' | 'json' | 'aem';

export const EXPORT_FORMATS: { value: ExportFormat; label: string; ext: string; note: string }[] = [
  { value: 'csv', label: 'CSV', ext: 'csv', note: 'One row per sample: attitude, rates, wheel momenta and torques, logic and jump counter, with units.' },
  { value: 'json', label: 'JSON', ext: 'json', note: 'The run with its metrics, jumps and plan, for scripts.' },
  { value: 'aem', label: 'CCSDS AEM', ext: 'aem', note: 'Attitude Ephemeris Message (KVN) of the attitude quaternion, one segment per maneuver segment.' },
];

export interface ExportChoice {
  format: ExportFormat;
  runKey: string;
  /** Samples per second to keep; null keeps every sample. */
  sampleRateHz: number | null;
}

export function toolVersion(): string {
  return typeof __SLEWSMITH_VERSION__ === 'string' ? __SLEWSMITH_VERSION__ : '0.0.0-dev';
}

export function exportFileName(scenarioName: unknown, run: ControllerRun, format: ExportFormat): string {
  const base = typeof scenarioName === 'string' && scenarioName.trim() ? scenarioName : 'slewsmith';
  const slug = `${base}-${run.controllerId}-${run.mode}`
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 120);
  return `${slug || 'slewsmith-run'}.${EXPORT_FORMATS.find((f) => f.value === format)?.ext ?? 'txt'}`;
}

type Writer = (run: ControllerRun, out: PipelineOutput, scenarioJson: unknown, meta: ExportMeta, sampleRateHz: number | undefined) => Result<string>;

const writers: Partial<Record<ExportFormat, Writer>> = {};

/** The AEM writer registers itself here once the engine provides it (see aemWriter.ts). */
export function registerWriter(format: ExportFormat, w: Writer): void {
  writers[format] = w;
}

/** Run the engine's writer for the chosen format. */
export function exportRun(out: PipelineOutput, scenarioJson: unknown, choice: ExportChoice): Result<{ name: string; content: string }> {
  const run = out.runs.find((r) => r.key === choice.runKey);
  if (!run) return fail([{ path: 'run', rule: 'exists', message: 'Choose a run to export' }]);
  const resolved = loadScenario(scenarioJson);
  if (!resolved.ok) return fail(resolved.errors);
  const meta: ExportMeta = {
    toolName: 'Slewsmith',
    toolVersion: toolVersion(),
    controllerLabel: `${run.label} (${run.mode})`,
    controllerId: run.controllerId,
    jumpEvents: run.jumps,
    metrics: run.metrics,
    plan: out.plan,
  };
  const rate = choice.sampleRateHz ?? undefined;
  let r: Result<string>;
  if (choice.format === 'csv') r = writeCsv(run.trace, resolved.value, meta, { sampleRateHz: rate });
  else if (choice.format === 'json') r = writeJson(run.trace, resolved.value, meta, { sampleRateHz: rate, indent: 1 });
  else {
    const w = writers[choice.format];
    if (!w) return fail([{ path: 'format', rule: 'available', message: `The ${choice.format.toUpperCase()} writer is not available in this build` }]);
    r = w(run, out, scenarioJson, meta, rate);
  }
  if (!r.ok) return r;
  return { ok: true, value: { name: exportFileName(resolved.value.name, run, choice.format), content: r.value }, warnings: r.warnings };
}
