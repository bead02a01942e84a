/**
 * Export of one run through the engine's single export entry point (engine/export/runExport.ts,
 * shared with the CLI so both write the same bytes). The UI only gathers the inputs — the run
 * and the pipeline output it belongs to, the options — and names the file.
 */
import type { Result } from '../engine/errors';
import { fail } from '../engine/errors';
import type { ControllerRun, PipelineOutput } from '../engine/pipeline/types';
import { exportRun as engineExportRun, type ExportFormat } from '../engine/export/runExport';
import { fullRun } from '../engine/pipeline/refly';
import type { ExportProgress } from './worker/exportProtocol';

export type { ExportFormat } from '../engine/export/runExport';

export const EXPORT_FORMATS: { value: ExportFormat; label: string; ext: string; note: string }[] = [
  {
    value: 'csv',
    label: 'CSV',
    ext: 'csv',
    note: 'One row per sample: attitude, rates, wheel momenta and torques, logic and jump counter, with units.',
  },
  { value: 'json', label: 'JSON', ext: 'json', note: 'The run with its metrics, jumps and plan, for scripts.' },
  {
    value: 'aem',
    label: 'CCSDS AEM',
    ext: 'aem',
    note: 'Attitude Ephemeris Message (KVN) of the attitude quaternion, one segment per maneuver segment.',
  },
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

function exportFileName(scenarioName: unknown, run: ControllerRun, format: ExportFormat): string {
  const base = typeof scenarioName === 'string' && scenarioName.trim() ? scenarioName : 'slewsmith';
  const slug = `${base}-${run.controllerId}-${run.mode}`
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 120);
  return `${slug || 'slewsmith-run'}.${EXPORT_FORMATS.find((f) => f.value === format)?.ext ?? 'txt'}`;
}

/** Write the chosen run in the chosen format; engine issues come back as they are. */
export function exportRun(out: PipelineOutput, choice: ExportChoice): Result<{ name: string; content: string }> {
  return exportRunWith(out, choice, { toolVersion: toolVersion() });
}

export interface ExportRunHooks {
  toolVersion: string;
  /** AEM CREATION_DATE; default now. */
  creationDateUtc?: string;
  /** Where the export is (the re-flight counts samples: the loop polls shouldStop once per recorded sample, sim/loop.ts). */
  onProgress?: (p: ExportProgress) => void;
}

/** exportRun with the version, creation date and a progress callback given: the export worker's path (worker/answerExport.ts). */
export function exportRunWith(out: PipelineOutput, choice: ExportChoice, hooks: ExportRunHooks): Result<{ name: string; content: string }> {
  const run = out.runs.find((r) => r.key === choice.runKey);
  if (!run) return fail([{ path: 'run', rule: 'exists', message: 'Choose a run to export' }]);
  // A long run kept a display trace for the views: it is flown again so the file holds every sample.
  const full = fullRun(out, run, hooks.onProgress && run.display ? sampleCounter(run.display.fullSamples, hooks.onProgress) : undefined);
  if (!full.ok) return full;
  hooks.onProgress?.({ phase: 'write' });
  const r = engineExportRun(choice.format, full.value, out, {
    toolName: 'Slewsmith',
    toolVersion: hooks.toolVersion,
    sampleRateHz: choice.sampleRateHz ?? undefined,
    ...(hooks.creationDateUtc !== undefined ? { creationDateUtc: hooks.creationDateUtc } : {}),
  });
  if (!r.ok) return r;
  return { ok: true, value: { name: exportFileName(out.scenario.name, run, choice.format), content: r.value }, warnings: r.warnings };
}

/** Progress steps per re-flight (about one a percent: a message per sample would flood the renderer). */
const PROGRESS_STEPS = 100;

/** A shouldStop that never stops and reports every total/PROGRESS_STEPS calls (one call per recorded sample). */
function sampleCounter(total: number, onProgress: (p: ExportProgress) => void): () => boolean {
  const every = Math.max(1, Math.ceil(total / PROGRESS_STEPS));
  let done = 0;
  return () => {
    done++;
    if (done % every === 0) onProgress({ phase: 'fly', done, total });
    return false;
  };
}
