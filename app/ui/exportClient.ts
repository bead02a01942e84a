/**
 * The app's exports run in a dedicated Web Worker (worker/export.worker.ts): flying a long run
 * again (about 10 s for a day at 10 Hz) no longer freezes the window. One export at a time; a new
 * one replaces a running one. Cancel terminates the worker (it holds nothing but the export) and
 * the next export starts a fresh one; the pipeline worker and the document are not touched.
 */
import type { Result } from '../engine/errors';
import type { PipelineOutput } from '../engine/pipeline/types';
import type { ExportChoice } from './exporting';
import { exportOutputOf, type ExportProgress, type ExportReply, type ExportRequest } from './worker/exportProtocol';

export interface ExportWorkerLike {
  postMessage(message: ExportRequest): void;
  terminate(): void;
  onmessage: ((ev: MessageEvent<ExportReply>) => void) | null;
  onerror: ((ev: ErrorEvent) => void) | null;
}

export type ExportOutcome =
  { status: 'done'; result: Result<{ name: string; content: string }> } | { status: 'cancelled' } | { status: 'crash'; message: string };

export interface ExportJob {
  readonly done: Promise<ExportOutcome>;
  cancel(): void;
}

export interface ExportClient {
  start(
    out: PipelineOutput,
    choice: ExportChoice,
    meta: { toolVersion: string; creationDateUtc?: string },
    onProgress?: (p: ExportProgress) => void,
  ): ExportJob;
  dispose(): void;
}

export function createExportClient(spawn: () => ExportWorkerLike): ExportClient {
  let worker: ExportWorkerLike | null = null;
  let nextId = 1;
  let current: { id: number; finish: (o: ExportOutcome) => void } | null = null;

  const drop = () => {
    worker?.terminate();
    worker = null;
  };
  const settle = (o: ExportOutcome) => {
    const c = current;
    current = null;
    c?.finish(o);
  };

  function ensure(): ExportWorkerLike {
    if (worker) return worker;
    const w = spawn();
    w.onerror = (ev) => {
      ev.preventDefault?.();
      drop();
      settle({ status: 'crash', message: ev.message || 'the export worker failed to start or stopped' });
    };
    worker = w;
    return w;
  }

  return {
    start(out, choice, meta, onProgress) {
      // A running export is replaced: its worker (busy flying) is stopped.
      if (current) {
        drop();
        settle({ status: 'cancelled' });
      }
      const id = nextId++;
      let finish!: (o: ExportOutcome) => void;
      const done = new Promise<ExportOutcome>((resolve) => (finish = resolve));
      current = { id, finish };
      const w = ensure();
      w.onmessage = (ev) => {
        const m = ev.data;
        if (!current || m.id !== current.id) return;
        if (m.type === 'progress') onProgress?.(m.phase === 'fly' ? { phase: 'fly', done: m.done, total: m.total } : { phase: 'write' });
        else if (m.type === 'done') settle({ status: 'done', result: m.result });
        else {
          drop();
          settle({ status: 'crash', message: m.message });
        }
      };
      w.postMessage({
        type: 'export',
        id,
        output: exportOutputOf(out, choice.runKey),
        runKey: choice.runKey,
        format: choice.format,
        sampleRateHz: choice.sampleRateHz,
        toolVersion: meta.toolVersion,
        ...(meta.creationDateUtc !== undefined ? { creationDateUtc: meta.creationDateUtc } : {}),
      });
      return {
        done,
        cancel() {
          if (current?.id !== id) return;
          drop();
          settle({ status: 'cancelled' });
        },
      };
    },
    dispose() {
      drop();
      settle({ status: 'cancelled' });
    },
  };
}

let appClient: ExportClient | null = null;

/** The renderer's export client, its worker built by Vite (worker-src 'self' in the CSP) on first use. */
export function appExportClient(): ExportClient {
  appClient ??= createExportClient(
    () =>
      new Worker(new URL('./worker/export.worker.ts', import.meta.url), { type: 'module', name: 'export' }) as unknown as ExportWorkerLike,
  );
  return appClient;
}
