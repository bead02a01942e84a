/**
 * `fly` and `compare` simulate in a worker thread so the main thread stays free for Ctrl-C: a
 * synchronous simulation on the main thread would hold the SIGINT handler back until it ended.
 * On abort the worker is terminated (V8 stops it mid-computation); it never writes files — the
 * main thread writes the results atomically afterwards — so stopping it cannot leave one half done.
 */
import { Worker } from 'node:worker_threads';
import type { ComputeResult, Computer } from './compute';

/** Messages from compute-worker.ts. */
export type FromComputeWorker =
  { type: 'progress'; line: string } | { type: 'done'; result: ComputeResult } | { type: 'crash'; message: string };

const WORKER_URL = new URL('./compute-worker.mjs', import.meta.url);

export const threadComputer: Computer = (job, progress, signal) =>
  new Promise<ComputeResult | null>((resolve, reject) => {
    if (signal?.aborted) return resolve(null);
    const worker = new Worker(WORKER_URL, { workerData: job });
    let settled = false;
    const finish = (fn: () => void) => {
      if (settled) return;
      settled = true;
      signal?.removeEventListener('abort', onAbort);
      void worker.terminate();
      fn();
    };
    const onAbort = () => finish(() => resolve(null));
    signal?.addEventListener('abort', onAbort, { once: true });
    worker.on('message', (m: FromComputeWorker) => {
      if (m.type === 'progress') progress(m.line);
      else if (m.type === 'done') finish(() => resolve(m.result));
      else finish(() => reject(new Error(m.message)));
    });
    worker.on('error', (e) => finish(() => reject(e)));
    worker.on('exit', (code) => finish(() => reject(new Error(`the simulation thread stopped (exit code ${code})`))));
  });
