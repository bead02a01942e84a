/**
 * `fly` and `compare` simulate in a worker thread so the main thread stays free for Ctrl-C: a
 * synchronous simulation on the main thread would hold the SIGINT handler back until it ended.
 * On abort the worker is terminated (V8 stops it mid-computation). It never writes files: after
 * the result it serves each export's text chunk by chunk on request (`openFile`), and the main
 * thread writes them atomically, so stopping it cannot leave a file half done. The caller ends it
 * with `release()` once the files are written.
 */
import { Worker } from 'node:worker_threads';
import type { Issue } from '../../app/engine/errors';
import type { ChunkPull, ComputeResult, Computer } from './compute';

/** Messages from compute-worker.ts. */
export type FromComputeWorker =
  | { type: 'progress'; line: string }
  | { type: 'done'; result: ComputeResult }
  | { type: 'chunk'; index: number; chunk: string }
  | { type: 'end'; index: number; errors: Issue[] }
  | { type: 'crash'; message: string };

/** Messages to compute-worker.ts: the next chunk of file `index`. */
export interface ToComputeWorker {
  type: 'pull';
  index: number;
}

type Reply = { chunk: string } | { done: Issue[] };

const WORKER_URL = new URL('./compute-worker.mjs', import.meta.url);

export const threadComputer: Computer = (job, progress, signal) =>
  new Promise<ComputeResult | null>((resolve, reject) => {
    if (signal?.aborted) return resolve(null);
    const worker = new Worker(WORKER_URL, { workerData: job });
    let settled = false;
    let released = false;
    // One pull at a time per file (the writer awaits each), so one waiting reply per index.
    const waiting = new Map<number, { ok: (r: Reply) => void; no: (e: Error) => void }>();
    const stop = (why: Error) => {
      for (const w of waiting.values()) w.no(why);
      waiting.clear();
    };
    const release = () => {
      if (released) return;
      released = true;
      signal?.removeEventListener('abort', onAbort);
      stop(new Error('the simulation thread was released'));
      void worker.terminate();
    };
    const finish = (fn: () => void, keep = false) => {
      if (settled) return;
      settled = true;
      if (!keep) release();
      fn();
    };
    const onAbort = () => {
      finish(() => resolve(null));
      release();
    };
    signal?.addEventListener('abort', onAbort, { once: true });
    const openFile =
      (index: number): ChunkPull =>
      () =>
        new Promise<Reply>((ok, no) => {
          if (released) return no(new Error('the simulation thread was released'));
          waiting.set(index, { ok, no });
          worker.postMessage({ type: 'pull', index } satisfies ToComputeWorker);
        });
    worker.on('message', (m: FromComputeWorker) => {
      if (m.type === 'progress') progress(m.line);
      else if (m.type === 'done')
        finish(() => resolve(m.result.kind === 'ran' ? { ...m.result, openFile, release } : m.result), m.result.kind === 'ran');
      else if (m.type === 'chunk' || m.type === 'end') {
        const w = waiting.get(m.index);
        waiting.delete(m.index);
        w?.ok(m.type === 'chunk' ? { chunk: m.chunk } : { done: m.errors });
      } else {
        const e = new Error(m.message);
        stop(e);
        finish(() => reject(e));
        release();
      }
    });
    const died = (e: Error) => {
      stop(e);
      finish(() => reject(e));
      release();
    };
    worker.on('error', died);
    worker.on('exit', (code) => {
      if (!released) died(new Error(`the simulation thread stopped (exit code ${code})`));
    });
  });
