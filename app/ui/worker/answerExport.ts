/**
 * The export worker's answer to one request (export.worker.ts posts what this gives), kept apart
 * from the worker global so tests can run it in Node: progress replies while a display-trace run
 * is flown again, then the file's text. The text is the same as the UI thread's exportRun writes
 * (both go through exporting.ts exportRunWith; test/unit/ui-export-worker.test.ts compares them).
 */
import { exportRunWith } from '../exporting';
import type { ExportReply, ExportRequest } from './exportProtocol';

export function answerExport(req: ExportRequest, post: (reply: ExportReply) => void): void {
  try {
    const result = exportRunWith(
      req.output,
      { format: req.format, runKey: req.runKey, sampleRateHz: req.sampleRateHz },
      {
        toolVersion: req.toolVersion,
        ...(req.creationDateUtc !== undefined ? { creationDateUtc: req.creationDateUtc } : {}),
        onProgress: (p) => post({ type: 'progress', id: req.id, ...p }),
      },
    );
    post({ type: 'done', id: req.id, result });
  } catch (e) {
    // A throw here is an engine bug, not bad input (bad input comes back as issues); say so.
    post({ type: 'crash', id: req.id, message: e instanceof Error ? `${e.name}: ${e.message}` : String(e) });
  }
}
