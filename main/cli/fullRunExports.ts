/**
 * fly's export files of runs that kept only a display trace (app/engine/pipeline/displayTrace.ts):
 * each such file is a chunk source that, when the writer first pulls from it, flies its run again
 * at full rate (pipeline/refly.ts fullRun) and then streams the export of the full run, so the
 * bytes are those of a pass that kept every sample. The files of one run are written one after
 * the other, so the last run flown again is kept for its next format and dropped for the next run:
 * at most one full trace is alive while the files are written.
 */
import type { Issue } from '../../app/engine/errors';
import { ok } from '../../app/engine/errors';
import type { ChunkedExport, ChunkSource } from '../../app/engine/export/chunks';
import { exportRunChunks, type ExportFormat, type RunExportOptions } from '../../app/engine/export/runExport';
import { fullRun } from '../../app/engine/pipeline/refly';
import type { ControllerRun, PipelineOutput } from '../../app/engine/pipeline/types';

/** An exporter like exportRunChunks whose sources fly display-trace runs again when first pulled. */
export function fullRunExports(
  out: PipelineOutput,
): (format: ExportFormat, run: ControllerRun, o: PipelineOutput, x: RunExportOptions) => ChunkedExport {
  let last: { key: string; run: ControllerRun } | null = null;
  const full = (run: ControllerRun): ControllerRun | Issue[] => {
    if (last?.key === run.key) return last.run;
    last = null; // drop the previous run's full trace before flying the next
    const r = fullRun(out, run);
    if (!r.ok) return r.errors;
    last = { key: run.key, run: r.value };
    return r.value;
  };
  return (format, run, o, x) => {
    function* source(): ChunkSource {
      const f = full(run);
      if (Array.isArray(f)) return f;
      const e = exportRunChunks(format, f, o, x);
      if (!e.ok) return e.errors;
      return yield* e.value;
    }
    return ok(source());
  };
}
