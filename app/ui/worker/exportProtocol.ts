/** Messages between the renderer and the export worker (export.worker.ts; structured-clonable data only). */
import type { Result } from '../../engine/errors';
import type { ExportFormat } from '../../engine/export/runExport';
import type { PipelineOutput } from '../../engine/pipeline/types';

export interface ExportRequest {
  type: 'export';
  id: number;
  /** The pass the run belongs to (the renderer sends it with this run only: exportOutputOf). */
  output: PipelineOutput;
  runKey: string;
  format: ExportFormat;
  /** Samples per second to keep; null keeps every sample. */
  sampleRateHz: number | null;
  /** The app's version for the file headers (the renderer's build constant; the worker bundle may lack it). */
  toolVersion: string;
  /** AEM CREATION_DATE; absent: the worker's clock (tests pin it). */
  creationDateUtc?: string;
}

/** Where an export is: flying its run again (done of total samples), then writing the file. */
export type ExportProgress = { phase: 'fly'; done: number; total: number } | { phase: 'write' };

export type ExportReply =
  | ({ type: 'progress'; id: number } & ExportProgress)
  | { type: 'done'; id: number; result: Result<{ name: string; content: string }> }
  | { type: 'crash'; id: number; message: string };

/** The output an export needs, with only the exported run (the others' traces are not copied to the worker). */
export function exportOutputOf(out: PipelineOutput, runKey: string): PipelineOutput {
  return { ...out, runs: out.runs.filter((r) => r.key === runKey) };
}
